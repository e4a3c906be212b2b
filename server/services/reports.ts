/** The attempt report: score, review and the drive itself, for the operator, their employer, assessors and admins. */
import type { AttemptReport } from '../../shared/schemas';
import type { AppContext } from '../context';
import { Attempt, AttemptScore, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { canSee, driveOf, summary, summaryIncludes } from './attempts';
import { publicDriveTrial } from './drive-content';
import { reviewInfo } from './reviews';

export async function attemptReport(ctx: AppContext, actor: Express.User, attemptId: string): Promise<AttemptReport> {
  const attempt = (await Attempt.findByPk(attemptId, { include: summaryIncludes() })) as (Attempt & { user?: User }) | null;
  if (!attempt || !canSee(actor, attempt)) throw notFound('That attempt');
  if (attempt.status !== 'submitted') throw new HttpError(409, 'not_submitted', 'A report exists only for a submitted drive.');
  const score = await AttemptScore.findByPk(attemptId);
  if (!score) throw new HttpError(409, 'scoring', 'The drive is being scored. The report will be ready in a moment.');
  const sim = await driveOf(ctx, attempt);
  return {
    attempt: summary(attempt, ctx, attempt.user?.name ?? ''),
    trial: publicDriveTrial(ctx.content, sim.setup),
    publicSeed: attempt.publicSeed,
    score: score.result,
    finalScore: score.finalResult,
    finalPassed: score.finalPassed,
    review: await reviewInfo(attemptId, score.reviewStatus),
    trace: sim.trace,
    truePose: sim.truePose(),
  };
}
