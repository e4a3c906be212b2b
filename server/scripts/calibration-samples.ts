/**
 * Writes the sample calibration files in content/calibration-samples/ (served by
 * GET /api/fleet-calibration/samples/:kind and used for the demo organization's fleet profile).
 * They are SIMULATED with the motion engine, for an invented robot whose true errors are the
 * constants below; no real robot was measured. Deterministic: running it again writes the same
 * bytes. Run: `node --import tsx server/scripts/calibration-samples.ts`.
 *
 * The simulation is the one the server drives with: commands → encoder ticks with the nominal
 * geometry, odometry from the ticks, the true pose from the same ticks through the actual
 * geometry (Ed, Eb) plus the random noise of the odometry motion model (variance form, Thrun,
 * Burgard & Fox 2005, Table 5.6).
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import {
  createRng,
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
} from '../../shared/motion';
import { SAMPLE_DIR, SAMPLE_FILES } from '../services/fleet-profiles';

/** The invented robot: the demo aisle tugger's nominal geometry (content/robots/aisle-tugger.json). */
export const SAMPLE_ROBOT: DiffDriveRobot = { wheelRadius: 0.1, wheelbase: 0.5, ticksPerRevolution: 1024 };
/** Its invented true systematic errors (what the UMBmark sample should recover). */
export const SAMPLE_ERRORS: SystematicErrors = { ed: 1.0025, eb: 1.012 };
/** Its invented true random drift, a1..a4 (what the paired-pose sample should recover). */
export const SAMPLE_ALPHAS: OdometryAlphas = [0.014, 4e-5, 0.0032, 1.3e-4];
const DT = 0.1;
const SEED = 'driftproof-calibration-sample-1';

class SimulatedRobot {
  odom: Pose = { x: 0, y: 0, theta: 0 };
  truth: Pose = { x: 0, y: 0, theta: 0 };
  private rem: WheelTicks = { left: 0, right: 0 };

  constructor(
    private readonly actual: SystematicErrors,
    private readonly alphas: OdometryAlphas,
    private readonly rng: Rng,
  ) {}

  step(v: number, w: number): void {
    const t = wheelTicksFromCommand(v, w, DT, SAMPLE_ROBOT, this.rem);
    this.rem = t.remainder;
    this.odom = integrateWheelTicks(this.odom, t.ticks, SAMPLE_ROBOT, { ed: 1, eb: 1 });
    const systematic = integrateWheelTicks(this.truth, t.ticks, SAMPLE_ROBOT, this.actual);
    this.truth = sampleOdometry(this.truth, this.truth, systematic, this.alphas, this.rng);
  }
}

/** One closed-loop run of the 4 m bidirectional square (Borenstein & Feng 1996), measured as actual minus odometry. */
function squareRun(direction: 'cw' | 'ccw', rng: Rng): { x: number; y: number; heading: number } {
  // The square runs are slow and careful: a tenth of the drive's random drift.
  const sim = new SimulatedRobot(SAMPLE_ERRORS, SAMPLE_ALPHAS.map((a) => a / 10) as unknown as OdometryAlphas, rng);
  const turn = direction === 'ccw' ? 1 : -1;
  for (let leg = 0; leg < 4; leg++) {
    const start = sim.odom;
    for (let d = 0; d < 4 - 1e-9; d = Math.hypot(sim.odom.x - start.x, sim.odom.y - start.y)) sim.step(Math.min(0.5, (4 - d) / DT), 0);
    const heading = sim.odom.theta;
    for (let a = 0; a < Math.PI / 2 - 1e-9; a = Math.abs(normalizeAngle(sim.odom.theta - heading))) sim.step(0, turn * Math.min(0.5, (Math.PI / 2 - a) / DT));
  }
  return { x: sim.truth.x - sim.odom.x, y: sim.truth.y - sim.odom.y, heading: normalizeAngle(sim.truth.theta - sim.odom.theta) };
}

/** A decimal with `digits` places, never "-0.000". */
function fixed(value: number, digits: number): string {
  const text = value.toFixed(digits);
  return Number(text) === 0 ? (0).toFixed(digits) : text;
}

/** The UMBmark sample: 5 clockwise and 5 counter-clockwise runs, errors to the millimetre and milliradian. */
export function umbmarkSample(): string {
  const rng = createRng(`${SEED}-umbmark`);
  const lines = ['direction,x_error,y_error,heading_error'];
  for (const direction of ['cw', 'ccw'] as const) {
    for (let i = 0; i < 5; i++) {
      const r = squareRun(direction, rng);
      lines.push(`${direction},${fixed(r.x, 3)},${fixed(r.y, 3)},${fixed(r.heading, 3)}`);
    }
  }
  return `${lines.join('\n')}\n`;
}

/**
 * The paired-pose sample: a drive of straight runs, turns on the spot and arcs, logged every
 * control period against an exact reference (after the systematic errors were corrected, so the
 * odometry geometry is right and only the random drift remains).
 */
export function posesSample(steps = 1500): string {
  const rng = createRng(`${SEED}-poses`);
  const sim = new SimulatedRobot({ ed: 1, eb: 1 }, SAMPLE_ALPHAS, rng);
  const f = (v: number) => fixed(v, 6);
  const row = (t: number) => `${f(sim.odom.x)},${f(sim.odom.y)},${f(sim.odom.theta)},${f(sim.truth.x)},${f(sim.truth.y)},${f(sim.truth.theta)},${(t * DT).toFixed(1)}`;
  const lines = ['odom_x,odom_y,odom_theta,ref_x,ref_y,ref_theta,time', row(0)];
  while (lines.length <= steps + 1) {
    // Straight runs and arcs. (No turns on the spot: with the odometry standing still a tracker's
    // direction of travel is pure noise, which the odometry motion model cannot explain.)
    const arc = rng.uniform() < 0.6;
    const length = 5 + Math.floor(rng.uniform() * 10);
    const v = 0.2 + 0.6 * rng.uniform();
    const w = arc ? (rng.uniform() < 0.5 ? -1 : 1) * (0.3 + 0.7 * rng.uniform()) : 0;
    for (let i = 0; i < length && lines.length <= steps + 1; i++) {
      sim.step(v, w);
      lines.push(row(lines.length - 1));
    }
  }
  return `${lines.join('\n')}\n`;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  writeFileSync(path.join(SAMPLE_DIR, SAMPLE_FILES.umbmark), umbmarkSample());
  writeFileSync(path.join(SAMPLE_DIR, SAMPLE_FILES.poses), posesSample());
  console.log(`Wrote ${SAMPLE_FILES.umbmark} and ${SAMPLE_FILES.poses} to ${SAMPLE_DIR}.`);
}
