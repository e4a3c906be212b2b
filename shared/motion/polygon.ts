/**
 * Point-in-polygon tests (even-odd rule).
 * @module
 */
import type { Polygon } from './types';

/**
 * True when (x, y) lies inside `polygon` by the even-odd (crossing-number) rule: count the
 * polygon edges that a ray from the point towards +x crosses, with the half-open rule
 * (yi > y) ≠ (yj > y) so that vertices are counted once (W. R. Franklin's PNPOLY; M. Shimrat,
 * "Algorithm 112: Position of point relative to polygon", CACM 5(8), 1962).
 */
export function pointInPolygon(x: number, y: number, polygon: Polygon): boolean {
  let inside = false;
  const n = polygon.length;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const pi = polygon[i];
    const pj = polygon[j];
    if (pi.y > y !== pj.y > y && x < ((pj.x - pi.x) * (y - pi.y)) / (pj.y - pi.y) + pi.x) {
      inside = !inside;
    }
  }
  return inside;
}

/** A polygon as a flat array [x0, y0, x1, y1, ...] for tight loops. */
export function flattenPolygon(polygon: Polygon): Float64Array {
  const out = new Float64Array(polygon.length * 2);
  for (let i = 0; i < polygon.length; i++) {
    out[2 * i] = polygon[i].x;
    out[2 * i + 1] = polygon[i].y;
  }
  return out;
}

/**
 * {@link pointInPolygon} on a flat polygon from {@link flattenPolygon} (same rule and the same
 * arithmetic, so both always agree).
 */
export function pointInFlatPolygon(x: number, y: number, flat: Float64Array): boolean {
  let inside = false;
  const n = flat.length >> 1;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const xi = flat[2 * i];
    const yi = flat[2 * i + 1];
    const xj = flat[2 * j];
    const yj = flat[2 * j + 1];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}
