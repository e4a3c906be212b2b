/**
 * A worker process: takes jobs (scoring, result e-mails) from the PostgreSQL job queue. Run any
 * number of them on any number of machines: `DATABASE_URL=… SMTP_URL=… node --import tsx server/worker.ts`.
 */
import { loadConfig } from './config';
import { closeContext, createContext } from './context';
import { migrate } from './db/migrate';
import { closeOnSignals } from './index';
import { startWorkers } from './jobs/workers';

const config = loadConfig();
if (!config.databaseUrl || !config.smtpUrl) {
  console.error('A worker needs DATABASE_URL and SMTP_URL. For a local setup, `npm start` runs the workers itself.');
  process.exit(1);
}
const ctx = createContext(config, { databaseUrl: config.databaseUrl, smtpUrl: config.smtpUrl });
await migrate(ctx.sequelize);
await startWorkers(ctx);
console.log('Driftproof worker taking jobs from the queue.');
closeOnSignals(() => closeContext(ctx));
