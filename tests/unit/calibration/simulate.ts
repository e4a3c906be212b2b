/**
 * Simulated calibration data for the calibration tests (no test cases here), built from the
 * motion engine's differential-drive functions: commands → encoder ticks with the nominal
 * geometry (`wheelTicksFromCommand`), odometry from the ticks (`integrateWheelTicks`), and the
 * true pose from the same ticks through the actual geometry plus the random noise of the
 * odometry motion model (`sampleOdometry`), as the server simulates a drive.
 */
import {
  integrateWheelTicks,
  normalizeAngle,
  sampleOdometry,
  wheelTicksFromCommand,
  type DiffDriveRobot,
  type OdometryAlphas,
  type Pose,
  type Rng,
  type SystematicErrors,
  type WheelTicks,
} from '../../../shared/motion/index';
import type { UmbmarkRun } from '../../../shared/calibration/index';

export const robot: DiffDriveRobot = { wheelRadius: 0.1, wheelbase: 0.5, ticksPerRevolution: 4096 };
const DT = 0.1;

/** The robot's drive: the odometry, the true pose, and one control period at a time. */
class SimulatedRobot {
  odom: Pose = { x: 0, y: 0, theta: 0 };
  truth: Pose = { x: 0, y: 0, theta: 0 };
  private rem: WheelTicks = { left: 0, right: 0 };

  constructor(
    private readonly actual: SystematicErrors,
    private readonly alphas: OdometryAlphas,
    private readonly rng: Rng,
    /** What the odometry believes about the geometry (Ed = Eb = 1: the nominal robot). */
    private readonly believed: SystematicErrors = { ed: 1, eb: 1 },
  ) {}

  step(v: number, w: number): void {
    const t = wheelTicksFromCommand(v, w, DT, robot, this.rem);
    this.rem = t.remainder;
    this.odom = integrateWheelTicks(this.odom, t.ticks, robot, this.believed);
    const systematic = integrateWheelTicks(this.truth, t.ticks, robot, this.actual);
    this.truth = sampleOdometry(this.truth, this.truth, systematic, this.alphas, this.rng);
  }
}

/**
 * One run of the bidirectional square (Borenstein & Feng 1996) driven CLOSED-LOOP on the
 * odometry, as a programmed robot does it: each leg ends when the odometry has covered `side`
 * metres, each on-the-spot turn when the odometry has turned 90° (the last control period is
 * shortened to land on the target). Returns the run as the employer would measure it: actual
 * minus odometry final pose, in the start frame.
 */
export function squareRun(
  direction: 'cw' | 'ccw',
  actual: SystematicErrors,
  alphas: OdometryAlphas,
  rng: Rng,
  options: { side?: number; believed?: SystematicErrors } = {},
): UmbmarkRun {
  const side = options.side ?? 4;
  const sim = new SimulatedRobot(actual, alphas, rng, options.believed);
  const turn = direction === 'ccw' ? 1 : -1;
  for (let leg = 0; leg < 4; leg++) {
    const start = sim.odom;
    for (let d = 0; d < side - 1e-9; d = Math.hypot(sim.odom.x - start.x, sim.odom.y - start.y)) {
      sim.step(Math.min(0.5, (side - d) / DT), 0);
    }
    const heading = sim.odom.theta;
    for (let a = 0; a < Math.PI / 2 - 1e-9; a = Math.abs(normalizeAngle(sim.odom.theta - heading))) {
      sim.step(0, turn * Math.min(0.5, (Math.PI / 2 - a) / DT));
    }
  }
  return {
    direction,
    x: sim.truth.x - sim.odom.x,
    y: sim.truth.y - sim.odom.y,
    heading: normalizeAngle(sim.truth.theta - sim.odom.theta),
  };
}

/**
 * A drive logged against an exact reference track: segments of straight driving, turns on the
 * spot and arcs (so that every one of a1..a4 matters somewhere), with random speeds, and no
 * systematic error. Returns `steps + 1` odometry and reference poses.
 */
export function pairedDrive(alphas: OdometryAlphas, rng: Rng, steps: number): { odometry: Pose[]; reference: Pose[] } {
  const sim = new SimulatedRobot({ ed: 1, eb: 1 }, alphas, rng);
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
