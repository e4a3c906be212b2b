/**
 * Motion-engine benchmark: the drift cloud's hot path against a plain object-per-particle loop
 * and against the bare cost of its normal draws, and the cost of covariance propagation.
 * Figures are the best of several repetitions after a warm-up (the usual way to read a
 * micro-benchmark on a shared machine).
 */
import {
  createRng,
  moveOnArc,
  ParticleCloud,
  propagateOdometryCovariance,
  sampleOdometry,
  type OdometryAlphas,
  type Pose,
} from '../../shared/motion/index';
import type { BenchFigure, BenchModule } from './types';

const PARTICLES = 10_000;
const STEPS = 600;
const COV_STEPS = 6_000;
const REPEATS = 5;
const ALPHAS: OdometryAlphas = [0.01, 0.0005, 0.005, 0.0005];
const SEED = 'bench-motion';

/** Odometry poses of a gentle S-curve at 0.5 m/s, 0.1 s control period. */
function odometryPath(steps: number): Pose[] {
  const path: Pose[] = [{ x: 0, y: 0, theta: 0 }];
  for (let k = 0; k < steps; k++) {
    const w = 0.3 * Math.sin(k / 50);
    path.push(moveOnArc(path[k], 0.05, w * 0.1));
  }
  return path;
}

function time(fn: () => void): number {
  const t0 = performance.now();
  fn();
  return performance.now() - t0;
}

function runCloud(path: Pose[], steps: number, count: number): ParticleCloud {
  const rng = createRng(SEED);
  const cloud = new ParticleCloud(count, path[0]);
  for (let s = 0; s < steps; s++) cloud.advance(path[s], path[s + 1], ALPHAS, rng);
  return cloud;
}

function runPlain(path: Pose[], steps: number, count: number): Pose[] {
  const rng = createRng(SEED);
  let particles: Pose[] = [];
  for (let i = 0; i < count; i++) particles.push({ ...path[0] });
  for (let s = 0; s < steps; s++) {
    const next: Pose[] = [];
    for (const p of particles) next.push(sampleOdometry(p, path[s], path[s + 1], ALPHAS, rng));
    particles = next;
  }
  return particles;
}

let sink = 0;

function drawNormals(n: number): void {
  const rng = createRng(SEED);
  let s = 0;
  for (let i = 0; i < n; i++) s += rng.normal();
  sink += s;
}

function propagate(path: Pose[], steps: number): number[][] {
  let cov: number[][] = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  for (let s = 0; s < steps; s++) cov = propagateOdometryCovariance(path[s], cov, path[s], path[s + 1], ALPHAS);
  return cov;
}

export const motionBench: BenchModule = {
  name: 'motion',
  title: `ParticleCloud.advance, ${PARTICLES} particles × ${STEPS} steps (seeded), one core`,
  run(): BenchFigure[] {
    const path = odometryPath(COV_STEPS);
    const work = PARTICLES * STEPS;
    // Warm-up so that every path is optimised before timing.
    runCloud(path, 20, PARTICLES);
    runPlain(path, 20, PARTICLES);
    drawNormals(3 * PARTICLES * 20);
    propagate(path, COV_STEPS);

    // Interleave the repetitions so that a burst of load elsewhere hits all three alike.
    let tCloud = Infinity;
    let tPlain = Infinity;
    let tNormals = Infinity;
    for (let r = 0; r < REPEATS; r++) {
      tCloud = Math.min(tCloud, time(() => runCloud(path, STEPS, PARTICLES)));
      tPlain = Math.min(tPlain, time(() => runPlain(path, STEPS, PARTICLES)));
      tNormals = Math.min(tNormals, time(() => drawNormals(3 * work)));
    }
    let tCov = Infinity;
    for (let r = 0; r < 20; r++) tCov = Math.min(tCov, time(() => propagate(path, COV_STEPS)));

    // Same seed, same draws: the two implementations must agree exactly.
    const cloud = runCloud(path, 50, 1000);
    const plain = runPlain(path, 50, 1000);
    let identical = true;
    for (let i = 0; i < 1000; i++) {
      if (cloud.x[i] !== plain[i].x || cloud.y[i] !== plain[i].y || cloud.theta[i] !== plain[i].theta) identical = false;
    }

    if (!Number.isFinite(sink)) throw new Error('normal draws went non-finite');
    const rate = work / tCloud / 1e3; // M particle-steps per second
    const speedup = tPlain / tCloud;
    const rngRatio = tCloud / tNormals;
    return [
      { label: 'ParticleCloud.advance', value: rate, unit: 'M steps/s', target: '>= 12', met: rate >= 12 },
      { label: 'plain object-per-particle loop (sampleOdometry)', value: work / tPlain / 1e3, unit: 'M steps/s' },
      { label: 'speed-up of advance over the plain loop', value: speedup, unit: '×', target: '>= 2', met: speedup >= 2 },
      { label: `bare cost: ${3 * work / 1e6} M rng.normal() draws`, value: tNormals, unit: 'ms', digits: 1 },
      { label: 'ParticleCloud.advance, same work', value: tCloud, unit: 'ms', digits: 1 },
      { label: 'advance time / bare normal-draw time', value: rngRatio, unit: '×', target: '<= 2', met: rngRatio <= 2 },
      { label: 'advance and plain loop give identical particles', value: identical ? 1 : 0, unit: identical ? '(yes)' : '(NO)', digits: 0, target: 'identical', met: identical },
      { label: `propagateOdometryCovariance, ${COV_STEPS} steps`, value: tCov, unit: 'ms', digits: 3, target: '< 5 ms', met: tCov < 5 },
    ];
  },
};
