/**
 * Simulated calibration runs, for the sample upload files and the calibration tests: the robot is
 * simulated as a drive is (commands → encoder ticks with the nominal geometry, odometry from the
 * ticks, the true pose from the same ticks through the actual geometry Ed, Eb plus the random noise
 * of the odometry motion model, variance form, Thrun, Burgard & Fox 2005, Table 5.6).
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
} from '../motion';
import type { UmbmarkRun } from './umbmark-runs';

/** Seconds between two commands of a simulated run. */
export const SIMULATION_PERIOD = 0.1;

/** A simulated robot: its odometry, its true pose, and one control period at a time. */
export class SimulatedRobot {
  odom: Pose = { x: 0, y: 0, theta: 0 };
  truth: Pose = { x: 0, y: 0, theta: 0 };
  private rem: WheelTicks = { left: 0, right: 0 };

  constructor(
    private readonly robot: DiffDriveRobot,
    private readonly actual: SystematicErrors,
    private readonly alphas: OdometryAlphas,
    private readonly rng: Rng,
    /** What the odometry believes about the geometry (Ed = Eb = 1: the nominal robot). */
    private readonly believed: SystematicErrors = { ed: 1, eb: 1 },
  ) {}

  step(v: number, w: number): void {
    const t = wheelTicksFromCommand(v, w, SIMULATION_PERIOD, this.robot, this.rem);
    this.rem = t.remainder;
    this.odom = integrateWheelTicks(this.odom, t.ticks, this.robot, this.believed);
    const systematic = integrateWheelTicks(this.truth, t.ticks, this.robot, this.actual);
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
export function simulatedSquareRun(
  direction: 'cw' | 'ccw',
  robot: DiffDriveRobot,
  actual: SystematicErrors,
  alphas: OdometryAlphas,
  rng: Rng,
  options: { side?: number; believed?: SystematicErrors } = {},
): UmbmarkRun {
  const side = options.side ?? 4;
  const dt = SIMULATION_PERIOD;
  const sim = new SimulatedRobot(robot, actual, alphas, rng, options.believed);
  const turn = direction === 'ccw' ? 1 : -1;
  for (let leg = 0; leg < 4; leg++) {
    const start = sim.odom;
    for (let d = 0; d < side - 1e-9; d = Math.hypot(sim.odom.x - start.x, sim.odom.y - start.y)) {
      sim.step(Math.min(0.5, (side - d) / dt), 0);
    }
    const heading = sim.odom.theta;
    for (let a = 0; a < Math.PI / 2 - 1e-9; a = Math.abs(normalizeAngle(sim.odom.theta - heading))) {
      sim.step(0, turn * Math.min(0.5, (Math.PI / 2 - a) / dt));
    }
  }
  return {
    direction,
    x: sim.truth.x - sim.odom.x,
    y: sim.truth.y - sim.odom.y,
    heading: normalizeAngle(sim.truth.theta - sim.odom.theta),
  };
}
