/**
 * Plane geometry for contacts: the robot's footprint as a rectangle, and whether two polygons
 * touch (any pair of edges crosses, or one lies inside the other).
 * @module
 */
import { pointInPolygon, type Point2, type Polygon, type Pose } from '../motion';

export interface Box {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** The four corners of a length × width rectangle centred on the pose, facing its heading. */
export function footprintAt(pose: Pose, length: number, width: number): Point2[] {
  const c = Math.cos(pose.theta);
  const s = Math.sin(pose.theta);
  const hl = length / 2;
  const hw = width / 2;
  return [
    { x: pose.x + c * hl - s * hw, y: pose.y + s * hl + c * hw },
    { x: pose.x - c * hl - s * hw, y: pose.y - s * hl + c * hw },
    { x: pose.x - c * hl + s * hw, y: pose.y - s * hl - c * hw },
    { x: pose.x + c * hl + s * hw, y: pose.y + s * hl - c * hw },
  ];
}

export function boundingBox(polygon: Polygon): Box {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const p of polygon) {
    if (p.x < minX) minX = p.x;
    if (p.y < minY) minY = p.y;
    if (p.x > maxX) maxX = p.x;
    if (p.y > maxY) maxY = p.y;
  }
  return { minX, minY, maxX, maxY };
}

export const boxesOverlap = (a: Box, b: Box) => a.minX <= b.maxX && b.minX <= a.maxX && a.minY <= b.maxY && b.minY <= a.maxY;

const cross = (o: Point2, a: Point2, b: Point2) => (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);

/** Whether segments pq and rs cross or touch (orientation test, e.g. Cormen et al., Introduction to Algorithms, §33.1). */
export function segmentsIntersect(p: Point2, q: Point2, r: Point2, s: Point2): boolean {
  const d1 = cross(r, s, p);
  const d2 = cross(r, s, q);
  const d3 = cross(p, q, r);
  const d4 = cross(p, q, s);
  if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))) return true;
  const onSegment = (a: Point2, b: Point2, c: Point2) =>
    Math.min(a.x, b.x) <= c.x && c.x <= Math.max(a.x, b.x) && Math.min(a.y, b.y) <= c.y && c.y <= Math.max(a.y, b.y);
  return (d1 === 0 && onSegment(r, s, p)) || (d2 === 0 && onSegment(r, s, q)) || (d3 === 0 && onSegment(p, q, r)) || (d4 === 0 && onSegment(p, q, s));
}

/** Whether two simple polygons overlap or touch. */
export function polygonsTouch(a: Polygon, b: Polygon): boolean {
  for (let i = 0, j = a.length - 1; i < a.length; j = i++) {
    for (let k = 0, l = b.length - 1; k < b.length; l = k++) {
      if (segmentsIntersect(a[j], a[i], b[l], b[k])) return true;
    }
  }
  return pointInPolygon(a[0].x, a[0].y, b) || pointInPolygon(b[0].x, b[0].y, a);
}

/** Length of a polyline. */
export function pathLength(path: Polygon): number {
  let total = 0;
  for (let i = 1; i < path.length; i++) total += Math.hypot(path[i].x - path[i - 1].x, path[i].y - path[i - 1].y);
  return total;
}
