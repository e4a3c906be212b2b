/**
 * Chi-square distribution: CDF and quantile.
 * @module
 */
import { lnGamma, regularizedGammaP } from './gamma';

/**
 * CDF of the chi-square distribution with `dof` degrees of freedom: P(dof/2, x/2)
 * (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, §26.4). For 2 dof this is
 * exactly 1 − exp(−x/2).
 */
export function chiSquareCdf(x: number, dof: number): number {
  if (!(x > 0)) return 0;
  if (dof === 2) return -Math.expm1(-0.5 * x);
  return regularizedGammaP(0.5 * dof, 0.5 * x);
}

/** Density of the chi-square distribution (Abramowitz & Stegun 1964, §26.4). */
export function chiSquarePdf(x: number, dof: number): number {
  if (!(x > 0)) return dof === 2 && x === 0 ? 0.5 : 0;
  const k = 0.5 * dof;
  return Math.exp((k - 1) * Math.log(x) - 0.5 * x - k * Math.LN2 - lnGamma(k));
}

/**
 * Quantile (inverse CDF) of the chi-square distribution: the x with chiSquareCdf(x, dof) = p.
 * For 2 dof it is exactly −2·ln(1 − p), the squared Mahalanobis radius of the p-ellipse of a
 * 2-D normal (so the 95 % confidence ring needs no table). Other dof: Newton's method on
 * {@link chiSquareCdf} inside a bisection bracket, to about 1e-13 relative.
 * Checked against the NIST/SEMATECH e-Handbook of Statistical Methods, table of chi-square
 * critical values (see tests/unit/motion).
 */
export function chiSquareQuantile(p: number, dof: number): number {
  if (!(p >= 0 && p < 1) || !(dof > 0)) {
    if (p === 1) return Infinity;
    throw new RangeError(`chiSquareQuantile: need 0 <= p <= 1 and dof > 0 (p=${p}, dof=${dof})`);
  }
  if (p === 0) return 0;
  if (dof === 2) return -2 * Math.log1p(-p);
  let lo = 0;
  let hi = Math.max(1, dof);
  while (chiSquareCdf(hi, dof) < p) {
    lo = hi;
    hi *= 2;
  }
  let x = 0.5 * (lo + hi);
  for (let i = 0; i < 200; i++) {
    const f = chiSquareCdf(x, dof) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const pdf = chiSquarePdf(x, dof);
    let next = pdf > 0 ? x - f / pdf : 0.5 * (lo + hi);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= 1e-14 * x) return next;
    x = next;
  }
  return x;
}
