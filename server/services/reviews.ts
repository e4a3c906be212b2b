/**
 * The assessor's review: a queue of attempts waiting for a verdict, a claim, and a signed verdict
 * (confirm, amend with a reason per change, or void with the seat returned). A signed review is
 * never overwritten, and every step is written to the append-only audit log.
 */
import { Op, type WhereOptions } from 'sequelize';
import { applyAmendments } from '../../shared/scoring';
import type { AuditEntry, Page, ReviewInfo, ReviewQueueItem, ReviewQueueQuery, VerdictInput } from '../../shared/schemas';
import type { AppContext } from '../context';
import { Attempt, AttemptReview, AttemptScore, Organization, ReviewAuditEntry, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { finalize } from './scores';
import { returnExamSeat } from './seats';

type Actor = Express.User;

const OPEN: AttemptScore['reviewStatus'][] = ['awaiting', 'in_review'];
const SIGNED: AttemptScore['reviewStatus'][] = ['confirmed', 'amended', 'voided'];

export async function reviewQueue(ctx: AppContext, query: ReviewQueueQuery): Promise<Page<ReviewQueueItem>> {
  const statuses = query.status === 'open' ? OPEN : query.status === 'signed' ? SIGNED : [query.status];
  const scoreWhere: WhereOptions<AttemptScore> = { reviewStatus: statuses };
  if (query.flagged) Object.assign(scoreWhere, { flagged: query.flagged === 'yes' });
  const attemptWhere: Record<string, unknown> = {};
  const trialIds = query.levelId ? (ctx.content.levels.find((l) => l.id === query.levelId)?.requiredTrials ?? []) : undefined;
  if (query.trialId) attemptWhere.trialId = trialIds && !trialIds.includes(query.trialId) ? '' : query.trialId;
  else if (trialIds) attemptWhere.trialId = trialIds;
  if (query.minAgeHours !== undefined) attemptWhere.submittedAt = { [Op.lte]: new Date(Date.now() - query.minAgeHours * 3_600_000) };
  const direction = query.sortOrder === 'desc' ? 'DESC' : 'ASC';
  const { rows, count } = await AttemptScore.findAndCountAll({
    where: scoreWhere,
    include: [
      {
        model: Attempt,
        as: 'attempt',
        where: attemptWhere,
        include: [{ model: User, as: 'user', include: [{ model: Organization, as: 'organization' }] }],
      },
      { model: AttemptReview, as: 'review', required: false, include: [{ model: User, as: 'assessor' }] },
    ],
    order: query.sortField === 'total' ? [['total', direction], ['attemptId', 'ASC']] : [[{ model: Attempt, as: 'attempt' }, 'submittedAt', direction], ['attemptId', 'ASC']],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  type Row = AttemptScore & { attempt: Attempt & { user: User }; review?: AttemptReview & { assessor?: User } };
  return {
    items: (rows as Row[]).map((row) => ({
      attemptId: row.attemptId,
      trialId: row.attempt.trialId,
      trialTitle: ctx.content.trials.get(row.attempt.trialId)?.title ?? row.attempt.trialId,
      levelIds: ctx.content.levels.filter((l) => l.requiredTrials.includes(row.attempt.trialId)).map((l) => l.id),
      operatorName: row.attempt.user.name,
      organizationName: row.attempt.user.organization?.name ?? null,
      mode: row.attempt.mode,
      submittedAt: row.attempt.submittedAt!.toISOString(),
      total: row.total,
      passed: row.passed,
      flags: row.result.flags,
      status: row.reviewStatus,
      assessorId: row.review?.assessorId ?? null,
      assessorName: row.review?.assessor?.name ?? null,
    })),
    total: count,
    page: query.page,
    pageSize: query.pageSize,
  };
}

export async function reviewInfo(attemptId: string, status: AttemptScore['reviewStatus']): Promise<ReviewInfo> {
  const review = (await AttemptReview.findByPk(attemptId, { include: [{ model: User, as: 'assessor' }] })) as (AttemptReview & { assessor?: User }) | null;
  return {
    status,
    assessorId: review?.assessorId ?? null,
    assessorName: review?.assessor?.name ?? null,
    claimedAt: review?.claimedAt.toISOString() ?? null,
    verdict: review?.verdict ?? null,
    reason: review?.reason ?? null,
    amendments: review?.amendments ?? [],
    signedAt: review?.signedAt?.toISOString() ?? null,
  };
}

async function reviewable(actor: Actor, attemptId: string, transaction: import('sequelize').Transaction) {
  const attempt = await Attempt.findByPk(attemptId, { transaction });
  if (!attempt) throw notFound('That attempt');
  if (attempt.userId === actor.id) throw new HttpError(403, 'own_attempt', 'You cannot review an attempt of your own.');
  const score = await AttemptScore.findByPk(attemptId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!score) throw new HttpError(409, 'not_scored', 'This attempt has not been scored yet.');
  if (score.reviewStatus === 'not_required') throw new HttpError(409, 'no_review_needed', 'This attempt does not need a review.');
  if (SIGNED.includes(score.reviewStatus)) throw new HttpError(409, 'review_signed', 'This review is signed and cannot be changed.');
  return { attempt, score };
}

/** Claims an attempt for review; someone else's open claim is refused. */
export async function claimReview(ctx: AppContext, actor: Actor, attemptId: string): Promise<ReviewInfo> {
  await ctx.sequelize.transaction(async (transaction) => {
    const { score } = await reviewable(actor, attemptId, transaction);
    const existing = await AttemptReview.findByPk(attemptId, { transaction });
    if (existing && existing.assessorId !== actor.id) throw new HttpError(409, 'claimed_by_other', 'Another assessor is reviewing this attempt.');
    if (existing) return;
    await AttemptReview.create({ attemptId, assessorId: actor.id, verdict: null, reason: null, signedAt: null }, { transaction });
    await score.update({ reviewStatus: 'in_review' }, { transaction });
    await ReviewAuditEntry.create({ attemptId, actorId: actor.id, action: 'claimed', reason: null }, { transaction });
  });
  const score = await AttemptScore.findByPk(attemptId);
  return reviewInfo(attemptId, score!.reviewStatus);
}

/** Signs a verdict on an attempt the assessor has claimed. */
export async function signVerdict(ctx: AppContext, actor: Actor, attemptId: string, input: VerdictInput): Promise<ReviewInfo> {
  await ctx.sequelize.transaction(async (transaction) => {
    const { attempt, score } = await reviewable(actor, attemptId, transaction);
    const review = await AttemptReview.findByPk(attemptId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!review || review.assessorId !== actor.id) throw new HttpError(409, 'not_claimed', 'Claim the attempt before signing a verdict.');
    const trial = ctx.content.trials.get(attempt.trialId)!;
    let result = score.result;
    if (input.verdict === 'amend') {
      const callIds = new Set(score.result.calls.map((c) => c.callPointId));
      input.amendments.forEach((a, i) => {
        if (a.target === 'call' && !callIds.has(a.callPointId)) {
          throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { [`amendments.${i}.callPointId`]: 'No call was made at that call point.' });
        }
      });
      result = applyAmendments(score.result, input.amendments, trial.rubric);
    }
    const amendments = input.verdict === 'amend' ? input.amendments : [];
    await review.update({ verdict: input.verdict, reason: input.reason ?? null, amendments, signedAt: new Date() }, { transaction });
    for (const amendment of amendments) {
      await ReviewAuditEntry.create(
        { attemptId, actorId: actor.id, action: `amended ${amendment.target}`, reason: amendment.reason, details: { ...amendment, reason: undefined } },
        { transaction },
      );
    }
    const status = input.verdict === 'confirm' ? 'confirmed' : input.verdict === 'amend' ? 'amended' : 'voided';
    await ReviewAuditEntry.create(
      { attemptId, actorId: actor.id, action: status, reason: input.reason ?? null, details: { total: result.total, passed: input.verdict !== 'void' && result.passed } },
      { transaction },
    );
    if (input.verdict === 'void') await returnExamSeat(attemptId, transaction);
    await finalize(ctx, score, input.verdict === 'void' ? null : result, status, transaction);
  });
  const score = await AttemptScore.findByPk(attemptId);
  return reviewInfo(attemptId, score!.reviewStatus);
}

export async function auditLog(attemptId: string): Promise<AuditEntry[]> {
  const rows = (await ReviewAuditEntry.findAll({ where: { attemptId }, order: [['id', 'ASC']], include: [{ model: User, as: 'actor' }] })) as (ReviewAuditEntry & { actor?: User })[];
  return rows.map((r) => ({ id: Number(r.id), action: r.action, actorName: r.actor?.name ?? null, reason: r.reason, details: r.details, createdAt: r.createdAt.toISOString() }));
}
