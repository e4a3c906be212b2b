/**
 * The residual plots of the alpha fit: for each noise term of the odometry motion model
 * (rot1, trans, rot2) the standardised residuals z = residual / predicted SD against the step
 * index, with a band at ±2. If the model and the fitted alphas are right, z is standard normal
 * and about 4.6 % of the points fall outside the band (P(|Z| > 2) = 0.0455, standard normal
 * table); many more, a drift of the points away from 0, or a trend along the steps say the
 * noise is not what the profile assumes.
 */
import type { NoiseComponent, StandardisedResidual } from '@shared/calibration';

export const NOISE_COMPONENTS: readonly NoiseComponent[] = ['rot1', 'trans', 'rot2'];

export const COMPONENT_LABELS: Record<NoiseComponent, string> = {
  rot1: 'First rotation (rot1)',
  trans: 'Translation (trans)',
  rot2: 'Second rotation (rot2)',
};

/** Half-width of the band drawn around 0. */
export const RESIDUAL_BAND = 2;

/** Share of a standard normal outside ±2 (standard normal table: Φ(2) = 0.97724987, so 2·(1 − Φ(2)) = 0.04550026). */
export const EXPECTED_OUTSIDE_SHARE = 0.04550026;

export interface ResidualSeries {
  component: NoiseComponent;
  /** x = step index, y = z. */
  points: { x: number; y: number }[];
  count: number;
  /** Points with |z| > {@link RESIDUAL_BAND}. */
  outside: number;
  /** First and last step shown (1 and 1 when there are no points). */
  steps: { first: number; last: number };
  /** Symmetric y range ±limit: at least 4, else the largest |z| rounded up (never above 12). */
  limit: number;
  /** Points beyond ±limit (drawn at the edge). */
  clipped: number;
}

/** Largest y range of a residual plot; points further out are drawn at its edge and counted. */
export const RESIDUAL_LIMIT_MAX = 12;

export function residualSeries(residuals: readonly StandardisedResidual[], component: NoiseComponent): ResidualSeries {
  const mine = residuals.filter((r) => r.component === component && Number.isFinite(r.z));
  let outside = 0;
  let reach = 0;
  let first = Infinity;
  let last = -Infinity;
  for (const r of mine) {
    if (Math.abs(r.z) > RESIDUAL_BAND) outside++;
    reach = Math.max(reach, Math.abs(r.z));
    first = Math.min(first, r.step);
    last = Math.max(last, r.step);
  }
  const limit = Math.min(RESIDUAL_LIMIT_MAX, Math.max(4, Math.ceil(reach)));
  let clipped = 0;
  const points = mine.map((r) => {
    if (Math.abs(r.z) > limit) clipped++;
    return { x: r.step, y: Math.max(-limit, Math.min(limit, r.z)) };
  });
  return {
    component,
    points,
    count: mine.length,
    outside,
    steps: mine.length ? { first, last } : { first: 1, last: 1 },
    limit,
    clipped,
  };
}

/** "31 of 640 outside ±2 (4.8 %; about 4.6 % expected)". */
export function outsideText(series: Pick<ResidualSeries, 'count' | 'outside'>): string {
  if (series.count === 0) return 'No residuals for this term.';
  const share = (100 * series.outside) / series.count;
  return `${series.outside.toLocaleString('en')} of ${series.count.toLocaleString('en')} outside ±${RESIDUAL_BAND} (${share.toFixed(1)} %; about ${(100 * EXPECTED_OUTSIDE_SHARE).toFixed(1)} % expected)`;
}

/** Whether the share outside the band is clearly more than a standard normal gives (a plain 3-sigma binomial rule, ours). */
export function tooManyOutside(series: Pick<ResidualSeries, 'count' | 'outside'>): boolean {
  if (series.count < 20) return false;
  const p = EXPECTED_OUTSIDE_SHARE;
  const expected = series.count * p;
  return series.outside > expected + 3 * Math.sqrt(series.count * p * (1 - p));
}

/** "Every residual is shown" or "3,000 of 9,120 residuals are shown (evenly thinned)". */
export function thinningText(shown: number, total: number | undefined): string {
  if (total === undefined || total <= shown) return `All ${shown.toLocaleString('en')} residuals are shown.`;
  return `${shown.toLocaleString('en')} of ${total.toLocaleString('en')} residuals are shown (thinned evenly for the plot; the fit used all of them).`;
}
