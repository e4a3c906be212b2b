/**
 * Fleet calibration: an employer's own drift profile, computed on the server from their files
 * (UMBmark runs → Ed, Eb; paired odometry/reference poses → a1..a4; shared/calibration), never
 * from numbers a client sends. Previews store nothing; saving keeps the profile, both source
 * files byte for byte and the reports in one transaction. Operators of the organization practise
 * on a profile's assigned trials (drive-content.ts makes the robot they drive).
 */
import { createHash, randomUUID } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Transaction } from 'sequelize';
import { calibrateUmbmarkCsv, pairedPosesFromCsvRecords, type AlphaFitReport, type NoiseComponent } from '../../shared/calibration';
import {
  FLEET_ALPHA_MAX,
  FLEET_BOOTSTRAP_RESAMPLES,
  FLEET_POSES_MAX_BYTES,
  FLEET_POSES_MAX_ROWS,
  FLEET_RESIDUALS_MAX,
  FLEET_UMBMARK_MAX_BYTES,
  systematicErrorsSchema,
  type AlphaFitView,
  type DriftProfile,
  type FleetFileKind,
  type FleetPracticeTrial,
  type FleetProfileDetail,
  type FleetProfileFields,
  type FleetProfileSummary,
  type FleetRobot,
  type FleetRobotFields,
  type Robot,
  type UmbmarkView,
} from '../../shared/schemas';
import { PROJECT_ROOT } from '../config';
import type { Content } from '../content/load';
import type { AppContext } from '../context';
import { FleetPracticeTrial as PracticeTrialRow, FleetProfile, FleetProfileFile, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import type { UploadedFile, UploadSpec } from '../http/upload';
import { runAlphaFit } from './alpha-fit-runner';
import { readCalibrationCsv, calibrationRowsError } from './calibration-csv';

type Actor = Express.User;

/** The two uploads, by multipart field. */
export const FLEET_UPLOADS = {
  runs: { field: 'runs', maxBytes: FLEET_UMBMARK_MAX_BYTES, what: 'The UMBmark runs file' },
  poses: { field: 'poses', maxBytes: FLEET_POSES_MAX_BYTES, what: 'The paired-pose file' },
} as const satisfies Record<string, UploadSpec>;

/** The robot of a calibration: a content robot with the employer's geometry where given. */
export function fleetRobotFor(content: Content, fields: FleetRobotFields): { robot: FleetRobot; base: Robot } {
  const base = content.robots.get(fields.robotId);
  if (!base) throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { robotId: `No robot "${fields.robotId}".` });
  return {
    base,
    robot: {
      baseRobotId: base.id,
      name: base.name,
      wheelRadius: fields.wheelRadius ?? base.wheelRadius,
      wheelbase: fields.wheelbase ?? base.wheelbase,
      ticksPerRevolution: fields.ticksPerRevolution ?? base.ticksPerRevolution,
    },
  };
}

/** UMBmark runs file → report (Ed, Eb, E_max,syst, corrected geometry), or 400 calibration_rows. */
export function umbmarkFromFile(robot: FleetRobot, file: Buffer): UmbmarkView {
  const what = FLEET_UPLOADS.runs.what;
  const { header, records, rowNumbers } = readCalibrationCsv(file, what, 10_000);
  const result = calibrateUmbmarkCsv(records, robot, { header, rowNumbers });
  if (!result.ok) throw calibrationRowsError(result.problems, what);
  return { robot, report: result.report };
}

const attachThe = (spec: UploadSpec) => new HttpError(400, 'no_file', `Attach ${spec.what.replace(/^The /, 'the ')} as a CSV file in the field "${spec.field}".`);

/** The UMBmark preview: the report of the runs for the robot; nothing is stored. */
export function previewUmbmark(ctx: AppContext, fields: FleetRobotFields, runs: UploadedFile | undefined): UmbmarkView {
  const { robot } = fleetRobotFor(ctx.content, fields);
  if (!runs) throw attachThe(FLEET_UPLOADS.runs);
  return umbmarkFromFile(robot, runs.bytes);
}

/** The alpha-fit preview; nothing is stored. */
export function previewAlphaFit(poses: UploadedFile | undefined, signal?: AbortSignal): Promise<AlphaFitView> {
  if (!poses) throw attachThe(FLEET_UPLOADS.poses);
  return alphaFitFromFile(poses.bytes, signal);
}

/** Every n-th item so that at most `max` remain, spread evenly over the whole list. */
export function thinEvenly<T>(items: readonly T[], max: number): T[] {
  if (items.length <= max) return [...items];
  return Array.from({ length: max }, (_, i) => items[Math.floor((i * items.length) / max)]);
}

/** Why fitted alphas cannot make a fleet profile (one above FLEET_ALPHA_MAX), or null. */
export function alphasTooLarge(alphas: readonly number[]): string | null {
  if (!alphas.some((a) => a > FLEET_ALPHA_MAX)) return null;
  const list = alphas.map((a, i) => `a${i + 1} = ${a.toPrecision(3)}`).join(', ');
  return `The poses give ${list}; a fleet profile needs each at most ${FLEET_ALPHA_MAX}, where the drift is already as large as the motion itself. Check that both tracks are in metres and radians, in the same frame, and sampled at the same moments.`;
}

/**
 * The alpha-fit report as the API shows and stores it: the residuals of each noise term thinned
 * on their own (so each plot keeps its share, over all the steps), with the total count;
 * a fit too large to save says so first among its warnings.
 */
export function alphaFitView(report: AlphaFitReport): AlphaFitView {
  const components: NoiseComponent[] = ['rot1', 'trans', 'rot2'];
  const perComponent = Math.floor(FLEET_RESIDUALS_MAX / components.length);
  const residuals = components.flatMap((c) => thinEvenly(report.residuals.filter((r) => r.component === c), perComponent));
  const tooLarge = alphasTooLarge(report.alphas);
  const warnings = tooLarge ? [`${tooLarge} This fit cannot be saved as a fleet profile.`, ...report.warnings] : report.warnings;
  return { ...report, residuals, residualsTotal: report.residuals.length, warnings };
}

/**
 * Paired-pose file → maximum-likelihood a1..a4 with bootstrap intervals and residuals, or 400
 * calibration_rows. The bootstrap is seeded with the file's SHA-256, so the same file always gives
 * the same intervals. Runs in a worker thread (alpha-fit-runner.ts).
 */
export async function alphaFitFromFile(file: Buffer, signal?: AbortSignal): Promise<AlphaFitView> {
  const what = FLEET_UPLOADS.poses.what;
  const { header, records, rowNumbers } = readCalibrationCsv(file, what, FLEET_POSES_MAX_ROWS);
  const poses = pairedPosesFromCsvRecords(records, { header, rowNumbers });
  if (poses.problems.length > 0) throw calibrationRowsError(poses.problems, what);
  const seed = createHash('sha256').update(file).digest('hex');
  const report = await runAlphaFit({ odometry: poses.odometry, reference: poses.reference, resamples: FLEET_BOOTSTRAP_RESAMPLES, seed }, signal);
  return alphaFitView(report);
}

/**
 * The effective drift profile: alphas from the alpha fit (else the base robot's assumed ones),
 * Ed and Eb from UMBmark (else the base robot's real ones). Ed and Eb outside the ranges every
 * robot must keep (systematicErrorsSchema), or an alpha above FLEET_ALPHA_MAX, are refused with a 400.
 */
export function effectiveDriftProfile(base: Robot, umbmark: UmbmarkView | null, alphaFit: AlphaFitView | null): DriftProfile {
  const ed = umbmark ? umbmark.report.ed : base.hiddenErrors.ed;
  const eb = umbmark ? umbmark.report.eb : base.hiddenErrors.eb;
  if (!systematicErrorsSchema.safeParse({ ed, eb }).success) {
    const message = `The runs give Ed = ${ed.toFixed(4)} and Eb = ${eb.toFixed(4)}; a fleet profile needs Ed between 0.9 and 1.1 and Eb between 0.8 and 1.2. Check that the errors are in metres, measured as actual minus odometry, with the right direction on each run.`;
    throw new HttpError(400, 'drift_out_of_range', message, { runs: message });
  }
  const tooLarge = alphaFit && alphasTooLarge(alphaFit.alphas);
  if (tooLarge) throw new HttpError(400, 'drift_out_of_range', tooLarge, { poses: tooLarge });
  return { alphas: alphaFit ? [...alphaFit.alphas] : [...base.assumedProfile.alphas], ed, eb };
}


/** A file name safe to store and to send back in Content-Disposition: no folders, no control or odd characters. */
export function safeFileName(original: string, kind: FleetFileKind): string {
  const last = original.split(/[/\\]/).pop() ?? '';
  const cleaned = last
    .normalize('NFKC')
    .replace(/[^A-Za-z0-9._ ()-]/g, '_')
    .replace(/^[.\s_]+/, '')
    .replace(/\s+/g, ' ')
    .slice(0, 100)
    .trim();
  const name = cleaned.replace(/_+/g, '_') || `${kind}`;
  return /\.csv$/i.test(name) ? name : `${name}.csv`;
}

const withCreator = { model: User, as: 'creator', attributes: ['name'] };

function summaryOf(profile: FleetProfile, trialIds: string[]): FleetProfileSummary {
  return {
    id: profile.id,
    name: profile.name,
    robot: profile.robot,
    status: profile.status,
    driftProfile: profile.driftProfile,
    sources: { umbmark: profile.get('hasUmbmark') === true || profile.umbmarkReport != null, alphaFit: profile.get('hasAlphaFit') === true || profile.alphaFitReport != null },
    practiceTrialIds: [...trialIds].sort(),
    createdAt: profile.createdAt.toISOString(),
    createdByName: (profile as FleetProfile & { creator?: User | null }).creator?.name ?? '',
  };
}

async function trialIdsOf(profileIds: string[], transaction?: Transaction): Promise<Map<string, string[]>> {
  const rows = profileIds.length ? await PracticeTrialRow.findAll({ where: { profileId: profileIds }, transaction }) : [];
  const out = new Map<string, string[]>(profileIds.map((id) => [id, []]));
  for (const row of rows) out.get(row.profileId)!.push(row.trialId);
  return out;
}

/** One profile of the organization in full; another organization's is "not found". */
export async function fleetProfileDetail(organizationId: number, profileId: string, transaction?: Transaction): Promise<FleetProfileDetail> {
  const profile = await FleetProfile.findOne({ where: { id: profileId, organizationId }, include: [withCreator], transaction });
  if (!profile) throw notFound('That fleet profile');
  const files = await FleetProfileFile.findAll({
    where: { profileId },
    attributes: ['kind', 'fileName', [FleetProfile.sequelize!.fn('octet_length', FleetProfile.sequelize!.col('bytes')), 'size']],
    order: [['kind', 'ASC']],
    transaction,
  });
  return {
    ...summaryOf(profile, (await trialIdsOf([profileId], transaction)).get(profileId)!),
    umbmark: profile.umbmarkReport ? { robot: profile.robot, report: profile.umbmarkReport } : null,
    alphaFit: profile.alphaFitReport,
    files: files.map((f) => ({ kind: f.kind, fileName: f.fileName, bytes: Number(f.get('size')) })),
  };
}

/** The organization's profiles, newest first, without their reports. */
export async function listFleetProfiles(organizationId: number): Promise<FleetProfileSummary[]> {
  const sequelize = FleetProfile.sequelize!;
  const profiles = await FleetProfile.scope('summary').findAll({
    where: { organizationId },
    attributes: {
      include: [
        [sequelize.literal('"FleetProfile"."umbmark_report" IS NOT NULL'), 'hasUmbmark'],
        [sequelize.literal('"FleetProfile"."alpha_fit_report" IS NOT NULL'), 'hasAlphaFit'],
      ],
    },
    include: [withCreator],
    order: [['createdAt', 'DESC'], ['id', 'ASC']],
  });
  const trials = await trialIdsOf(profiles.map((p) => p.id));
  return profiles.map((p) => summaryOf(p, trials.get(p.id)!));
}

/**
 * Saves a fleet profile from its files: at least one of the UMBmark runs and the paired poses.
 * Everything is recomputed here; the profile, its files and reports are stored in one transaction.
 */
export async function createFleetProfile(
  ctx: AppContext,
  actor: Actor,
  organizationId: number,
  fields: FleetProfileFields,
  files: { runs?: UploadedFile; poses?: UploadedFile },
  signal?: AbortSignal,
): Promise<FleetProfileDetail> {
  const { robot, base } = fleetRobotFor(ctx.content, fields);
  if (!files.runs && !files.poses) {
    throw new HttpError(400, 'no_file', 'Attach the UMBmark runs (field "runs"), the paired poses (field "poses"), or both.');
  }
  const umbmark = files.runs ? umbmarkFromFile(robot, files.runs.bytes) : null;
  const alphaFit = files.poses ? await alphaFitFromFile(files.poses.bytes, signal) : null;
  const driftProfile = effectiveDriftProfile(base, umbmark, alphaFit);
  const id = randomUUID();
  return ctx.sequelize.transaction(async (transaction) => {
    await FleetProfile.create(
      { id, organizationId, name: fields.name, robot, driftProfile, umbmarkReport: umbmark?.report ?? null, alphaFitReport: alphaFit, createdBy: actor.id },
      { transaction },
    );
    const stored: [FleetFileKind, UploadedFile | undefined][] = [
      ['umbmark', files.runs],
      ['poses', files.poses],
    ];
    for (const [kind, file] of stored) {
      if (file) await FleetProfileFile.create({ profileId: id, kind, fileName: safeFileName(file.originalName, kind), bytes: file.bytes }, { transaction });
    }
    return fleetProfileDetail(organizationId, id, transaction);
  });
}

/** A stored source file of a profile of the organization. */
export async function fleetProfileFile(organizationId: number, profileId: string, kind: FleetFileKind): Promise<{ fileName: string; bytes: Buffer }> {
  const profile = await FleetProfile.scope('summary').findOne({ where: { id: profileId, organizationId }, attributes: ['id'] });
  if (!profile) throw notFound('That fleet profile');
  const file = await FleetProfileFile.findOne({ where: { profileId, kind } });
  if (!file) throw notFound(kind === 'umbmark' ? 'A UMBmark runs file of this profile' : 'A paired-pose file of this profile');
  return { fileName: file.fileName, bytes: file.bytes };
}

/** The profile of the organization, locked for the rest of the transaction; "not found" for another's. */
async function lockProfile(organizationId: number | null, profileId: string, transaction: Transaction, lock: 'share' | 'update'): Promise<FleetProfile> {
  const profile = await FleetProfile.scope('summary').findOne({
    where: { id: profileId, organizationId: organizationId ?? -1 },
    transaction,
    lock: lock === 'share' ? transaction.LOCK.SHARE : transaction.LOCK.UPDATE,
  });
  if (!profile) throw notFound('That fleet profile');
  return profile;
}

const archivedError = (profile: FleetProfile) =>
  new HttpError(409, 'fleet_profile_archived', `The fleet profile "${profile.name}" is archived: no new drives start on it.`);

/**
 * Replaces the practice trials of an active profile. Each trial must exist and be driven with the
 * profile's robot (the profile describes that robot, so another robot's trial cannot use it).
 */
export async function setPracticeTrials(ctx: AppContext, actor: Actor, organizationId: number, profileId: string, trialIds: string[]): Promise<FleetProfileDetail> {
  return ctx.sequelize.transaction(async (transaction) => {
    const profile = await lockProfile(organizationId, profileId, transaction, 'update');
    if (profile.status !== 'active') throw archivedError(profile);
    const problems = trialIds.flatMap((trialId) => {
      const trial = ctx.content.trials.get(trialId);
      if (!trial) return [`No trial "${trialId}".`];
      if (!drivesProfileRobot(ctx.content, trialId, profile)) {
        return [`"${trial.title}" is driven with the ${ctx.content.robots.get(trial.robotId)!.name}; this profile is for the ${profile.robot.name}.`];
      }
      return [];
    });
    if (problems.length) throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { trialIds: problems.join(' ') });
    await PracticeTrialRow.destroy({ where: { profileId }, transaction });
    for (const trialId of trialIds) await PracticeTrialRow.create({ profileId, trialId, assignedBy: actor.id }, { transaction });
    return fleetProfileDetail(organizationId, profileId, transaction);
  });
}

/** Archives a profile: its drives keep their history; no new drive starts on it. Repeating it is harmless. */
export async function archiveFleetProfile(ctx: AppContext, organizationId: number, profileId: string): Promise<FleetProfileDetail> {
  return ctx.sequelize.transaction(async (transaction) => {
    const profile = await lockProfile(organizationId, profileId, transaction, 'update');
    if (profile.status !== 'archived') await profile.update({ status: 'archived' }, { transaction });
    return fleetProfileDetail(organizationId, profileId, transaction);
  });
}

/** Whether a trial exists and is driven with the robot a profile describes. */
function drivesProfileRobot(content: Content, trialId: string, profile: Pick<FleetProfile, 'robot'>): boolean {
  return content.trials.get(trialId)?.robotId === profile.robot.baseRobotId;
}

/**
 * The fleet profile a practice drive may start on: one of the operator's organization, active,
 * with this trial assigned. Locked (shared) until the attempt is stored, so an archive waits.
 */
export async function practiceProfileFor(ctx: AppContext, actor: Actor, profileId: string, trialId: string, transaction: Transaction): Promise<FleetProfile> {
  const profile = await lockProfile(actor.organizationId, profileId, transaction, 'share');
  if (profile.status !== 'active') throw archivedError(profile);
  const assigned = await PracticeTrialRow.findOne({ where: { profileId, trialId }, transaction });
  const title = ctx.content.trials.get(trialId)?.title ?? trialId;
  // The robot of the trial is checked again here: the content may have changed since the assignment.
  if (!assigned || !drivesProfileRobot(ctx.content, trialId, profile)) {
    throw new HttpError(409, 'not_a_fleet_practice_trial', `"${title}" is not a practice trial of the fleet profile "${profile.name}".`);
  }
  return profile;
}

/** The practice trials an operator can drive on their organization's active fleet profiles. */
export async function fleetPracticeFor(ctx: AppContext, actor: Actor): Promise<FleetPracticeTrial[]> {
  if (actor.organizationId == null) return [];
  const profiles = await FleetProfile.scope('summary').findAll({
    where: { organizationId: actor.organizationId, status: 'active' },
    attributes: ['id', 'name', 'robot', 'createdAt'],
    order: [['createdAt', 'DESC'], ['id', 'ASC']],
  });
  const trials = await trialIdsOf(profiles.map((p) => p.id));
  return profiles.flatMap((profile) =>
    trials
      .get(profile.id)!
      .filter((trialId) => drivesProfileRobot(ctx.content, trialId, profile))
      .map((trialId) => ({
        trialId,
        trialTitle: ctx.content.trials.get(trialId)!.title,
        robotName: profile.robot.name,
        fleetProfileId: profile.id,
        fleetProfileName: profile.name,
      }))
      .sort((a, b) => a.trialTitle.localeCompare(b.trialTitle)),
  );
}

export const SAMPLE_DIR = path.join(PROJECT_ROOT, 'content', 'calibration-samples');
export const SAMPLE_FILES: Record<FleetFileKind, string> = { umbmark: 'umbmark-runs.csv', poses: 'paired-poses.csv' };

/** A simulated sample file of each upload, for the employer to copy the format from. */
export async function sampleFile(kind: FleetFileKind): Promise<{ fileName: string; bytes: Buffer }> {
  const fileName = SAMPLE_FILES[kind];
  return { fileName: `driftproof-sample-${fileName}`, bytes: await readFile(path.join(SAMPLE_DIR, fileName)) };
}
