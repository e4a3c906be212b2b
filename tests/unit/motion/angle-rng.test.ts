import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { angleDifference, createRng, normalizeAngle } from '../../../shared/motion/index';
import { ksCritical1Percent, ksStatistic } from './helpers';

describe('normalizeAngle', () => {
  it('keeps pi and maps -pi to pi', () => {
    expect(normalizeAngle(Math.PI)).toBe(Math.PI);
    expect(normalizeAngle(-Math.PI)).toBe(Math.PI);
  });
  it('maps odd multiples of pi into (-pi, pi] and even ones to 0', () => {
    for (const k of [-7, -5, -3, 3, 5, 7]) {
      const r = normalizeAngle(k * Math.PI);
      expect(r).toBeGreaterThan(-Math.PI);
      expect(r).toBeLessThanOrEqual(Math.PI);
      expect(Math.abs(Math.abs(r) - Math.PI)).toBeLessThan(1e-14);
    }
    for (const k of [-6, -2, 2, 4, 1000]) expect(Math.abs(normalizeAngle(k * Math.PI))).toBeLessThan(1e-12);
    expect(Object.is(normalizeAngle(-0), 0)).toBe(true);
  });
  it('wraps ordinary angles and leaves in-range angles untouched', () => {
    expect(normalizeAngle(0.3)).toBe(0.3);
    expect(normalizeAngle(-3.1)).toBe(-3.1);
    expect(normalizeAngle(2 * Math.PI + 0.25)).toBeCloseTo(0.25, 14);
    expect(normalizeAngle(-2 * Math.PI - 0.25)).toBeCloseTo(-0.25, 14);
    expect(normalizeAngle(3 * Math.PI / 2)).toBeCloseTo(-Math.PI / 2, 14);
    expect(normalizeAngle(1e6)).toBeCloseTo(Math.atan2(Math.sin(1e6), Math.cos(1e6)), 8);
    expect(normalizeAngle(Number.NaN)).toBeNaN();
  });
  it('angleDifference is the shortest signed rotation', () => {
    expect(angleDifference(-3, 3)).toBeCloseTo(2 * Math.PI - 6, 14);
    expect(angleDifference(3, -3)).toBeCloseTo(6 - 2 * Math.PI, 14);
  });
});

describe('createRng', () => {
  it('is deterministic for a seed and differs between seeds', () => {
    const a = createRng('drive-42');
    const b = createRng('drive-42');
    const c = createRng('drive-43');
    const seqA = Array.from({ length: 50 }, (_, i) => (i % 2 ? a.normal() : a.uniform()));
    const seqB = Array.from({ length: 50 }, (_, i) => (i % 2 ? b.normal() : b.uniform()));
    const seqC = Array.from({ length: 50 }, (_, i) => (i % 2 ? c.normal() : c.uniform()));
    expect(seqB).toEqual(seqA);
    expect(seqC).not.toEqual(seqA);
    expect(createRng(7).uniform()).toBe(createRng('7').uniform());
  });

  it('uniform() is in [0, 1) and passes a KS test against U(0, 1) at 1 %', () => {
    const rng = createRng('uniform');
    const n = 100_000;
    const u = new Float64Array(n);
    for (let i = 0; i < n; i++) u[i] = rng.uniform();
    expect(Math.min(...u)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...u)).toBeLessThan(1);
    // Kolmogorov–Smirnov at 1 %: asymptotic Kolmogorov distribution, K_0.99 = 1.628.
    expect(ksStatistic(u, (x) => x)).toBeLessThan(ksCritical1Percent(n));
  });

  it('normal() passes a KS test against N(0, 1) at 1 % and has the normal moments and tails', () => {
    const rng = createRng('normal');
    const n = 200_000;
    const z = new Float64Array(n);
    let s1 = 0;
    let s2 = 0;
    let s4 = 0;
    let beyond3 = 0;
    for (let i = 0; i < n; i++) {
      const v = rng.normal();
      z[i] = v;
      s1 += v;
      s2 += v * v;
      s4 += v * v * v * v;
      if (Math.abs(v) > 3) beyond3++;
    }
    // KS against jstat's normal CDF; 1 % critical value from the asymptotic Kolmogorov distribution.
    expect(ksStatistic(z, (x) => jStat.normal.cdf(x, 0, 1))).toBeLessThan(ksCritical1Percent(n));
    // Moments of N(0,1): mean 0 (se 1/sqrt n), variance 1 (se sqrt(2/n)), fourth moment 3 (se sqrt(96/n)).
    expect(Math.abs(s1 / n)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(s2 / n - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
    expect(Math.abs(s4 / n - 3)).toBeLessThan(4 * Math.sqrt(96 / n));
    // P(|Z| > 3) = 0.0026998 (standard normal table); binomial standard error.
    const p3 = 0.0026998;
    expect(Math.abs(beyond3 / n - p3)).toBeLessThan(4 * Math.sqrt((p3 * (1 - p3)) / n));
  });

  it('the KS check rejects a normal with the wrong scale (the check can fail)', () => {
    const rng = createRng('normal-control');
    const n = 100_000;
    const z = new Float64Array(n);
    for (let i = 0; i < n; i++) z[i] = 1.05 * rng.normal();
    expect(ksStatistic(z, (x) => jStat.normal.cdf(x, 0, 1))).toBeGreaterThan(ksCritical1Percent(n));
  });
});
