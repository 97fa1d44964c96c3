import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import supertest from 'supertest';
import { inject } from 'vitest';
import { createApp, type AppDeps } from '../../server/app';
import { loadConfig, type AppConfig } from '../../server/config/env';
import { createDatabase, type Database } from '../../server/db/client';
import { ensureDatabase } from '../../server/db/cluster';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { createMailer } from '../../server/mail/mailer';

export interface TestContext {
  db: Database;
  /** The local SMTP fake this app sends through. */
  mail: FakeSmtp;
  config: AppConfig;
  app: ReturnType<typeof createApp>;
  databaseUrl: string;
  close(): Promise<void>;
}

/** A fresh database copied from the migrated template, and an app around it. */
export async function createTestContext(overrides: Omit<Partial<AppDeps>, 'config'> & { config?: Partial<AppConfig> } = {}): Promise<TestContext> {
  const port = inject('pgPort');
  const name = `t_${randomUUID().replaceAll('-', '')}`;
  await ensureDatabase(port, name, inject('pgTemplate'));
  const databaseUrl = `postgres://app@127.0.0.1:${port}/${name}`;
  const dataDir = mkdtempSync(join(tmpdir(), 'tuckline-test-data-'));
  const base = loadConfig({ TUCKLINE_DATA_DIR: dataDir, JWT_SECRET: 'test-secret-'.padEnd(48, 'x'), LOG_LEVEL: 'silent', DATABASE_URL: databaseUrl });
  const config = { ...base, ...overrides.config };
  const db = createDatabase(databaseUrl);
  const mail = await startFakeSmtp();
  const app = createApp({ db, config, signInLimit: overrides.signInLimit ?? 1000, resetLimit: overrides.resetLimit ?? 1000, mailer: createMailer(mail.url, config.mailFrom), fakeSmtp: mail });
  return {
    db,
    mail,
    config,
    app,
    databaseUrl,
    async close() {
      await db.$client.end();
      await mail.stop();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export type Agent = ReturnType<typeof supertest.agent>;

/** Signs up a new person (with their own team) and returns a cookie-keeping agent. */
export async function signUp(ctx: TestContext, who: { email: string; displayName?: string; password?: string; teamName?: string }) {
  const agent = supertest.agent(ctx.app);
  const res = await agent
    .post('/api/auth/sign-up')
    .send({ email: who.email, password: who.password ?? 'correct horse battery', displayName: who.displayName ?? who.email.split('@')[0], teamName: who.teamName });
  if (res.status !== 201) throw new Error(`sign-up failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent, session: res.body as { user: { id: string }; teams: { id: string; name: string; role: string }[] } };
}

export async function signIn(ctx: TestContext, email: string, password: string) {
  const agent = supertest.agent(ctx.app);
  const res = await agent.post('/api/auth/sign-in').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent, session: res.body as { user: { id: string }; teams: { id: string; name: string; role: string }[] } };
}

export function expectErrorShape(body: unknown, code: string) {
  const b = body as { error?: { code?: unknown; message?: unknown } };
  if (!b?.error || b.error.code !== code || typeof b.error.message !== 'string' || !b.error.message) {
    throw new Error(`expected error ${code}, got ${JSON.stringify(body)}`);
  }
}
