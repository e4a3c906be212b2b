/**
 * Attempts: the server-authoritative drive. Every batch of commands and every call is applied to
 * the drive and stored in the attempt's log inside one transaction, under a row lock on the
 * attempt, before the answer goes out. The drive in memory is only a cache: whenever it is
 * missing or behind the stored log, it is rebuilt by replaying the log.
 */
import { randomUUID } from 'node:crypto';
import { isDeepStrictEqual } from 'node:util';
import type { Transaction } from 'sequelize';
import type {
  AttemptCreate,
  AttemptStart,
  AttemptSummary,
  AttemptView,
  BatchResult,
  CallAnswer,
  Page,
  StepBatch,
} from '../../shared/schemas';
import type { z } from 'zod';
import { attemptListQuerySchema } from '../../shared/schemas';
import { DriveError, DriveSim, type DriveErrorCode, type EstimatePin } from '../../shared/sim';
import type { AppContext } from '../context';
import { Attempt, AttemptLogEntry, FleetProfile, User } from '../db/models';
import type { AttemptLogKind } from '../db/models/attempt-log-entry';
import { HttpError, notFound } from '../http/errors';
import { JOBS } from '../jobs/queue';
import { driveContentFor, publicDriveTrial } from './drive-content';
import { practiceProfileFor } from './fleet-profiles';
import { takeExamSeat } from './seats';
import { publicTrial } from './trials';

type Actor = Express.User;

const DRIVE_ERROR_STATUS: Record<DriveErrorCode, number> = {
  not_driving: 409,
  awaiting_call: 409,
  time_up: 409,
  not_awaiting_call: 409,
  wrong_call_point: 409,
  estimate_required: 400,
  no_marker_in_view: 422,
};

function asHttp(error: unknown): unknown {
  if (!(error instanceof DriveError)) return error;
  const fields = error.code === 'estimate_required' ? { estimate: error.message } : undefined;
  return new HttpError(DRIVE_ERROR_STATUS[error.code], error.code, error.message, fields);
}

export function summary(attempt: Attempt, ctx: AppContext, userName: string): AttemptSummary {
  return {
    id: attempt.id,
    trialId: attempt.trialId,
    trialTitle: ctx.content.trials.get(attempt.trialId)?.title ?? attempt.trialId,
    mode: attempt.mode,
    status: attempt.status,
    userId: attempt.userId,
    userName,
    organizationId: attempt.organizationId,
    fleetProfile: attempt.fleetProfileId ? { id: attempt.fleetProfileId, name: attempt.fleetProfile?.name ?? '' } : null,
    createdAt: attempt.createdAt.toISOString(),
    submittedAt: attempt.submittedAt?.toISOString() ?? null,
  };
}

/** What a summary shows of an attempt's owner and fleet profile: include these when loading attempts. */
export const summaryIncludes = () => [
  { model: User, as: 'user', attributes: ['name'] },
  { model: FleetProfile, as: 'fleetProfile', attributes: ['id', 'name'] },
];

/**
 * Starts a drive: practice for free (on the standard drift profile, or on a fleet profile of the
 * operator's organization that has this practice trial), exam on one of the operator's seats.
 */
export async function startAttempt(ctx: AppContext, actor: Actor, input: AttemptCreate): Promise<AttemptStart> {
  const trial = publicTrial(ctx.content, input.trialId);
  let fleetProfile: FleetProfile | null = null;
  const attempt = await ctx.sequelize.transaction(async (transaction) => {
    if (input.fleetProfileId) fleetProfile = await practiceProfileFor(ctx, actor, input.fleetProfileId, trial.id, transaction);
    const created = await Attempt.create(
      {
        id: randomUUID(),
        userId: actor.id,
        organizationId: actor.organizationId,
        trialId: trial.id,
        contentHash: ctx.content.trialHashes.get(trial.id)!,
        mode: input.mode,
        secretSeed: ctx.newSeed(),
        publicSeed: ctx.newSeed(),
        fleetProfileId: fleetProfile?.id ?? null,
        submittedAt: null,
      },
      { transaction },
    );
    if (input.mode === 'exam') await takeExamSeat(actor.organizationId, created.id, actor.id, transaction);
    return created;
  });
  attempt.fleetProfile = fleetProfile;
  const sim = await newDrive(ctx, attempt);
  ctx.drives.set(attempt.id, { logLength: 0, userId: attempt.userId, sim });
  return { attempt: summary(attempt, ctx, actor.name), publicSeed: attempt.publicSeed, trial: publicDriveTrial(ctx.content, sim.setup), state: sim.state() };
}

/** A fresh drive of an attempt, on its effective trial and robot (drive-content.ts). */
async function newDrive(ctx: AppContext, attempt: Attempt, transaction?: Transaction): Promise<DriveSim> {
  const { trial, robot } = await driveContentFor(ctx, attempt, transaction);
  return new DriveSim({ trial, robot, surfaces: [...ctx.content.surfaces.values()], secretSeed: attempt.secretSeed });
}

/** Applies one stored log entry to a drive being rebuilt. */
function replay(sim: DriveSim, entry: Pick<AttemptLogEntry, 'kind' | 'request'>) {
  const request = entry.request as Record<string, unknown>;
  if (entry.kind === 'steps') sim.applyBatch((request as StepBatch).commands);
  else if (entry.kind === 'call') {
    const call = request as CallAnswer;
    sim.answerCall(call.callPointId, call.call, call.estimate ?? null);
  } else sim.finish(entry.kind === 'submit' ? 'submitted' : 'abandoned');
}

/** The drive of an attempt, from the cache when it is up to date with the log, else by replay. */
export async function driveOf(ctx: AppContext, attempt: Attempt, transaction?: Transaction): Promise<DriveSim> {
  const cached = ctx.drives.get(attempt.id);
  if (cached && cached.logLength === attempt.logLength) return cached.sim;
  const sim = await newDrive(ctx, attempt, transaction);
  const entries = await AttemptLogEntry.findAll({ where: { attemptId: attempt.id }, order: [['entryNo', 'ASC']], transaction });
  for (const entry of entries) replay(sim, entry);
  ctx.drives.set(attempt.id, { logLength: entries.length, userId: attempt.userId, sim });
  return sim;
}

/** The operator's own attempt, locked for this transaction. Someone else's is "not found". */
async function lockOwnAttempt(actor: Actor, attemptId: string, transaction: Transaction): Promise<Attempt> {
  const attempt = await Attempt.findByPk(attemptId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!attempt || attempt.userId !== actor.id) throw notFound('That attempt');
  return attempt;
}

/**
 * Runs one change to a drive: locks the attempt, brings its drive up to date, applies the change,
 * appends it to the log and updates the attempt, all in one transaction. On any failure the cached
 * drive is dropped, so the next request rebuilds it from what was stored.
 */
async function changeDrive<T extends object>(
  ctx: AppContext,
  actor: Actor,
  attemptId: string,
  kind: AttemptLogKind,
  request: object,
  apply: (sim: DriveSim, attempt: Attempt, transaction: Transaction) => Promise<T | { stored: unknown }> | T | { stored: unknown },
  fromSeq: number | null = null,
): Promise<unknown> {
  try {
    return await ctx.sequelize.transaction(async (transaction) => {
      const attempt = await lockOwnAttempt(actor, attemptId, transaction);
      const sim = await driveOf(ctx, attempt, transaction);
      const outcome = await apply(sim, attempt, transaction);
      if ('stored' in outcome) return outcome.stored;
      const state = sim.state();
      await AttemptLogEntry.create({ attemptId, entryNo: attempt.logLength, kind, fromSeq, request, response: outcome }, { transaction });
      await attempt.update(
        {
          logLength: attempt.logLength + 1,
          nextSeq: state.seq,
          status: state.status,
          ...(kind === 'submit' || kind === 'abandon' ? { submittedAt: new Date() } : {}),
        },
        { transaction },
      );
      ctx.drives.set(attemptId, { logLength: attempt.logLength, userId: attempt.userId, sim });
      return outcome;
    });
  } catch (error) {
    // A refusal (HttpError, DriveError) comes before the drive is changed, so the held drive is
    // still that of the log; anything else (the database) may have left it ahead of the log.
    if (!(error instanceof HttpError || error instanceof DriveError)) ctx.drives.delete(attemptId);
    throw asHttp(error);
  }
}

/** Compares a request with one stored as jsonb (which reorders object keys). */
const sameJson = (a: unknown, b: unknown) => isDeepStrictEqual(a, b);

/**
 * Applies a numbered batch of commands. A resent batch gets its stored answer; a gap or a different
 * resend gets 409. The usual batch (the next one, on a drive this process holds) takes the short
 * way of {@link appendToHeldDrive}; everything else the general one.
 */
export function applySteps(ctx: AppContext, actor: Actor, attemptId: string, batch: StepBatch): Promise<BatchResult> {
  return ctx.drives.exclusive(attemptId, async () => (await appendToHeldDrive(ctx, actor, attemptId, batch)) ?? applyStepsLocked(ctx, actor, attemptId, batch));
}

/**
 * The next batch of a drive this process holds, stored in one statement: the attempt's row is
 * advanced only if its log is still as long as the held drive's (so no other process moved the
 * drive meanwhile), and the log entry is written with it. Returns null when the general way must
 * decide: no held drive, a resend or a gap, a drive that is not driving, or a log that moved on.
 */
async function appendToHeldDrive(ctx: AppContext, actor: Actor, attemptId: string, batch: StepBatch): Promise<BatchResult | null> {
  const held = ctx.drives.get(attemptId);
  const now = held?.sim.state();
  if (!held || !now || held.userId !== actor.id || now.status !== 'driving' || now.seq !== batch.fromSeq) return null;
  try {
    const result = held.sim.applyBatch(batch.commands);
    const [rows] = await ctx.sequelize.query(
      `WITH advanced AS (
         UPDATE attempts SET log_length = log_length + 1, next_seq = $1, status = $2, updated_at = now()
          WHERE id = $3 AND user_id = $4 AND log_length = $5
          RETURNING id)
       INSERT INTO attempt_log (attempt_id, entry_no, kind, from_seq, request, response)
       SELECT id, $5, 'steps', $6, $7::jsonb, $8::jsonb FROM advanced
       RETURNING entry_no`,
      { bind: [result.state.seq, result.state.status, attemptId, actor.id, held.logLength, batch.fromSeq, JSON.stringify(batch), JSON.stringify(result)] },
    );
    if (rows.length === 0) {
      ctx.drives.delete(attemptId); // another process moved the drive: rebuild it from the log
      return null;
    }
    ctx.drives.set(attemptId, { ...held, logLength: held.logLength + 1 });
    return result;
  } catch (error) {
    ctx.drives.delete(attemptId);
    throw asHttp(error);
  }
}

function applyStepsLocked(ctx: AppContext, actor: Actor, attemptId: string, batch: StepBatch): Promise<BatchResult> {
  return changeDrive(
    ctx,
    actor,
    attemptId,
    'steps',
    batch,
    async (sim, attempt, transaction) => {
      if (batch.fromSeq < attempt.nextSeq) {
        const stored = await AttemptLogEntry.findOne({ where: { attemptId, kind: 'steps', fromSeq: batch.fromSeq }, transaction });
        if (stored && sameJson((stored.request as StepBatch).commands, batch.commands)) return { stored: stored.response };
        throw seqConflict(attempt.nextSeq, 'This batch does not match the one stored for that seq.');
      }
      if (batch.fromSeq > attempt.nextSeq) throw seqConflict(attempt.nextSeq, 'Commands are missing before this batch.');
      return sim.applyBatch(batch.commands);
    },
    batch.fromSeq,
  ) as Promise<BatchResult>;
}

const seqConflict = (expectedSeq: number, message: string) =>
  new HttpError(409, 'seq_conflict', `${message} The next batch must start at seq ${expectedSeq}.`, undefined, { expectedSeq });

/** Answers the call point the drive is waiting at. Resending the same answer gets the stored one. */
export function answerCall(ctx: AppContext, actor: Actor, attemptId: string, answer: CallAnswer): Promise<BatchResult> {
  return ctx.drives.exclusive(attemptId, () => changeDrive(ctx, actor, attemptId, 'call', answer, async (sim, _attempt, transaction) => {
    const earlier = await AttemptLogEntry.findAll({ where: { attemptId, kind: 'call' }, transaction });
    const same = earlier.find((e) => (e.request as CallAnswer).callPointId === answer.callPointId);
    if (same) {
      if (sameJson(same.request, answer)) return { stored: same.response };
      throw new HttpError(409, 'call_already_made', 'A different call was already made at this call point.');
    }
    return sim.answerCall(answer.callPointId, answer.call, (answer.estimate as EstimatePin | undefined) ?? null);
  })) as Promise<BatchResult>;
}

/**
 * Ends the drive: submitted for scoring (the scoring job is queued in the same transaction), or
 * abandoned. Repeating it is harmless.
 */
export async function finishAttempt(ctx: AppContext, actor: Actor, attemptId: string, how: 'submit' | 'abandon'): Promise<AttemptView> {
  await ctx.drives.exclusive(attemptId, () => changeDrive(ctx, actor, attemptId, how, {}, async (sim, attempt, transaction) => {
    if (attempt.status === 'submitted' || attempt.status === 'abandoned') {
      if ((how === 'submit') === (attempt.status === 'submitted')) return { stored: null };
      throw new HttpError(409, 'attempt_over', `This attempt was already ${attempt.status}.`);
    }
    const state = sim.finish(how === 'submit' ? 'submitted' : 'abandoned');
    if (how === 'submit') await ctx.jobs.send(JOBS.scoreAttempt, { attemptId }, { transaction, singletonKey: attemptId });
    return { state };
  }));
  return viewAttempt(ctx, actor, attemptId);
}

/** Who may see an attempt: its operator, their employer, assessors and admins. */
export function canSee(actor: Actor, attempt: Attempt): boolean {
  if (actor.role === 'admin' || actor.role === 'assessor') return true;
  if (actor.role === 'operator') return attempt.userId === actor.id;
  if (actor.role === 'employer') return attempt.organizationId !== null && attempt.organizationId === actor.organizationId;
  return false;
}

export async function viewAttempt(ctx: AppContext, actor: Actor, attemptId: string): Promise<AttemptView> {
  // The row is read in the attempt's turn, so it is never behind the drive this process holds.
  const { attempt, sim } = await ctx.drives.exclusive(attemptId, async () => {
    const attempt = await Attempt.findByPk(attemptId, { include: summaryIncludes() });
    if (!attempt || !canSee(actor, attempt)) throw notFound('That attempt');
    return { attempt, sim: await driveOf(ctx, attempt) };
  });
  const userName = (attempt as Attempt & { user?: User }).user?.name ?? '';
  const view: AttemptView = {
    attempt: summary(attempt, ctx, userName),
    trial: publicDriveTrial(ctx.content, sim.setup),
    publicSeed: attempt.publicSeed,
    state: sim.state(),
    odometryTrail: sim.trace.map((s) => s.odometry),
    reanchors: sim.trace.flatMap((s, index) => (s.reanchor ? [{ index, noise: s.reanchor }] : [])),
  };
  if (attempt.status === 'submitted' || attempt.status === 'abandoned') {
    const log = await AttemptLogEntry.findAll({ where: { attemptId }, order: [['entryNo', 'ASC']] });
    view.result = {
      secretSeed: attempt.secretSeed,
      trace: sim.trace,
      calls: sim.calls,
      truePose: sim.truePose(),
      log: log.map((e) => ({ entryNo: e.entryNo, kind: e.kind, request: e.request, response: e.response, createdAt: e.createdAt.toISOString() })),
    };
  }
  return view;
}

export async function listAttempts(ctx: AppContext, actor: Actor, query: z.infer<typeof attemptListQuerySchema>): Promise<Page<AttemptSummary>> {
  const where: Record<string, unknown> = {};
  if (actor.role === 'operator') where.userId = actor.id;
  else if (actor.role === 'employer') where.organizationId = actor.organizationId;
  if (query.userId && actor.role !== 'operator') where.userId = query.userId;
  if (query.status) where.status = query.status;
  if (query.trialId) where.trialId = query.trialId;
  const { rows, count } = await Attempt.findAndCountAll({
    where,
    include: summaryIncludes(),
    order: [['createdAt', query.sortOrder.toUpperCase()], ['id', 'ASC']],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return {
    items: rows.map((a) => summary(a, ctx, (a as Attempt & { user?: User }).user?.name ?? '')),
    total: count,
    page: query.page,
    pageSize: query.pageSize,
  };
}
