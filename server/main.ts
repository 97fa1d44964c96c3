import { createServer } from 'node:http';
import { join } from 'node:path';
import { createApp } from './app';
import { loadConfig } from './config/env';
import { createDatabase } from './db/client';
import { startCluster, type Cluster } from './db/cluster';
import { migrateDatabase } from './db/migrate';
import { demoPassword, demoPeople } from './seed/demo-scenario';
import { seedDemo } from './seed/seed-demo';
import { createFileStore } from './storage/file-store';
import { startFakeSmtp } from './mail/fake-smtp';
import { createMailer } from './mail/mailer';

const say = (line: string) => process.stdout.write(`[tuckline] ${line}\n`);

async function main() {
  const config = loadConfig();
  const seed = process.argv.includes('--seed');
  let cluster: Cluster | undefined;
  let databaseUrl = config.databaseUrl;
  if (!databaseUrl) {
    cluster = await startCluster({ dataDir: join(config.dataDir, 'pg'), port: config.pgPort, database: 'tuckline', log: say });
    databaseUrl = cluster.url;
  }

  const db = createDatabase(databaseUrl);
  await migrateDatabase(db);
  say('Database migrated.');
  if (seed) {
    const result = await seedDemo(db, createFileStore(config.storageDir));
    say(result.created ? 'Demo data seeded.' : 'Demo data already present.');
  }

  // Without a real SMTP server, mail goes to a local fake whose inbox is at /dev/mail.
  const fakeSmtp = config.smtpUrl ? undefined : await startFakeSmtp();
  const mailer = createMailer(config.smtpUrl ?? fakeSmtp!.url, config.mailFrom);
  const app = createApp({ db, config, mailer, fakeSmtp });
  const server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.port, config.host, resolve);
  });
  say(`Tuckline is running at http://${config.host}:${config.port}`);
  if (fakeSmtp) say(`Mail goes to a local SMTP fake (${fakeSmtp.url}); read it at http://${config.host}:${config.port}/dev/mail`);
  if (seed) {
    say(`Demo sign-ins (password "${demoPassword}"):`);
    for (const p of demoPeople) say(`  ${p.role.padEnd(9)} ${p.email}  (${p.displayName})`);
  }

  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    say(`${signal}: shutting down…`);
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await fakeSmtp?.stop();
    await db.$client.end();
    if (cluster) {
      await cluster.stop();
      say('PostgreSQL stopped.');
    }
    process.exit(0);
  };
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

main().catch((error: unknown) => {
  process.stderr.write(`[tuckline] Could not start: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(1);
});
