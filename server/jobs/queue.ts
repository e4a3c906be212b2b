/**
 * The PostgreSQL-backed job queue (pg-boss). Jobs are sent inside the transaction that makes
 * them necessary, so a submitted attempt always has its scoring job and nothing is half-done;
 * any number of worker processes on any number of machines take jobs from the same tables.
 */
import PgBoss from 'pg-boss';
import type { Client as PgClient } from 'pg';
import type { Transaction } from 'sequelize';

export const JOBS = {
  scoreAttempt: 'score-attempt',
  resultMail: 'result-mail',
  receiptMail: 'receipt-mail',
  invitationMail: 'invitation-mail',
  resetMail: 'reset-mail',
  confirmationMail: 'confirmation-mail',
  credentialPdf: 'credential-pdf',
  credentialNotice: 'credential-notice',
  renewalReminders: 'renewal-reminders',
} as const;
export type JobName = (typeof JOBS)[keyof typeof JOBS];

export interface JobQueue {
  /** Queues a job; with a transaction, the job exists only if the transaction commits. */
  send(name: JobName, data: object, options?: { transaction?: Transaction; singletonKey?: string }): Promise<void>;
  /** Runs `handler` for jobs of `name` in this process. */
  work<T extends object>(name: JobName, handler: (data: T) => Promise<void>): Promise<void>;
  /** Runs a job of `name` on a cron schedule (one schedule per name, whoever registers it). */
  schedule(name: JobName, cron: string): Promise<void>;
  stop(): Promise<void>;
}

export function createJobQueue(databaseUrl: string, options: { pollingSeconds?: number } = {}): JobQueue {
  const boss = new PgBoss({ connectionString: databaseUrl, max: 4, schema: 'pgboss', retryLimit: 3, retryDelay: 5 });
  boss.on('error', (error) => console.error('job queue:', error.message));
  let started: Promise<void> | undefined;
  const ready = () =>
    (started ??= boss.start().then(async () => {
      for (const name of Object.values(JOBS)) await boss.createQueue(name);
    }));

  return {
    async send(name, data, { transaction, singletonKey } = {}) {
      await ready();
      // pg-boss writes the job through the transaction's own pg client, so it commits or rolls back with it.
      const client = (transaction as (Transaction & { connection?: PgClient }) | undefined)?.connection;
      const db = client ? { executeSql: (text: string, values: unknown[]) => client.query(text, values) } : undefined;
      await boss.send(name, data, { ...(db ? { db } : {}), ...(singletonKey ? { singletonKey } : {}) });
    },
    async work(name, handler) {
      await ready();
      await boss.work(name, { pollingIntervalSeconds: options.pollingSeconds ?? 2, batchSize: 1 }, async (jobs) => {
        for (const job of jobs) await handler(job.data as never);
      });
    },
    async schedule(name, cron) {
      await ready();
      await boss.schedule(name, cron, {}, { tz: 'UTC' });
    },
    async stop() {
      if (started) await boss.stop({ graceful: true, wait: true, timeout: 10_000 });
    },
  };
}
