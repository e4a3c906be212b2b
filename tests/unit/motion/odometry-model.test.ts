import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import {
  angleDifference,
  applyOdometryDelta,
  createRng,
  normalizeAngle,
  odometryAlphasFromStdDevForm,
  odometryAlphasToStdDevForm,
  odometryDelta,
  odometryDensity,
  odometryVariances,
  propagateOdometryCovariance,
  sampleOdometry,
  type OdometryAlphas,
  type Pose,
  type Rng,
} from '../../../shared/motion/index';
import { covarianceStandardError, ksCritical1Percent, ksStatistic, meanAndCovariance } from './helpers';

// The published algorithm, written out literally as a reference: Thrun, Burgard & Fox,
// Probabilistic Robotics (2005), Table 5.6 (sample_motion_model_odometry), variance form. The
// angle differences rot1 and rot2 are wrapped to (-pi, pi], as any implementation must (else a
// heading near ±pi turns a 0.3 rad rotation into −5.98 rad and its variance term explodes).
const wrap = (a: number): number => Math.atan2(Math.sin(a), Math.cos(a));
function bookSample(u: [Pose, Pose], x: Pose, a: OdometryAlphas, rng: Rng): Pose {
  const [xb, xb1] = u;
  const dRot1 = wrap(Math.atan2(xb1.y - xb.y, xb1.x - xb.x) - xb.theta);
  const dTrans = Math.sqrt((xb.x - xb1.x) ** 2 + (xb.y - xb1.y) ** 2);
  const dRot2 = wrap(xb1.theta - xb.theta - dRot1);
  const sample = (b2: number): number => Math.sqrt(b2) * rng.normal();
  const hRot1 = dRot1 - sample(a[0] * dRot1 ** 2 + a[1] * dTrans ** 2);
  const hTrans = dTrans - sample(a[2] * dTrans ** 2 + a[3] * dRot1 ** 2 + a[3] * dRot2 ** 2);
  const hRot2 = dRot2 - sample(a[0] * dRot2 ** 2 + a[1] * dTrans ** 2);
  return {
    x: x.x + hTrans * Math.cos(x.theta + hRot1),
    y: x.y + hTrans * Math.sin(x.theta + hRot1),
    theta: x.theta + hRot1 + hRot2,
  };
}

// A typical step: the odometry frame differs from the true frame (drift so far).
const prevOdom: Pose = { x: 3, y: -1, theta: 2.9 };
const delta = { rot1: 0.3, trans: 0.5, rot2: -0.2 };
const odom = applyOdometryDelta(prevOdom, delta);
const prevPose: Pose = { x: 1, y: 2, theta: 0.4 };

describe('odometryDelta', () => {
  it('recovers rot1, trans, rot2 of a forward move (Table 5.6, lines 2-4)', () => {
    const d = odometryDelta(prevOdom, odom);
    expect(d.rot1).toBeCloseTo(0.3, 12);
    expect(d.trans).toBeCloseTo(0.5, 12);
    expect(d.rot2).toBeCloseTo(-0.2, 12);
  });

  it('reads a reverse move as a small rotation with negative translation and keeps the end pose', () => {
    // Reverse 5 cm while turning slightly: the printed form would give rot1 ≈ pi.
    const back = applyOdometryDelta(prevOdom, { rot1: 0.02, trans: -0.05, rot2: 0.01 });
    const d = odometryDelta(prevOdom, back);
    expect(d.trans).toBeCloseTo(-0.05, 12);
    expect(d.rot1).toBeCloseTo(0.02, 12);
    expect(d.rot2).toBeCloseTo(0.01, 12);
    const again = applyOdometryDelta(prevOdom, d);
    expect(again.x).toBeCloseTo(back.x, 12);
    expect(again.y).toBeCloseTo(back.y, 12);
    expect(angleDifference(again.theta, back.theta)).toBeCloseTo(0, 12);
  });

  it('treats a turn on the spot as rot2 only', () => {
    const d = odometryDelta(prevOdom, { ...prevOdom, theta: normalizeAngle(prevOdom.theta + 0.7) });
    expect(d).toEqual({ rot1: 0, trans: 0, rot2: expect.closeTo(0.7, 12) });
  });

  it('round-trips random increments through applyOdometryDelta', () => {
    const rng = createRng('delta-roundtrip');
    for (let i = 0; i < 200; i++) {
      const p: Pose = { x: rng.normal(), y: rng.normal(), theta: normalizeAngle(6 * rng.uniform()) };
      const q: Pose = { x: rng.normal(), y: rng.normal(), theta: normalizeAngle(6 * rng.uniform()) };
      const back = applyOdometryDelta(p, odometryDelta(p, q));
      expect(back.x).toBeCloseTo(q.x, 10);
      expect(back.y).toBeCloseTo(q.y, 10);
      expect(angleDifference(back.theta, q.theta)).toBeCloseTo(0, 10);
      expect(Math.abs(odometryDelta(p, q).rot1)).toBeLessThanOrEqual(Math.PI / 2);
    }
  });
});

describe('sampleOdometry against the published algorithm (Thrun, Burgard & Fox 2005, Table 5.6)', () => {
  const alphas: OdometryAlphas = [0.02, 0.01, 0.01, 0.005];

  it('draws the same poses as the literal algorithm from the same random stream (forward moves)', () => {
    const ours = createRng('same-stream');
    const book = createRng('same-stream');
    for (let i = 0; i < 500; i++) {
      const a = sampleOdometry(prevPose, prevOdom, odom, alphas, ours);
      const b = bookSample([prevOdom, odom], prevPose, alphas, book);
      expect(a.x).toBeCloseTo(b.x, 12);
      expect(a.y).toBeCloseTo(b.y, 12);
      expect(angleDifference(a.theta, b.theta)).toBeCloseTo(0, 12);
    }
  });

  it('each of rot1, trans, rot2 of 1e5 samples passes a KS test against its normal at 1 %', () => {
    const n = 100_000;
    const rng = createRng('odometry-ks');
    const [v1, v2, v3] = odometryVariances(delta, alphas);
    const r1 = new Float64Array(n);
    const tr = new Float64Array(n);
    const r2 = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const d = odometryDelta(prevPose, sampleOdometry(prevPose, prevOdom, odom, alphas, rng));
      r1[i] = d.rot1;
      tr[i] = d.trans;
      r2[i] = d.rot2;
    }
    // KS statistic against jstat's normal CDF; 1 % critical value 1.628/sqrt(n) from the
    // asymptotic Kolmogorov distribution.
    const crit = ksCritical1Percent(n);
    expect(ksStatistic(r1, (x) => jStat.normal.cdf(x, delta.rot1, Math.sqrt(v1)))).toBeLessThan(crit);
    expect(ksStatistic(tr, (x) => jStat.normal.cdf(x, delta.trans, Math.sqrt(v2)))).toBeLessThan(crit);
    expect(ksStatistic(r2, (x) => jStat.normal.cdf(x, delta.rot2, Math.sqrt(v3)))).toBeLessThan(crit);

    // The same check rejects the standard-deviation reading of the converted coefficients
    // (sd = b1·|rot1| + b2·|trans| with b = sqrt(a)): the test can tell the two forms apart.
    const b = odometryAlphasToStdDevForm(alphas);
    const sdStdForm = b[0] * Math.abs(delta.rot1) + b[1] * Math.abs(delta.trans);
    expect(ksStatistic(r1, (x) => jStat.normal.cdf(x, delta.rot1, sdStdForm))).toBeGreaterThan(crit);
  });

  it('sample mean and covariance of 1e5 samples match the linearised propagation for small noise', () => {
    const small: OdometryAlphas = [1e-4, 2e-5, 1e-4, 2e-5];
    const n = 100_000;
    const rng = createRng('odometry-moments');
    const xs = new Float64Array(n);
    const ys = new Float64Array(n);
    const ts = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const p = sampleOdometry(prevPose, prevOdom, odom, small, rng);
      xs[i] = p.x;
      ys[i] = p.y;
      ts[i] = p.theta;
    }
    const { mean, cov } = meanAndCovariance([xs, ys, ts]);
    const zero = [
      [0, 0, 0],
      [0, 0, 0],
      [0, 0, 0],
    ];
    const lin = propagateOdometryCovariance(prevPose, zero, prevOdom, odom, small);
    const linMean = applyOdometryDelta(prevPose, delta);
    const [v1] = odometryVariances(delta, small);
    // Mean: within 4 standard errors plus the second-order term trans·var(rot1)/2 that the
    // linearisation drops (E[cos(e)] = exp(−var/2)).
    const bias = (delta.trans * v1) / 2;
    expect(Math.abs(mean[0] - linMean.x)).toBeLessThan(4 * Math.sqrt(cov[0][0] / n) + bias);
    expect(Math.abs(mean[1] - linMean.y)).toBeLessThan(4 * Math.sqrt(cov[1][1] / n) + bias);
    expect(Math.abs(mean[2] - linMean.theta)).toBeLessThan(4 * Math.sqrt(cov[2][2] / n));
    // Covariance: every entry within 4 standard errors (Wishart) plus 1 % of the scale.
    for (let a = 0; a < 3; a++) {
      for (let b = 0; b < 3; b++) {
        const tol = 4 * covarianceStandardError(lin, a, b, n) + 0.01 * Math.sqrt(lin[a][a] * lin[b][b]);
        expect(Math.abs(cov[a][b] - lin[a][b])).toBeLessThan(tol);
      }
    }
    // The off-diagonal terms are not negligible, so the check above is not vacuous.
    expect(Math.abs(lin[0][1]) / Math.sqrt(lin[0][0] * lin[1][1])).toBeGreaterThan(0.2);
  });
});

describe('odometryDensity', () => {
  const alphas: OdometryAlphas = [0.02, 0.01, 0.01, 0.005];
  const mean = applyOdometryDelta(prevPose, delta);
  // Grid around the mean pose: ±0.3 m (≥ 5 sd in position) and ±0.5 rad (≥ 5.7 sd in heading).
  const nx = 120;
  const nt = 100;
  const hx = 0.6 / nx;
  const ht = 1.0 / nt;

  function integrate(weight: (p: Pose) => number): number {
    let sum = 0;
    for (let i = 0; i < nx; i++) {
      const x = mean.x - 0.3 + (i + 0.5) * hx;
      for (let j = 0; j < nx; j++) {
        const y = mean.y - 0.3 + (j + 0.5) * hx;
        for (let k = 0; k < nt; k++) {
          const p = { x, y, theta: normalizeAngle(mean.theta - 0.5 + (k + 0.5) * ht) };
          const w = weight(p);
          if (w !== 0) sum += w * odometryDensity(p, prevPose, prevOdom, odom, alphas);
        }
      }
    }
    return sum * hx * hx * ht;
  }

  it('integrates to 1 over a fine grid of poses (midpoint rule)', () => {
    // A density over (x, y, theta) must integrate to one; the printed product of Table 5.5
    // alone would give E[trans] ≈ 0.5 here, so the check can fail.
    expect(Math.abs(integrate(() => 1) - 1)).toBeLessThan(0.01);
  });

  it('gives the same probability to a region as the sampler does', () => {
    const region = (p: Pose): number => (p.x > mean.x && angleDifference(p.theta, mean.theta) > 0.05 ? 1 : 0);
    const massByDensity = integrate(region);
    const rng = createRng('odometry-region');
    const n = 100_000;
    let hits = 0;
    for (let i = 0; i < n; i++) hits += region(sampleOdometry(prevPose, prevOdom, odom, alphas, rng));
    const se = Math.sqrt((massByDensity * (1 - massByDensity)) / n);
    expect(massByDensity).toBeGreaterThan(0.05);
    expect(Math.abs(hits / n - massByDensity)).toBeLessThan(4 * se + 0.005);
  });

  it('is finite and positive for standing still and for a turn on the spot', () => {
    const still = odometryDensity(prevPose, prevPose, prevOdom, prevOdom, alphas);
    expect(Number.isFinite(still)).toBe(true);
    // A pure rotation has var(rot1) = 0, so the model only allows translation noise along the
    // heading: evaluate there (1 mm ahead).
    const turned = { ...prevOdom, theta: prevOdom.theta + 0.5 };
    const p = {
      x: prevPose.x + 1e-3 * Math.cos(prevPose.theta),
      y: prevPose.y + 1e-3 * Math.sin(prevPose.theta),
      theta: prevPose.theta + 0.5,
    };
    const v = odometryDensity(p, prevPose, prevOdom, turned, alphas);
    expect(Number.isFinite(v)).toBe(true);
    expect(v).toBeGreaterThan(0);
  });
});

describe('standard-deviation form of the coefficients', () => {
  it('converts by squaring, and the variance form bounds the std-dev form as documented', () => {
    const b: OdometryAlphas = [0.1, 0.05, 0.08, 0.02];
    const a = odometryAlphasFromStdDevForm(b);
    expect(a[0]).toBeCloseTo(0.01, 15);
    expect(a[3]).toBeCloseTo(0.0004, 15);
    expect(odometryAlphasToStdDevForm(a)[2]).toBeCloseTo(0.08, 15);
    const rng = createRng('forms');
    for (let i = 0; i < 1000; i++) {
      const d = { rot1: rng.normal(), trans: rng.normal(), rot2: rng.normal() };
      const [v1, v2] = odometryVariances(d, a);
      const sd1 = b[0] * Math.abs(d.rot1) + b[1] * Math.abs(d.trans);
      const sd2 = b[2] * Math.abs(d.trans) + b[3] * (Math.abs(d.rot1) + Math.abs(d.rot2));
      expect(v1).toBeLessThanOrEqual(sd1 * sd1 * (1 + 1e-12));
      expect(sd1 * sd1).toBeLessThanOrEqual(2 * v1 * (1 + 1e-12));
      expect(v2).toBeLessThanOrEqual(sd2 * sd2 * (1 + 1e-12));
      expect(sd2 * sd2).toBeLessThanOrEqual(4 * v2 * (1 + 1e-12));
    }
  });
});
