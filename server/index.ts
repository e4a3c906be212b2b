/**
 * A web process. Run directly (`node --import tsx server/index.ts`) it is what a production
 * deployment starts behind a load balancer: it needs DATABASE_URL and SMTP_URL, applies pending
 * migrations under a lock and listens. `npm start` (scripts/start.ts) calls startServer itself.
 */
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { pathToFileURL } from 'node:url';
import { createApp } from './app';
import { loadConfig, type Config } from './config';
import { closeContext, createContext } from './context';
import { migrate, seedDemo } from './db/migrate';
import { startWorkers } from './jobs/workers';

export interface RunningServer {
  url: string;
  port: number;
  close(): Promise<void>;
}

export async function startServer(config: Config, urls: { databaseUrl: string; smtpUrl: string; stripeApiUrl?: string }, options: { seed?: boolean } = {}): Promise<RunningServer> {
  const ctx = createContext(config, urls);
  await migrate(ctx.sequelize);
  if (options.seed) await seedDemo(ctx.sequelize, { password: config.demoPassword, bcryptCost: config.bcryptCost });
  // Job workers run in the web process unless JOB_WORKERS=0 (then run server/worker.ts separately).
  if (config.jobWorkers) await startWorkers(ctx);
  const app = createApp(ctx);
  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
    s.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://${config.host}:${port}`,
    port,
    async close() {
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeIdleConnections();
      await closed;
      // Session writes that a finished response started may still be on their way.
      await new Promise((resolve) => setTimeout(resolve, 100));
      await closeContext(ctx);
    },
  };
}

/** Closes everything on Ctrl-C or a stop signal, then exits. */
export function closeOnSignals(...closers: Array<() => Promise<void>>) {
  let closing = false;
  const stop = async () => {
    if (closing) return;
    closing = true;
    for (const close of closers) await close().catch((error) => console.error(error));
    process.exit(0);
  };
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const config = loadConfig();
  if (!config.databaseUrl || !config.smtpUrl) {
    console.error('A web process needs DATABASE_URL and SMTP_URL. For a local setup, run `npm start`.');
    process.exit(1);
  }
  const server = await startServer(config, { databaseUrl: config.databaseUrl, smtpUrl: config.smtpUrl });
  console.log(`Driftproof web process listening on ${server.url}`);
  closeOnSignals(server.close);
}
