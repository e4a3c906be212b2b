/**
 * What the operator can judge a call point by, from the map and the belief alone: how much room
 * the robot believes it has on each side of the pass path, and how far the 95 % ring reaches
 * across that path.
 */
import type { Ellipse } from '@shared/motion';

interface Point {
  x: number;
  y: number;
}

/** Distance from p to the segment ab, and the nearest point on it. */
export function pointSegment(p: Point, a: Point, b: Point): { distance: number; point: Point } {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const length2 = dx * dx + dy * dy;
  const t = length2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / length2));
  const point = { x: a.x + t * dx, y: a.y + t * dy };
  return { distance: Math.hypot(p.x - point.x, p.y - point.y), point };
}

/** The nearest point of a polygon's outline to p. */
export function nearestOnPolygon(p: Point, polygon: readonly Point[]): { distance: number; point: Point } {
  let best = { distance: Infinity, point: polygon[0] };
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const candidate = pointSegment(p, polygon[j], polygon[i]);
    if (candidate.distance < best.distance) best = candidate;
  }
  return best;
}

export interface PassClearance {
  /** Room between the robot's side and the nearest obstacle on its left along the pass, m (null: none within reach). */
  left: number | null;
  right: number | null;
  /** Unit direction of the pass where the gap is narrowest (for the ring's reach across it). */
  direction: Point;
  /** Where along the pass the narrowest point is. */
  at: Point;
}

/**
 * Samples the pass path every `step` metres and finds, on each side, the least distance from the
 * path to an obstacle, less half the robot's width: the clearance the robot has if it truly is
 * where its odometry says.
 */
export function passClearance(
  passPath: readonly Point[],
  obstacles: readonly { polygon: readonly Point[] }[],
  robotWidth: number,
  reach = 4,
  step = 0.05,
): PassClearance {
  let left = Infinity;
  let right = Infinity;
  let narrowest = Infinity;
  let direction = { x: 1, y: 0 };
  let at = passPath[0];
  for (let s = 1; s < passPath.length; s++) {
    const a = passPath[s - 1];
    const b = passPath[s];
    const length = Math.hypot(b.x - a.x, b.y - a.y);
    if (length === 0) continue;
    const u = { x: (b.x - a.x) / length, y: (b.y - a.y) / length };
    const n = Math.max(1, Math.ceil(length / step));
    for (let k = 0; k <= n; k++) {
      const p = { x: a.x + (u.x * length * k) / n, y: a.y + (u.y * length * k) / n };
      let l = Infinity;
      let r = Infinity;
      for (const obstacle of obstacles) {
        const near = nearestOnPolygon(p, obstacle.polygon);
        if (near.distance > reach) continue;
        const side = u.x * (near.point.y - p.y) - u.y * (near.point.x - p.x);
        // Obstacles straight ahead or behind (side ≈ 0) do not bound the gap's width.
        const lateral = Math.abs(side);
        if (lateral < 0.5 * near.distance) continue;
        if (side > 0) l = Math.min(l, near.distance);
        else r = Math.min(r, near.distance);
      }
      left = Math.min(left, l);
      right = Math.min(right, r);
      const width = l + r;
      if (width < narrowest) {
        narrowest = width;
        direction = u;
        at = p;
      }
    }
  }
  const half = robotWidth / 2;
  return {
    left: Number.isFinite(left) ? left - half : null,
    right: Number.isFinite(right) ? right - half : null,
    direction,
    at,
  };
}

/** How far the ellipse reaches from its centre along the unit direction n (its support function). */
export function ellipseReach(ring: Ellipse, n: Point): number {
  const c = Math.cos(ring.angle);
  const s = Math.sin(ring.angle);
  const along = n.x * c + n.y * s;
  const across = -n.x * s + n.y * c;
  return Math.sqrt(ring.major * ring.major * along * along + ring.minor * ring.minor * across * across);
}

/** The ring's reach across a direction of travel u (along its normal). */
export function ringAcross(ring: Ellipse, u: Point): number {
  return ellipseReach(ring, { x: -u.y, y: u.x });
}
