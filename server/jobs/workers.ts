/** The job handlers a worker process runs. */
import type { AppContext } from '../context';
import { scoreSubmittedAttempt, sendResultMail } from '../services/scores';
import { JOBS } from './queue';

export async function startWorkers(ctx: AppContext): Promise<void> {
  await ctx.jobs.work<{ attemptId: string }>(JOBS.scoreAttempt, ({ attemptId }) => scoreSubmittedAttempt(ctx, attemptId));
  await ctx.jobs.work<{ attemptId: string }>(JOBS.resultMail, ({ attemptId }) => sendResultMail(ctx, attemptId));
}
