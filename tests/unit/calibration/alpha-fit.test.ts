import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { createRng, normalizeAngle, type OdometryAlphas, type Pose } from '../../../shared/motion/index';
import {
  bootstrapOdometryAlphas,
  fitDriftAlphas,
  fitOdometryAlphas,
  odometryAlphaLogLikelihood,
  pairedPosesFromCsvRecords,
  pairedSteps,
  standardisedResiduals,
  type PairedStep,
} from '../../../shared/calibration/index';
import { ksCritical1Percent, ksStatistic } from '../motion/helpers';
import { pairedDrive } from './simulate';

// The demo tugger's assumed drift profile (content/robots/aisle-tugger.json), variance form.
const truth: OdometryAlphas = [0.01, 3e-5, 0.0025, 1e-4];

function simulatedSteps(alphas: OdometryAlphas, seed: string, steps: number): PairedStep[] {
  const drive = pairedDrive(alphas, createRng(seed), steps);
  return pairedSteps(drive.odometry, drive.reference);
}

const normalCdf = (x: number): number => jStat.normal.cdf(x, 0, 1);

describe('maximum-likelihood alphas with percentile bootstrap intervals (Thrun, Burgard & Fox 2005, Table 5.6; Efron & Tibshirani 1993, ch. 13)', () => {
  it('each true alpha lies inside its 95 % bootstrap interval for at least 18 of 20 seeds, and the intervals are not trivially wide', () => {
    // Simulated paired drives of 600 steps with known alphas (sampleOdometry), B = 200.
    // A larger study of this set-up (200 seeds) gave coverages of about 93–96 % per alpha, so
    // this 20-seed check is passed by a correct method most of the time, not always.
    const hits = [0, 0, 0, 0];
    const width = [0, 0, 0, 0];
    for (let s = 0; s < 20; s++) {
      const steps = simulatedSteps(truth, `alphas-${s}`, 600);
      const boot = bootstrapOdometryAlphas(steps, { resamples: 200, seed: `bootstrap-${s}`, level: 0.95 });
      boot.intervals.forEach((iv, i) => {
        if (iv.lower <= truth[i] && truth[i] <= iv.upper) hits[i]++;
        width[i] = Math.max(width[i], (iv.upper - iv.lower) / truth[i]);
      });
    }
    for (let i = 0; i < 4; i++) {
      expect(hits[i], `a${i + 1} covered in ${hits[i]} of 20`).toBeGreaterThanOrEqual(18);
      expect(width[i], `a${i + 1} widest interval / truth`).toBeLessThan(0.8);
    }
  });

  it('the estimate is the maximum of the log-likelihood over a ≥ 0 (no nearby point is higher) and is close to the truth', () => {
    const steps = simulatedSteps(truth, 'optimum', 800);
    const fit = fitOdometryAlphas(steps);
    const best = odometryAlphaLogLikelihood(steps, fit.alphas);
    expect(best).toBeCloseTo(fit.logLikelihood, 6);
    expect(best).toBeGreaterThan(odometryAlphaLogLikelihood(steps, truth));
    for (let i = 0; i < 4; i++) {
      for (const f of [0.98, 1.02, 0.9, 1.1]) {
        const moved = [...fit.alphas] as [number, number, number, number];
        moved[i] *= f;
        expect(odometryAlphaLogLikelihood(steps, moved)).toBeLessThan(best);
      }
      expect(Math.abs(fit.alphas[i] / truth[i] - 1)).toBeLessThan(0.3);
      expect(fit.standardErrors[i]).not.toBeNull(); // an interior estimate
    }
    // The Fisher standard errors agree with the bootstrap's spread (both ≈ the sampling sd).
    const boot = bootstrapOdometryAlphas(steps, { resamples: 200, seed: 'optimum' });
    for (let i = 0; i < 4; i++) {
      const ratio = fit.standardErrors[i]! / boot.standardDeviations[i];
      expect(ratio).toBeGreaterThan(0.7);
      expect(ratio).toBeLessThan(1.4);
    }
  });

  it('returns exactly 0 for a coefficient whose maximum lies on the boundary (no slip noise: a2 = a4 = 0)', () => {
    const steps = simulatedSteps([0.01, 0, 0.0025, 0], 'boundary', 600);
    const fit = fitOdometryAlphas(steps);
    // Either exactly 0, or tiny and then no better than 0 itself.
    for (const i of [1, 3]) {
      expect(fit.alphas[i]).toBeLessThan(truth[i] / 20);
      const zeroed = [...fit.alphas] as [number, number, number, number];
      zeroed[i] = 0;
      expect(odometryAlphaLogLikelihood(steps, zeroed)).toBeLessThanOrEqual(fit.logLikelihood + 1e-9);
    }
    expect(fit.alphas[1] === 0 || fit.alphas[3] === 0).toBe(true);
    expect(Math.abs(fit.alphas[0] / 0.01 - 1)).toBeLessThan(0.3);
    expect(Math.abs(fit.alphas[2] / 0.0025 - 1)).toBeLessThan(0.3);
    const boot = bootstrapOdometryAlphas(steps, { resamples: 100, seed: 'boundary' });
    expect(boot.intervals[1].lower).toBe(0);
    expect(boot.intervals[3].lower).toBe(0);
  });

  it('is deterministic for a seed and depends on it', () => {
    const steps = simulatedSteps(truth, 'seeded', 200);
    const a = bootstrapOdometryAlphas(steps, { resamples: 50, seed: 7 });
    const b = bootstrapOdometryAlphas(steps, { resamples: 50, seed: 7 });
    const c = bootstrapOdometryAlphas(steps, { resamples: 50, seed: 8 });
    expect(a).toEqual(b);
    expect(a.intervals[0].lower).not.toBe(c.intervals[0].lower);
  });
});

describe('standardised residuals (Kolmogorov–Smirnov at 1 %, Kolmogorov 1933 / Smirnov 1948)', () => {
  const steps = simulatedSteps(truth, 'residuals', 1000);

  it('are standard normal under the true alphas', () => {
    const z = standardisedResiduals(steps, truth).map((r) => r.z);
    expect(z.length).toBeGreaterThan(2000);
    expect(ksStatistic(z, normalCdf)).toBeLessThan(ksCritical1Percent(z.length));
  });

  it('are standard normal under the fitted alphas, and the report says so', () => {
    const drive = pairedDrive(truth, createRng('residuals-report'), 1000);
    const report = fitDriftAlphas(drive.odometry, drive.reference, { resamples: 50, seed: 1 });
    const z = report.residuals.map((r) => r.z);
    expect(ksStatistic(z, normalCdf)).toBeLessThan(ksCritical1Percent(z.length));
    for (const c of ['rot1', 'trans', 'rot2'] as const) {
      expect(Math.abs(report.residualSummary[c].sd - 1)).toBeLessThan(0.1);
    }
    expect(report.warnings).toEqual([]);
  });

  it('are not standard normal under wrong alphas (negative control)', () => {
    for (const wrong of [truth.map((a) => a * 2), truth.map((a) => a / 2), [truth[0], truth[1], truth[3], truth[2]]]) {
      const z = standardisedResiduals(steps, wrong as unknown as OdometryAlphas).map((r) => r.z);
      expect(ksStatistic(z, normalCdf)).toBeGreaterThan(ksCritical1Percent(z.length));
    }
  });
});

describe('paired steps and the report’s warnings', () => {
  it('reads the reference the same way round as the odometry near rot1 = ±90°', () => {
    // Odometry: a sideways-ish step read as forward (rot1 just under 90°); the reference went
    // just past 90°, which odometryDelta alone would read as a reverse step.
    const o0: Pose = { x: 0, y: 0, theta: 0 };
    const eps = 0.01;
    const o1: Pose = { x: 0.1 * Math.cos(Math.PI / 2 - eps), y: 0.1 * Math.sin(Math.PI / 2 - eps), theta: 0.2 };
    const r1: Pose = { x: 0.1 * Math.cos(Math.PI / 2 + eps), y: 0.1 * Math.sin(Math.PI / 2 + eps), theta: 0.2 };
    const [step] = pairedSteps([o0, o1], [o0, r1]);
    expect(step.residual.rot1).toBeCloseTo(2 * eps, 12);
    expect(step.residual.trans).toBeCloseTo(0, 12);
    expect(step.residual.rot2).toBeCloseTo(-2 * eps, 12);
  });

  it('warns when the data cannot tell a coefficient (straight driving only: no a1, no a4)', () => {
    const poses = (noise: number): Pose[] => Array.from({ length: 41 }, (_, k) => ({ x: 0.05 * k + noise * Math.sin(k * 1.7), y: noise * Math.cos(k * 2.3), theta: 0 }));
    const report = fitDriftAlphas(poses(0), poses(0.002), { resamples: 20 });
    expect(report.identifiable).toEqual([false, true, true, false]);
    expect(report.alphas[0]).toBe(0);
    expect(report.alphas[3]).toBe(0);
    expect(report.warnings.join(' ')).toMatch(/a1 cannot be estimated.*a4 cannot be estimated/);
  });

  it('warns about a systematic error that zero-mean noise cannot absorb', () => {
    // Reference turning 5 % more than the odometry on every step: an uncorrected wheelbase error.
    const drive = pairedDrive(truth, createRng('bias'), 400);
    const reference: Pose[] = [drive.reference[0]];
    for (let k = 1; k < drive.odometry.length; k++) {
      const o0 = drive.odometry[k - 1];
      const o1 = drive.odometry[k];
      const prev = reference[k - 1];
      const d = Math.hypot(o1.x - o0.x, o1.y - o0.y);
      const dTheta = 1.05 * normalizeAngle(o1.theta - o0.theta);
      reference.push({ x: prev.x + d * Math.cos(prev.theta + dTheta / 2), y: prev.y + d * Math.sin(prev.theta + dTheta / 2), theta: prev.theta + dTheta });
    }
    const report = fitDriftAlphas(drive.odometry, reference, { resamples: 20 });
    expect(report.warnings.join(" ")).toMatch(/The rot1 residuals follow the rot1 increment/);
    expect(report.biasChecks.find((b) => b.component === "rot2" && b.driver === "rot2")!.statistic).toBeGreaterThan(4);
    const clean = fitDriftAlphas(drive.odometry, drive.reference, { resamples: 20 });
    expect(clean.warnings).toEqual([]);
  });

  it('rejects tracks of different lengths, non-finite poses and too few steps', () => {
    const p: Pose = { x: 0, y: 0, theta: 0 };
    expect(() => pairedSteps([p, p], [p])).toThrow(/2 odometry poses but 1 reference/);
    expect(() => pairedSteps([p, { x: NaN, y: 0, theta: 0 }], [p, p])).toThrow(/pose 1 is not finite/);
    expect(() => fitOdometryAlphas(pairedSteps([p, p, p], [p, p, p]))).toThrow(/at least 20 steps/);
  });
});

describe('paired-pose CSV upload: row-level messages', () => {
  const header = ['time', 'odom_x', 'odom_y', 'odom_theta', 'ref_x', 'ref_y', 'ref_theta'];
  const rows = (n: number): Record<string, string>[] =>
    Array.from({ length: n }, (_, k) => ({
      time: (0.1 * k).toFixed(1),
      odom_x: (0.05 * k).toFixed(3),
      odom_y: '0',
      odom_theta: '0',
      ref_x: (0.05 * k).toFixed(3),
      ref_y: '0.001',
      ref_theta: '0.002',
    }));

  it('reads a clean file into two tracks with the file’s row numbers', () => {
    const read = pairedPosesFromCsvRecords(rows(25));
    expect(read.problems).toEqual([]);
    expect(read.odometry).toHaveLength(25);
    expect(read.rows[0]).toBe(2);
    expect(read.reference[3]).toEqual({ x: 0.15, y: 0.001, theta: 0.002 });
  });

  it('names bad cells by row and column and returns no poses', () => {
    const records = rows(25);
    records[2] = { ...records[2], odom_theta: '' }; // row 4
    records[5] = { ...records[5], ref_x: '1,25' }; // row 7
    records[9] = { ...records[9], time: '0.5' }; // row 11: goes back in time
    const read = pairedPosesFromCsvRecords(records);
    expect(read.odometry).toEqual([]);
    expect(read.problems.map((p) => [p.row, p.column])).toEqual([
      [4, 'odom_theta'],
      [7, 'ref_x'],
      [11, 'time'],
    ]);
    expect(read.problems[2].message).toMatch(/does not come after the previous row's 0\.8 s/);
  });

  it('rejects a wrong header on row 1 and too short a file', () => {
    const bad = pairedPosesFromCsvRecords(rows(25), { header: header.filter((h) => h !== 'ref_theta') });
    expect(bad.problems).toHaveLength(1);
    expect(bad.problems[0]).toMatchObject({ row: 1, message: expect.stringMatching(/Missing: ref_theta/) });
    const short = pairedPosesFromCsvRecords(rows(10));
    expect(short.problems).toEqual([{ row: null, message: expect.stringMatching(/^10 pose rows; a fit needs at least 21/) }]);
  });
});
