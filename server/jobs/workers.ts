/** The job handlers a worker process runs. */
import type { AppContext } from '../context';
import { makeCertificate, queueRenewalReminders, sendCredentialNotice } from '../services/credentials';
import { sendOperatorInvitation } from '../services/enrolment';
import { sendResetMail } from '../services/password-tokens';
import { sendConfirmationMail } from '../services/signup';
import { sendReceipt } from '../services/receipts';
import { scoreSubmittedAttempt, sendResultMail } from '../services/scores';
import { JOBS } from './queue';

export async function startWorkers(ctx: AppContext): Promise<void> {
  await ctx.jobs.work<{ attemptId: string }>(JOBS.scoreAttempt, ({ attemptId }) => scoreSubmittedAttempt(ctx, attemptId));
  await ctx.jobs.work<{ attemptId: string }>(JOBS.resultMail, ({ attemptId }) => sendResultMail(ctx, attemptId));
  await ctx.jobs.work<{ orderId: string }>(JOBS.receiptMail, ({ orderId }) => sendReceipt(ctx, orderId));
  await ctx.jobs.work<{ userId: number }>(JOBS.invitationMail, ({ userId }) => sendOperatorInvitation(ctx, userId));
  await ctx.jobs.work<{ userId: number }>(JOBS.resetMail, ({ userId }) => sendResetMail(ctx, userId));
  await ctx.jobs.work<{ userId: number }>(JOBS.confirmationMail, ({ userId }) => sendConfirmationMail(ctx, userId));
  await ctx.jobs.work<{ credentialId: number }>(JOBS.credentialPdf, ({ credentialId }) => makeCertificate(ctx, credentialId));
  await ctx.jobs.work<{ credentialId: number; kind: 'revoked' | `expires-in-${number}` }>(JOBS.credentialNotice, ({ credentialId, kind }) => sendCredentialNotice(ctx, credentialId, kind));
  await ctx.jobs.work(JOBS.renewalReminders, async () => void (await queueRenewalReminders(ctx)));
  // Every day at 06:00 UTC; pg-boss keeps one schedule however many workers register it.
  await ctx.jobs.schedule(JOBS.renewalReminders, '0 6 * * *');
}
