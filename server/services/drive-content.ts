/**
 * What an attempt is driven with: the trial and the robot. Exams and ordinary practice use the
 * content as it is. A practice drive on a fleet profile uses the profile's robot (the content
 * robot with the employer's geometry) whose software assumes the profile's alphas and no
 * systematic error, while the true motion carries the profile's Ed and Eb. Starting a drive,
 * rebuilding it, scoring it and showing it (start, view, report) all take the trial and robot
 * from here, so they can never disagree.
 */
import type { Transaction } from 'sequelize';
import type { DriftProfile, FleetRobot, PublicTrial, Robot, Trial } from '../../shared/schemas';
import type { Content } from '../content/load';
import type { AppContext } from '../context';
import { FleetProfile, type Attempt } from '../db/models';
import { HttpError, notFound } from '../http/errors';

export interface DriveContent {
  trial: Trial;
  robot: Robot;
}

/** The parts of a fleet profile a drive depends on (both are fixed once the profile is saved). */
export type DriveProfile = { robot: FleetRobot; driftProfile: DriftProfile };

/**
 * The trial and robot of a drive: the content's, or with a fleet profile its robot geometry,
 * assumed profile {alphas, ed: 1, eb: 1} and hidden errors {ed, eb} (for the trial as well, which
 * would otherwise override the robot's).
 */
export function effectiveDriveContent(content: Content, trialId: string, profile: DriveProfile | null): DriveContent {
  const trial = content.trials.get(trialId);
  if (!trial) throw notFound('That trial');
  const robot = content.robots.get(trial.robotId)!;
  if (!profile) return { trial, robot };
  const hiddenErrors = { ed: profile.driftProfile.ed, eb: profile.driftProfile.eb };
  return {
    trial: { ...trial, hiddenErrors },
    robot: {
      ...robot,
      wheelRadius: profile.robot.wheelRadius,
      wheelbase: profile.robot.wheelbase,
      ticksPerRevolution: profile.robot.ticksPerRevolution,
      assumedProfile: { alphas: [...profile.driftProfile.alphas], ed: 1, eb: 1 },
      hiddenErrors,
    },
  };
}

/** The drive content of an attempt (loads its fleet profile when it has one). Refuses a trial that changed since the start. */
export async function driveContentFor(ctx: AppContext, attempt: Attempt, transaction?: Transaction): Promise<DriveContent> {
  if (!ctx.content.trials.has(attempt.trialId) || ctx.content.trialHashes.get(attempt.trialId) !== attempt.contentHash) {
    throw new HttpError(409, 'trial_changed', 'This trial has changed since the attempt started, so the drive cannot be rebuilt.');
  }
  if (!attempt.fleetProfileId) return effectiveDriveContent(ctx.content, attempt.trialId, null);
  const profile = await FleetProfile.scope('summary').findByPk(attempt.fleetProfileId, { attributes: ['id', 'robot', 'driftProfile'], transaction });
  if (!profile) throw new HttpError(409, 'fleet_profile_missing', 'The fleet profile of this drive no longer exists.');
  return effectiveDriveContent(ctx.content, attempt.trialId, profile);
}

/** What the client gets of a drive's content: everything but the hidden errors, with the surfaces it may meet. */
export function publicDriveTrial(content: Content, { trial, robot }: DriveContent): PublicTrial {
  const { hiddenErrors: _trialErrors, ...rest } = trial;
  const { hiddenErrors: _robotErrors, ...publicRobot } = robot;
  const surfaceIds = new Set(trial.zones.map((z) => z.surfaceId));
  const surfaces = [...content.surfaces.values()].filter((s) => surfaceIds.has(s.id) || s.driftMultiplier === 1);
  return { ...rest, robot: publicRobot, surfaces };
}
