/**
 * UMBmark: recovery of the systematic errors Ed and Eb from the bidirectional square test.
 * @module
 */
import type { Point2 } from './types';

/** What the UMBmark formulas recover. Angles in radians. */
export interface UmbmarkResult {
  /** Type A (wheelbase) error per 90° turn, from the x errors; positive = turns too small. */
  alpha: number;
  /** Type B (wheel-diameter) heading change per side, from the x errors; positive = left. */
  beta: number;
  /** The same two angles from the y errors (a consistency check; ≈ alpha and beta). */
  alphaFromY: number;
  betaFromY: number;
  /** Radius of the curved "straight" legs, metres (L/2)/sin(beta/2); ±Infinity for beta = 0. */
  radius: number;
  /** Recovered right/left wheel-diameter ratio. */
  ed: number;
  /** Recovered actual/nominal wheelbase ratio. */
  eb: number;
}

function centroid(points: readonly Point2[]): Point2 {
  if (points.length === 0) throw new RangeError('umbmark: need at least one run per direction');
  let x = 0;
  let y = 0;
  for (const p of points) {
    x += p.x;
    y += p.y;
  }
  return { x: x / points.length, y: y / points.length };
}

/**
 * The UMBmark formulas of J. Borenstein & L. Feng, "Measurement and correction of systematic
 * odometry errors in mobile robots", IEEE Trans. Robotics and Automation 12(6), 1996:
 * with the centres of gravity of the return-position errors of the clockwise and
 * counter-clockwise runs over a square of side L,
 *
 * alpha = (x_cw + x_ccw)/(−4L), beta = (x_cw − x_ccw)/(−4L)
 * (alternatively alpha = (y_cw − y_ccw)/(−4L), beta = (y_cw + y_ccw)/(−4L)),
 * R = (L/2)/sin(beta/2), Ed = (R + b/2)/(R − b/2), Eb = (pi/2)/(pi/2 − alpha)
 * (the paper's b_actual = 90°/(90° − alpha)·b_nominal).
 *
 * Conventions: the robot starts at the origin heading +x; the counter-clockwise run turns
 * left, the clockwise run right; each error is the robot's actual return position minus the
 * position its odometry computed (the start). `wheelbase` is the nominal b.
 */
export function umbmarkCalibrate(
  cwErrors: readonly Point2[],
  ccwErrors: readonly Point2[],
  sideLength: number,
  wheelbase: number,
): UmbmarkResult {
  const cw = centroid(cwErrors);
  const ccw = centroid(ccwErrors);
  const l4 = -4 * sideLength;
  const alpha = (cw.x + ccw.x) / l4;
  const beta = (cw.x - ccw.x) / l4;
  const radius = beta === 0 ? Infinity : sideLength / 2 / Math.sin(beta / 2);
  const half = wheelbase / 2;
  const ed = radius === Infinity ? 1 : (radius + half) / (radius - half);
  const eb = Math.PI / 2 / (Math.PI / 2 - alpha);
  return {
    alpha,
    beta,
    alphaFromY: (cw.y - ccw.y) / l4,
    betaFromY: (cw.y + ccw.y) / l4,
    radius,
    ed,
    eb,
  };
}

/**
 * Radius of the arc that a robot with wheel-diameter ratio Ed drives when its odometry believes
 * it drives straight: R = (b/2)·(Ed + 1)/(Ed − 1), the inverse of Ed = (R + b/2)/(R − b/2)
 * (Borenstein & Feng 1996). Positive = curving left (Ed > 1); Infinity for Ed = 1.
 */
export function curveRadiusFromEd(ed: number, wheelbase: number): number {
  if (ed === 1) return Infinity;
  return ((wheelbase / 2) * (ed + 1)) / (ed - 1);
}
