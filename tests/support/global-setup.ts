/**
 * Once per vitest project that talks to the database (api, e2e): a database of its own in the
 * project-local cluster, recreated each run, migrated and seeded with the demo data; the local
 * mail sink; and for e2e the built client served by a real server. Tests read these with inject().
 */
import { createServer, type AddressInfo } from 'node:net';
import type { TestProject } from 'vitest/node';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db';
import { migrate, seedDemo } from '../../server/db/migrate';
import { startMailSink } from '../../server/fakes/mail-sink';
import { startStripeStandin, type StripeStandin } from '../../server/fakes/stripe-standin';
import { startServer, type RunningServer } from '../../server/index';
import { ensureDebianPackage } from '../../server/scripts/apt';
import { buildClientIfStale } from '../../server/scripts/client-build';
import { freshTestDatabase } from '../../server/scripts/database';
import { testEnv } from './test-env';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
    smtpUrl: string;
    baseUrl: string;
    demoPassword: string;
  }
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer().listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as AddressInfo;
      probe.close(() => resolve(port));
    });
    probe.once('error', reject);
  });
}

export default async function setup(project: TestProject) {
  const config = loadConfig(testEnv());
  // DRIFTPROOF_TEST_DB_SUFFIX keeps parallel runs in one checkout from recreating each other's database.
  const suffix = (process.env.DRIFTPROOF_TEST_DB_SUFFIX ?? '').replace(/[^a-z0-9_]/g, '');
  const databaseUrl = await freshTestDatabase(config, `driftproof_test_${project.name}${suffix ? `_${suffix}` : ''}`);

  const sequelize = createDatabase(databaseUrl, { poolMax: 3 });
  await migrate(sequelize);
  await seedDemo(sequelize, { password: config.demoPassword, bcryptCost: config.bcryptCost });

  const sink = await startMailSink({ port: 0 });
  const smtpUrl = `smtp://127.0.0.1:${sink.port}`;
  let server: RunningServer | undefined;
  let standin: StripeStandin | undefined;
  if (project.name === 'e2e') {
    ensureDebianPackage('chromium', '/usr/bin/chromium');
    buildClientIfStale();
    // The server's own address goes into e-mailed links and payment return addresses, so it is chosen first.
    const port = await freePort();
    const appUrl = `http://127.0.0.1:${port}`;
    standin = await startStripeStandin({ port: 0, webhookUrl: `${appUrl}/api/payments/webhook`, webhookSecret: config.stripe.webhookSecret });
    server = await startServer({ ...config, port, appUrl }, { databaseUrl, smtpUrl, stripeApiUrl: standin.url });
  }

  project.provide('databaseUrl', databaseUrl);
  project.provide('smtpUrl', smtpUrl);
  project.provide('baseUrl', server?.url ?? '');
  project.provide('demoPassword', config.demoPassword);

  return async () => {
    await server?.close();
    await standin?.close();
    await sink.close();
    await sequelize.close();
  };
}
