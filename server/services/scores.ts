/**
 * Scoring a submitted attempt (run by the job queue) and making its result final. The score is a
 * pure function of the trial, the public seed and the stored log (shared/scoring); it is stored
 * with the engine version, and scoring the same attempt again changes nothing.
 */
import type { Transaction } from 'sequelize';
import { scoreAttempt, SCORING_VERSION, type AttemptScore as Score } from '../../shared/scoring';
import type { AppContext } from '../context';
import { Attempt, AttemptScore, ReviewAuditEntry, User } from '../db/models';
import type { ReviewStatus } from '../db/models/attempt-score';
import { JOBS } from '../jobs/queue';
import { driveOf } from './attempts';
import { issueCredentialsFor } from './credentials';
import { resultEmail } from './emails';

/**
 * Computes the score of a submitted attempt from its stored log, with the trial and robot the
 * drive ran on (a fleet profile's robot and alphas for practice on one; drive-content.ts).
 */
export async function computeScore(ctx: AppContext, attempt: Attempt): Promise<Score> {
  const sim = await driveOf(ctx, attempt);
  const { trial, robot } = sim.setup;
  const state = sim.state();
  return scoreAttempt({
    trial,
    robot,
    surfaces: [...ctx.content.surfaces.values()],
    publicSeed: attempt.publicSeed,
    trace: sim.trace,
    calls: sim.calls,
    status: attempt.status,
    time: state.time,
    contacts: state.contacts,
    truePose: sim.truePose(),
  });
}

/**
 * Whether an assessor must see the attempt: exam attempts whose trial or level always requires a
 * review, or requires one when failed, and any exam attempt the engine flagged. Practice is final at once.
 */
export function reviewNeeded(ctx: AppContext, attempt: Attempt, score: Score): boolean {
  if (attempt.mode !== 'exam') return false;
  const trial = ctx.content.trials.get(attempt.trialId)!;
  const rules = [trial.rubric.review, ...ctx.content.levels.filter((l) => l.requiredTrials.includes(trial.id)).map((l) => l.review)];
  return rules.includes('always') || (rules.includes('failed') && !score.passed) || score.flags.length > 0;
}

/** The job: scores a submitted attempt once; a repeated job finds the score and does nothing. */
export async function scoreSubmittedAttempt(ctx: AppContext, attemptId: string): Promise<void> {
  const attempt = await Attempt.findByPk(attemptId);
  if (!attempt || attempt.status !== 'submitted') return;
  if (await AttemptScore.findByPk(attemptId)) return;
  const score = await computeScore(ctx, attempt);
  const review = reviewNeeded(ctx, attempt, score);
  await ctx.sequelize.transaction(async (transaction) => {
    const [row, created] = await AttemptScore.findOrCreate({
      where: { attemptId },
      defaults: {
        attemptId,
        version: SCORING_VERSION,
        result: score,
        total: score.total,
        passed: score.passed,
        flagged: score.flags.length > 0,
        reviewStatus: review ? 'awaiting' : 'not_required',
        finalResult: null,
        finalPassed: null,
        finalizedAt: null,
      },
      transaction,
    });
    if (!created) return;
    await ReviewAuditEntry.create(
      { attemptId, actorId: null, action: 'scored', reason: null, details: { version: SCORING_VERSION, total: score.total, passed: score.passed, flags: score.flags, review } },
      { transaction },
    );
    if (!review) await finalize(ctx, row, score, 'not_required', transaction);
  });
}

/** Makes a result final and queues the e-mail to the operator. */
export async function finalize(ctx: AppContext, row: AttemptScore, result: Score | null, status: ReviewStatus, transaction: Transaction) {
  await row.update(
    { reviewStatus: status, finalResult: result, finalPassed: result ? result.passed : null, finalizedAt: new Date() },
    { transaction },
  );
  await ctx.jobs.send(JOBS.resultMail, { attemptId: row.attemptId }, { transaction, singletonKey: row.attemptId });
  if (result?.passed) {
    const attempt = (await Attempt.findByPk(row.attemptId, { transaction }))!;
    if (attempt.mode === 'exam') await issueCredentialsFor(ctx, attempt.userId, transaction);
  }
}

/** The job: tells the operator their result is final. */
export async function sendResultMail(ctx: AppContext, attemptId: string): Promise<void> {
  const attempt = await Attempt.findByPk(attemptId, { include: [{ model: User, as: 'user' }] });
  const score = await AttemptScore.findByPk(attemptId);
  const user = (attempt as (Attempt & { user?: User }) | null)?.user;
  if (!attempt || !score?.finalizedAt || !user) return;
  const trial = ctx.content.trials.get(attempt.trialId);
  const outcome = score.reviewStatus === 'voided' ? 'voided' : score.finalPassed ? 'passed' : 'not passed';
  const link = `${ctx.config.appUrl}/attempts/${attemptId}/report`;
  await ctx.mailer.send(resultEmail(user.email, user.name, trial?.title ?? attempt.trialId, outcome, score.finalResult?.total ?? null, link));
}
