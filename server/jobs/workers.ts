/** The job handlers a worker process runs. */
import type { AppContext } from '../context';
import { sendOperatorInvitation } from '../services/enrolment';
import { sendReceipt } from '../services/receipts';
import { scoreSubmittedAttempt, sendResultMail } from '../services/scores';
import { JOBS } from './queue';

export async function startWorkers(ctx: AppContext): Promise<void> {
  await ctx.jobs.work<{ attemptId: string }>(JOBS.scoreAttempt, ({ attemptId }) => scoreSubmittedAttempt(ctx, attemptId));
  await ctx.jobs.work<{ attemptId: string }>(JOBS.resultMail, ({ attemptId }) => sendResultMail(ctx, attemptId));
  await ctx.jobs.work<{ orderId: string }>(JOBS.receiptMail, ({ orderId }) => sendReceipt(ctx, orderId));
  await ctx.jobs.work<{ userId: number }>(JOBS.invitationMail, ({ userId }) => sendOperatorInvitation(ctx, userId));
}
