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
import { SIMULATION_PERIOD, SimulatedRobot, simulatedSquareRun } from '../../shared/calibration/simulated-runs';
import { createRng, type DiffDriveRobot, type OdometryAlphas, type Rng, type SystematicErrors } from '../../shared/motion';
import { SAMPLE_DIR, SAMPLE_FILES } from '../services/fleet-profiles';

/** The invented robot: the demo aisle tugger's nominal geometry (content/robots/aisle-tugger.json). */
export const SAMPLE_ROBOT: DiffDriveRobot = { wheelRadius: 0.1, wheelbase: 0.5, ticksPerRevolution: 1024 };
/** Its invented true systematic errors (what the UMBmark sample should recover). */
export const SAMPLE_ERRORS: SystematicErrors = { ed: 1.0025, eb: 1.012 };
/** Its invented true random drift, a1..a4 (what the paired-pose sample should recover). */
export const SAMPLE_ALPHAS: OdometryAlphas = [0.014, 4e-5, 0.0032, 1.3e-4];
const DT = SIMULATION_PERIOD;
const SEED = 'driftproof-calibration-sample-1';

/** One closed-loop run of the 4 m bidirectional square (Borenstein & Feng 1996), measured as actual minus odometry. */
function squareRun(direction: 'cw' | 'ccw', rng: Rng): { x: number; y: number; heading: number } {
  // The square runs are slow and careful: a tenth of the drive's random drift.
  const run = simulatedSquareRun(direction, SAMPLE_ROBOT, SAMPLE_ERRORS, SAMPLE_ALPHAS.map((a) => a / 10) as unknown as OdometryAlphas, rng);
  return { x: run.x, y: run.y, heading: run.heading! };
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
  const sim = new SimulatedRobot(SAMPLE_ROBOT, { ed: 1, eb: 1 }, SAMPLE_ALPHAS, rng);
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
