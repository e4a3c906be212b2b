/** Statistics helpers for the motion tests (no test cases here). */

/**
 * One-sample Kolmogorov–Smirnov statistic D_n = sup |F_n(x) − F(x)| of `samples` against the
 * continuous CDF `cdf` (A. N. Kolmogorov 1933; N. V. Smirnov 1948), computed exactly at the
 * jumps of the empirical CDF.
 */
export function ksStatistic(samples: ArrayLike<number>, cdf: (x: number) => number): number {
  const sorted = Float64Array.from(samples).sort();
  const n = sorted.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(sorted[i]);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  return d;
}

/**
 * 1 % critical value of D_n for large n: K_0.99 / sqrt(n) with K_0.99 = 1.628, the 0.99
 * quantile of the asymptotic Kolmogorov distribution (Kolmogorov 1933; tabulated e.g. in
 * Smirnov 1948, "Table for estimating the goodness of fit of empirical distributions").
 */
export function ksCritical1Percent(n: number): number {
  return 1.628 / Math.sqrt(n);
}

/** Sample mean and (1/n) covariance of rows of equal length. */
export function meanAndCovariance(columns: Float64Array[]): { mean: number[]; cov: number[][] } {
  const k = columns.length;
  const n = columns[0].length;
  const mean = columns.map((c) => c.reduce((s, v) => s + v, 0) / n);
  const cov = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  for (let i = 0; i < n; i++) {
    for (let a = 0; a < k; a++) {
      const da = columns[a][i] - mean[a];
      for (let b = a; b < k; b++) cov[a][b] += da * (columns[b][i] - mean[b]);
    }
  }
  for (let a = 0; a < k; a++) {
    for (let b = a; b < k; b++) {
      cov[a][b] /= n;
      cov[b][a] = cov[a][b];
    }
  }
  return { mean, cov };
}

/**
 * Standard error of a sample covariance entry cov(a, b) of a normal sample of size n:
 * sqrt((s_aa·s_bb + s_ab²)/n) (moments of the Wishart distribution, e.g. T. W. Anderson, An
 * Introduction to Multivariate Statistical Analysis, 3rd ed., 2003, ch. 7).
 */
export function covarianceStandardError(cov: number[][], a: number, b: number, n: number): number {
  return Math.sqrt((cov[a][a] * cov[b][b] + cov[a][b] * cov[a][b]) / n);
}
