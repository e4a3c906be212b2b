/**
 * Simulated calibration data for the calibration tests (no test cases here): the square runs and
 * the paired drive of `shared/calibration/simulated-runs.ts` on a finely resolved robot.
 */
import type { DiffDriveRobot, OdometryAlphas, Pose, Rng, SystematicErrors } from '../../../shared/motion/index';
import type { UmbmarkRun } from '../../../shared/calibration/index';
import { SimulatedRobot, simulatedSquareRun } from '../../../shared/calibration/simulated-runs';

export const robot: DiffDriveRobot = { wheelRadius: 0.1, wheelbase: 0.5, ticksPerRevolution: 4096 };

/** One square run of {@link robot} (see `simulatedSquareRun`). */
export function squareRun(
  direction: 'cw' | 'ccw',
  actual: SystematicErrors,
  alphas: OdometryAlphas,
  rng: Rng,
  options: { side?: number; believed?: SystematicErrors } = {},
): UmbmarkRun {
  return simulatedSquareRun(direction, robot, actual, alphas, rng, options);
}

/**
 * A drive logged against an exact reference track: segments of straight driving, turns on the
 * spot and arcs (so that every one of a1..a4 matters somewhere), with random speeds, and no
 * systematic error. Returns `steps + 1` odometry and reference poses.
 */
export function pairedDrive(alphas: OdometryAlphas, rng: Rng, steps: number): { odometry: Pose[]; reference: Pose[] } {
  const sim = new SimulatedRobot(robot, { ed: 1, eb: 1 }, alphas, rng);
  const odometry = [sim.odom];
  const reference = [sim.truth];
  while (odometry.length <= steps) {
    const kind = Math.floor(rng.uniform() * 3);
    const length = 5 + Math.floor(rng.uniform() * 10);
    const v = kind === 1 ? 0 : 0.2 + 0.6 * rng.uniform();
    const w = kind === 0 ? 0 : (rng.uniform() < 0.5 ? -1 : 1) * (0.3 + 0.7 * rng.uniform());
    for (let i = 0; i < length && odometry.length <= steps; i++) {
      sim.step(v, w);
      odometry.push(sim.odom);
      reference.push(sim.truth);
    }
  }
  return { odometry, reference };
}
