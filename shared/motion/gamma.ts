/**
 * Log-gamma and the regularised incomplete gamma function.
 * @module
 */

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];

/**
 * ln Γ(x) for x > 0 by the Lanczos approximation (C. Lanczos, "A precision approximation of
 * the gamma function", SIAM J. Numer. Anal. B 1, 1964; g = 7, nine coefficients), with the
 * reflection formula below 0.5. Relative error about 1e-15.
 */
export function lnGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - lnGamma(1 - x);
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < 9; i++) sum += LANCZOS[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/**
 * Regularised lower incomplete gamma P(a, x) = γ(a, x)/Γ(a): series for x < a + 1, Lentz's
 * continued fraction for the complement otherwise (Press, Teukolsky, Vetterling & Flannery,
 * Numerical Recipes, 3rd ed., 2007, §6.2).
 */
export function regularizedGammaP(a: number, x: number): number {
  if (!(x > 0)) return 0;
  if (x === Infinity) return 1;
  const lnPrefix = a * Math.log(x) - x - lnGamma(a);
  if (x < a + 1) {
    let ap = a;
    let del = 1 / a;
    let sum = del;
    for (let n = 0; n < 1000; n++) {
      ap += 1;
      del *= x / ap;
      sum += del;
      if (Math.abs(del) < Math.abs(sum) * 1e-15) break;
    }
    return Math.min(1, sum * Math.exp(lnPrefix));
  }
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 1000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-15) break;
  }
  return Math.max(0, 1 - Math.exp(lnPrefix) * h);
}
