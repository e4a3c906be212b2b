/** Helpers for the simulation tests (no test cases here). */
import type { Robot, Trial } from '../../../shared/schemas';
import { DriveError, DriveSim, PathFollower, type Command, type DriveErrorCode, type DriveSetup } from '../../../shared/sim';
import { driveSetup, shippedContent } from '../../support/content';
import type { DrivePort } from '../../support/scripted-operator';

export { driveSetup, shippedContent };

/** The port through which the scripted operator drives a DriveSim directly. */
export function simPort(sim: DriveSim): DrivePort {
  return { step: (_s, c) => sim.applyBatch(c), call: (id, call, pin) => sim.answerCall(id, call, pin) };
}

/** `n` copies of the same command. */
export const repeat = (n: number, command: Command): Command[] => Array.from({ length: n }, () => ({ ...command }));

/** The DriveError code `fn` throws (fails the test if it throws something else or nothing). */
export function driveErrorCode(fn: () => unknown): DriveErrorCode {
  try {
    fn();
  } catch (error) {
    if (error instanceof DriveError) return error.code;
    throw error;
  }
  throw new Error('expected a DriveError, nothing was thrown');
}

/** Length of one encoder tick of wheel travel, metres: 2·pi·r / N. */
export const tickLength = (robot: Pick<Robot, 'wheelRadius' | 'ticksPerRevolution'>) => (2 * Math.PI * robot.wheelRadius) / robot.ticksPerRevolution;

/**
 * A trial on an empty 200 m × 200 m floor (no obstacles, zones, markers or call points) starting
 * at the centre facing east, built from a shipped trial; for drives that must meet nothing.
 */
export function openFloorTrial(base: Trial = shippedContent().trials.get('long-aisle-run')!): Trial {
  return {
    ...base,
    id: 'open-floor',
    start: { x: 100, y: 100, theta: 0 },
    route: [
      { x: 100, y: 100 },
      { x: 190, y: 100 },
    ],
    dock: { pose: { x: 190, y: 100, theta: 0 }, positionTolerance: 0.3, headingTolerance: 0.2 },
    map: { width: 200, height: 200, obstacles: [] },
    zones: [],
    markers: [],
    callPoints: [],
    timeLimit: 7200,
  };
}

/** A DriveSetup on {@link openFloorTrial} with a shipped robot (optionally changed). */
export function openFloorSetup(secretSeed: string, robotId = 'aisle-tugger', change: (r: Robot) => Robot = (r) => r): DriveSetup {
  const content = shippedContent();
  return { trial: openFloorTrial(), robot: change(content.robots.get(robotId)!), surfaces: [...content.surfaces.values()], secretSeed };
}

/**
 * Follows the trial's route (pure pursuit, as the scripted operator does) one command per batch
 * until the drive stops for a call; returns that batch.
 */
export function driveToCall(sim: DriveSim, maxSteps = 3000) {
  const { trial, robot } = sim.setup;
  const follower = new PathFollower(trial.route, { speed: robot.limits.maxSpeed * 0.8, maxTurnRate: robot.limits.maxTurnRate, arrival: 0.08 });
  for (let k = 0; k < maxSteps; k++) {
    const c = follower.command(sim.state().odometry);
    const r = sim.applyBatch([{ v: c.v, w: c.w }]);
    if (r.state.status !== 'driving') return r;
  }
  throw new Error(`no call point within ${maxSteps} steps`);
}
