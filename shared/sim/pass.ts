/**
 * The pass through a gap after a call: the robot follows the call point's pass path on its own
 * odometry with the pure-pursuit follower, at the pass speed of the call.
 * @module
 */
import type { Point2, Pose } from '../motion';
import type { Call, Robot } from '../schemas/content';
import { PathFollower } from './follow';
import { pathLength } from './geometry';
import { wheelStep } from './wheels';

/** Speed of a pass after `proceed` or `reanchor`, m/s (capped by the robot's own limit). */
export const PASS_SPEED = 0.6;
/** A creep pass scales the alphas by this factor: slower wheels slip less. */
export const CREEP_SLIP_FACTOR = 0.4;

type PassRobot = Pick<Robot, 'limits' | 'controlPeriod' | 'wheelRadius' | 'wheelbase' | 'ticksPerRevolution' | 'creepSpeed'>;

export function passSpeed(call: Call, robot: PassRobot): number {
  return call === 'creep' ? robot.creepSpeed : Math.min(PASS_SPEED, robot.limits.maxSpeed);
}

/** The slip factor on the alphas during the pass of a call. */
export const passSlip = (call: Call) => (call === 'creep' ? CREEP_SLIP_FACTOR : 1);

/** At most this many control periods for a pass (three times what the path needs, plus slack). */
export function passStepLimit(path: readonly Point2[], speed: number, robot: PassRobot): number {
  return Math.ceil(((pathLength(path) + 3) / speed / robot.controlPeriod) * 3);
}

export function passFollower(path: readonly Point2[], speed: number, robot: PassRobot): PathFollower {
  return new PathFollower(path, { speed, maxTurnRate: robot.limits.maxTurnRate });
}

/** The odometry poses of a pass without contacts, starting at rest at `start`; the first is `start`. */
export function nominalPass(start: Pose, path: readonly Point2[], speed: number, robot: PassRobot): Pose[] {
  const follower = passFollower(path, speed, robot);
  let state = { odometry: start, v: 0, w: 0, remainder: { left: 0, right: 0 } };
  const poses = [start];
  for (let i = 0, limit = passStepLimit(path, speed, robot); i < limit; i++) {
    const command = follower.command(state.odometry);
    if (command.arrived) break;
    state = wheelStep(state, command, robot);
    poses.push(state.odometry);
  }
  return poses;
}
