import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import {
  applyOdometryDelta,
  angleDifference,
  createRng,
  odometryDelta,
  odometryJacobians,
  odometryVariances,
  propagateOdometryCovariance,
  type OdometryAlphas,
  type Pose,
} from '../../../shared/motion/index';

const alphas: OdometryAlphas = [0.01, 0.002, 0.005, 0.001];

function randomSpd(seed: string): number[][] {
  const rng = createRng(seed);
  const a = Matrix.from1DArray(3, 3, Array.from({ length: 9 }, () => rng.normal()));
  return a.mmul(a.transpose()).mul(0.01).to2DArray();
}

describe('odometry Jacobians (Thrun, Burgard & Fox 2005, §7.4)', () => {
  it('match central finite differences of the motion', () => {
    const pose: Pose = { x: 1, y: -2, theta: 2.5 };
    const d = { rot1: 0.4, trans: 0.8, rot2: -0.3 };
    const { G, V } = odometryJacobians(pose, d);
    const h = 1e-6;
    const f = (p: Pose, dd: typeof d): number[] => {
      const q = applyOdometryDelta(p, dd);
      return [q.x, q.y, q.theta];
    };
    const diff = (plus: number[], minus: number[]): number[] =>
      plus.map((v, i) => (i === 2 ? angleDifference(v, minus[i]) : v - minus[i]) / (2 * h));
    const stateKeys = ['x', 'y', 'theta'] as const;
    stateKeys.forEach((key, j) => {
      const col = diff(f({ ...pose, [key]: pose[key] + h }, d), f({ ...pose, [key]: pose[key] - h }, d));
      for (let i = 0; i < 3; i++) expect(G[i][j]).toBeCloseTo(col[i], 8);
    });
    const controlKeys = ['rot1', 'trans', 'rot2'] as const;
    controlKeys.forEach((key, j) => {
      const col = diff(f(pose, { ...d, [key]: d[key] + h }), f(pose, { ...d, [key]: d[key] - h }));
      for (let i = 0; i < 3; i++) expect(V[i][j]).toBeCloseTo(col[i], 8);
    });
  });
});

describe('propagateOdometryCovariance', () => {
  it('equals G·Σ·Gᵀ + V·M·Vᵀ computed with generic matrix products (ml-matrix)', () => {
    const prevOdom: Pose = { x: 0.3, y: 0.1, theta: -2 };
    const odom = applyOdometryDelta(prevOdom, { rot1: -0.2, trans: 0.6, rot2: 0.15 });
    const pose: Pose = { x: 4, y: 1, theta: 1.2 };
    for (const seed of ['a', 'b', 'c']) {
      const sigma = randomSpd(seed);
      const ours = propagateOdometryCovariance(pose, sigma, prevOdom, odom, alphas);
      const d = odometryDelta(prevOdom, odom);
      const { G, V } = odometryJacobians(pose, d);
      const M = Matrix.diag(odometryVariances(d, alphas));
      const g = new Matrix(G);
      const v = new Matrix(V);
      const ref = g.mmul(new Matrix(sigma)).mmul(g.transpose()).add(v.mmul(M).mmul(v.transpose()));
      for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(ours[i][j]).toBeCloseTo(ref.get(i, j), 14);
    }
  });

  it('keeps the covariance symmetric and positive semi-definite over 6000 steps', () => {
    const rng = createRng('long');
    let odomPrev: Pose = { x: 0, y: 0, theta: 0 };
    let mean: Pose = { x: 0, y: 0, theta: 0 };
    let cov: number[][] = [
      [0, 0, 0],
      [0, 0, 0],
      [0, 0, 0],
    ];
    for (let k = 0; k < 6000; k++) {
      const odom = applyOdometryDelta(odomPrev, { rot1: 0.05 * rng.normal(), trans: 0.05, rot2: 0.05 * rng.normal() });
      cov = propagateOdometryCovariance(mean, cov, odomPrev, odom, alphas);
      mean = applyOdometryDelta(mean, odometryDelta(odomPrev, odom));
      odomPrev = odom;
    }
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(cov[i][j]).toBe(cov[j][i]);
    const values = new EigenvalueDecomposition(new Matrix(cov), { assumeSymmetric: true }).realEigenvalues;
    expect(Math.min(...values)).toBeGreaterThan(0);
  });
});
