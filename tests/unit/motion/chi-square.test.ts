import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { chiSquareCdf, chiSquareQuantile, lnGamma } from '../../../shared/motion/index';

// NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.4 "Critical Values of the
// Chi-Square Distribution" (upper-tail table, read at upper-tail area 1 − p).
const NIST: Record<2 | 3, [number, number][]> = {
  2: [
    [0.5, 1.386294],
    [0.9, 4.60517],
    [0.95, 5.991465],
    [0.99, 9.21034],
  ],
  3: [
    [0.5, 2.365974],
    [0.9, 6.251389],
    [0.95, 7.814728],
    [0.99, 11.344867],
  ],
};

describe('chi-square quantiles', () => {
  for (const dof of [2, 3] as const) {
    for (const [p, value] of NIST[dof]) {
      it(`${dof} dof at ${p} matches the NIST/SEMATECH table (${value})`, () => {
        // Source: NIST/SEMATECH e-Handbook, chi-square critical values table (6 decimals).
        expect(Math.abs(chiSquareQuantile(p, dof) - value)).toBeLessThan(6e-7);
      });
      it(`${dof} dof at ${p} agrees with jstat's chisquare.inv`, () => {
        // Cross-check: jstat 1.9 chisquare.inv (independent implementation).
        expect(chiSquareQuantile(p, dof)).toBeCloseTo(jStat.chisquare.inv(p, dof), 6);
      });
    }
  }

  it('2 dof: the quantile of 1 - exp(-k²/2) is k² (the k-sigma ellipse of a 2-D normal)', () => {
    // Source: the squared Mahalanobis distance of a 2-D normal is chi-square with 2 dof, whose
    // CDF is 1 − exp(−x/2) (Johnson & Wichern, Applied Multivariate Statistical Analysis, 2007, ch. 4).
    for (const k of [0.5, 1, 2, 3, 4]) {
      expect(chiSquareQuantile(1 - Math.exp((-k * k) / 2), 2)).toBeCloseTo(k * k, 10);
    }
  });

  it('quantile inverts the CDF for 1..5 dof and agrees with jstat.chisquare.cdf', () => {
    for (const dof of [1, 2, 3, 4, 5]) {
      for (const p of [0.01, 0.25, 0.5, 0.9, 0.999]) {
        const x = chiSquareQuantile(p, dof);
        expect(chiSquareCdf(x, dof)).toBeCloseTo(p, 12);
        // Cross-check with jstat's CDF.
        expect(jStat.chisquare.cdf(x, dof)).toBeCloseTo(p, 8);
      }
    }
  });

  it('lnGamma matches known values and jstat.gammaln', () => {
    // Γ(1/2) = sqrt(pi), Γ(5) = 24, Γ(3/2) = sqrt(pi)/2 (Abramowitz & Stegun 6.1.8, 6.1.6).
    expect(lnGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
    expect(lnGamma(5)).toBeCloseTo(Math.log(24), 13);
    expect(lnGamma(1.5)).toBeCloseTo(Math.log(Math.sqrt(Math.PI) / 2), 13);
    for (const x of [0.1, 2.7, 17.25, 150]) expect(lnGamma(x)).toBeCloseTo(jStat.gammaln(x), 9);
  });

  it('rejects out-of-range arguments', () => {
    expect(() => chiSquareQuantile(-0.1, 2)).toThrow(RangeError);
    expect(() => chiSquareQuantile(0.5, 0)).toThrow(RangeError);
    expect(chiSquareQuantile(1, 3)).toBe(Infinity);
    expect(chiSquareQuantile(0, 3)).toBe(0);
  });
});
