import { describe, expect, it } from 'vitest';
import {
  applyOdometryDelta,
  createRng,
  moveOnArc,
  odometryDelta,
  ParticleCloud,
  pointInPolygon,
  propagateOdometryCovariance,
  sampleOdometry,
  type OdometryAlphas,
  type Polygon,
  type Pose,
} from '../../../shared/motion/index';
import { covarianceStandardError } from './helpers';

const alphas: OdometryAlphas = [0.01, 0.0005, 0.005, 0.0005];

/** Odometry poses of a drive: steps of `step` metres turning `turn(k)` radians each. */
function path(steps: number, step: number, turn: (k: number) => number, from: Pose = { x: 0, y: 0, theta: 0 }): Pose[] {
  const poses = [from];
  for (let k = 0; k < steps; k++) poses.push(moveOnArc(poses[k], step, turn(k)));
  return poses;
}

function drive(cloud: ParticleCloud, odom: Pose[], a: OdometryAlphas, seed: string): void {
  const rng = createRng(seed);
  for (let k = 0; k + 1 < odom.length; k++) cloud.advance(odom[k], odom[k + 1], a, rng);
}

describe('ParticleCloud', () => {
  it('advance gives exactly what sampleOdometry gives per particle from the same stream', () => {
    const odom = path(40, 0.05, (k) => 0.02 * Math.sin(k / 5), { x: 1, y: 1, theta: 3.1 });
    const cloud = new ParticleCloud(300, { x: -2, y: 0.5, theta: -3.1 });
    drive(cloud, odom, alphas, 'same');
    const rng = createRng('same');
    let particles: Pose[] = Array.from({ length: 300 }, () => ({ x: -2, y: 0.5, theta: -3.1 }));
    for (let k = 0; k + 1 < odom.length; k++) {
      particles = particles.map((p) => sampleOdometry(p, odom[k], odom[k + 1], alphas, rng));
    }
    for (let i = 0; i < 300; i++) expect(cloud.poseAt(i)).toEqual(particles[i]);
  });

  it('is deterministic for a seed and depends on it', () => {
    const odom = path(30, 0.05, () => 0.01);
    const a = new ParticleCloud(500);
    const b = new ParticleCloud(500);
    const c = new ParticleCloud(500);
    drive(a, odom, alphas, 'seed-1');
    drive(b, odom, alphas, 'seed-1');
    drive(c, odom, alphas, 'seed-2');
    expect(Array.from(b.x)).toEqual(Array.from(a.x));
    expect(Array.from(b.theta)).toEqual(Array.from(a.theta));
    expect(Array.from(c.x)).not.toEqual(Array.from(a.x));
  });

  it('keeps every heading in (-pi, pi]', () => {
    const cloud = new ParticleCloud(2000, { x: 0, y: 0, theta: Math.PI });
    drive(cloud, path(100, 0.05, () => 0.08), [0.2, 0.01, 0.05, 0.01], 'wrap');
    for (const t of cloud.theta) {
      expect(t).toBeGreaterThan(-Math.PI);
      expect(t).toBeLessThanOrEqual(Math.PI);
    }
  });

  it('mean() takes the circular mean of headings, covariance() the wrapped spread', () => {
    const cloud = new ParticleCloud(4);
    cloud.theta.set([3.1, -3.1, 3.0, -3.0]);
    cloud.x.set([1, 2, 3, 4]);
    const m = cloud.mean();
    expect(Math.abs(Math.abs(m.theta) - Math.PI)).toBeLessThan(1e-12); // not 0, the arithmetic mean
    expect(m.x).toBe(2.5);
    const cov = cloud.covariance();
    // Deviations from ±pi: ±(pi − 3.1), ±(pi − 3.0).
    const d1 = Math.PI - 3.1;
    const d2 = Math.PI - 3.0;
    expect(cov[2][2]).toBeCloseTo((2 * d1 * d1 + 2 * d2 * d2) / 4, 12);
    expect(cov[0][0]).toBeCloseTo(1.25, 12);
  });

  it('its covariance after 40 steps matches the linearised propagation (small noise)', () => {
    const small: OdometryAlphas = [2e-4, 2e-5, 1e-4, 2e-5];
    const odom = path(40, 0.1, (k) => (k < 20 ? 0.04 : -0.03));
    const n = 20_000;
    const cloud = new ParticleCloud(n);
    drive(cloud, odom, small, 'propagate');
    let mean: Pose = odom[0];
    let cov: number[][] = [
      [0, 0, 0],
      [0, 0, 0],
      [0, 0, 0],
    ];
    for (let k = 0; k + 1 < odom.length; k++) {
      cov = propagateOdometryCovariance(mean, cov, odom[k], odom[k + 1], small);
      mean = applyOdometryDelta(mean, odometryDelta(odom[k], odom[k + 1])); // EKF mean update
    }
    const emp = cloud.covariance();
    for (let a = 0; a < 3; a++) {
      for (let b = 0; b < 3; b++) {
        const tol = 4 * covarianceStandardError(cov, a, b, n) + 0.03 * Math.sqrt(cov[a][a] * cov[b][b]);
        expect(Math.abs(emp[a][b] - cov[a][b])).toBeLessThan(tol);
      }
    }
    const m = cloud.mean();
    expect(Math.hypot(m.x - mean.x, m.y - mean.y)).toBeLessThan(4 * Math.sqrt((cov[0][0] + cov[1][1]) / n) + 0.002);
  });

  it('shareInside counts the particles inside a polygon (even-odd), as pointInPolygon does', () => {
    const cloud = new ParticleCloud(5000);
    cloud.resetGaussian({ x: 0, y: 0, theta: 0 }, [[0.04, 0.01, 0], [0.01, 0.02, 0], [0, 0, 0.01]], createRng('share'));
    const polygon: Polygon = [
      { x: -0.1, y: -1 },
      { x: 1, y: -1 },
      { x: 1, y: 1 },
      { x: 0.2, y: 0.05 },
      { x: -0.1, y: 1 },
    ];
    let inside = 0;
    for (let i = 0; i < cloud.size; i++) if (pointInPolygon(cloud.x[i], cloud.y[i], polygon)) inside++;
    expect(cloud.shareInside(polygon)).toBe(inside / cloud.size);
    expect(inside).toBeGreaterThan(500);
    // The half plane x > 0 of a centred symmetric cloud holds about half of it.
    const half: Polygon = [
      { x: 0, y: -10 },
      { x: 10, y: -10 },
      { x: 10, y: 10 },
      { x: 0, y: 10 },
    ];
    expect(Math.abs(cloud.shareInside(half) - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / cloud.size));
  });

  it('resetGaussian draws the requested covariance; reset collapses the cloud', () => {
    const target = [
      [0.04, 0.01, 0.002],
      [0.01, 0.02, -0.001],
      [0.002, -0.001, 0.01],
    ];
    const n = 50_000;
    const cloud = new ParticleCloud(n);
    cloud.resetGaussian({ x: 1, y: 2, theta: 0.5 }, target, createRng('gauss'));
    const cov = cloud.covariance();
    for (let a = 0; a < 3; a++) {
      for (let b = 0; b < 3; b++) expect(Math.abs(cov[a][b] - target[a][b])).toBeLessThan(4 * covarianceStandardError(target, a, b, n));
    }
    cloud.reset({ x: 3, y: 4, theta: -Math.PI });
    expect(cloud.covariance()[0][0]).toBe(0);
    expect(cloud.mean()).toEqual({ x: 3, y: 4, theta: Math.PI });
  });

  // Facts of the trade (common practice, no source).
  it('common practice, no source: the spread grows with the distance driven', () => {
    const cloud = new ParticleCloud(5000);
    const rng = createRng('grow');
    const odom = path(200, 0.05, () => 0); // 10 m straight
    let last = 0;
    for (let k = 0; k < 200; k++) {
      cloud.advance(odom[k], odom[k + 1], alphas, rng);
      if ((k + 1) % 40 === 0) {
        const c = cloud.covariance();
        const spread = c[0][0] + c[1][1];
        expect(spread).toBeGreaterThan(1.5 * last);
        last = spread;
      }
    }
  });

  it('common practice, no source: for the same path length, turns leave a larger heading spread than a straight run', () => {
    const n = 20_000;
    const straight = new ParticleCloud(n);
    const turning = new ParticleCloud(n);
    drive(straight, path(120, 0.05, () => 0), alphas, 'straight'); // 6 m straight
    drive(turning, path(120, 0.05, (k) => (Math.floor(k / 30) % 2 ? -0.05 : 0.05)), alphas, 'turns'); // 6 m of S-bends
    const sStraight = straight.covariance()[2][2];
    const sTurning = turning.covariance()[2][2];
    expect(sTurning).toBeGreaterThan(1.2 * sStraight);
  });
});
