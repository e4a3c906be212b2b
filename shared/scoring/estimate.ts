/**
 * Scoring an estimate pin against the belief: coverage is the share of the drift cloud inside the
 * operator's ring (a calibrated 95 % ring holds about 95 % of it); sharpness is the area of the
 * belief's 95 % confidence ellipse over the ring's area, so a ring drawn needlessly wide loses
 * points. Score = min(coverage / 0.95, 1) × min(sharpness, 1) — Driftproof's own rule.
 * @module
 */
import type { Ellipse, ParticleCloud } from '../motion';
import type { EstimatePin } from '../sim';
import type { EstimateScore } from './types';

/** Ellipses smaller than this (m²) count as this, so a fresh belief does not demand a pin of zero size. */
export const MIN_ELLIPSE_AREA = 0.01;

export function scoreEstimate(pin: EstimatePin, cloud: ParticleCloud, ring: Ellipse): EstimateScore {
  const r2 = pin.radius * pin.radius;
  let inside = 0;
  for (let i = 0; i < cloud.size; i++) {
    const dx = cloud.x[i] - pin.x;
    const dy = cloud.y[i] - pin.y;
    if (dx * dx + dy * dy <= r2) inside += 1;
  }
  const coverage = inside / cloud.size;
  const ellipseArea = Math.max(Math.PI * ring.major * ring.minor, MIN_ELLIPSE_AREA);
  const sharpness = Math.min(1, ellipseArea / (Math.PI * r2));
  return { pin, coverage, sharpness, score: Math.min(coverage / 0.95, 1) * sharpness };
}
