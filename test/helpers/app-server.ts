import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { seedDemo } from '../../server/seed/seed-demo';
import { createFileStore } from '../../server/storage/file-store';
import { createTestContext, type TestContext } from './test-app';

export interface AppServer {
  url: string;
  ctx: TestContext;
  stop(): Promise<void>;
}

/**
 * The real app on a loopback port: a fresh migrated database with the demo
 * data, serving the built client from dist/web/browser (run `ng build` first).
 */
export async function startAppServer(): Promise<AppServer> {
  const ctx = await createTestContext();
  await seedDemo(ctx.db, createFileStore(ctx.config.storageDir));
  const server = createServer(ctx.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    ctx,
    async stop() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await ctx.close();
    },
  };
}
