/**
 * Plane geometry for contacts. Expected values are computed by hand.
 */
import { describe, expect, it } from 'vitest';
import type { Point2 } from '../../../shared/motion';
import { boundingBox, footprintAt, pathLength, polygonsTouch, segmentsIntersect } from '../../../shared/sim';

const P = (x: number, y: number): Point2 => ({ x, y });
const square = (x0: number, y0: number, x1: number, y1: number) => [P(x0, y0), P(x1, y0), P(x1, y1), P(x0, y1)];

describe('segmentsIntersect', () => {
  it('crossing segments (an X)', () => {
    expect(segmentsIntersect(P(0, 0), P(2, 2), P(0, 2), P(2, 0))).toBe(true);
  });

  it('touching: an endpoint on the other segment (a T), and a shared endpoint', () => {
    expect(segmentsIntersect(P(0, 0), P(2, 0), P(1, 0), P(1, 3))).toBe(true);
    expect(segmentsIntersect(P(0, 0), P(1, 1), P(1, 1), P(2, 0))).toBe(true);
  });

  it('collinear: overlapping touch, disjoint do not', () => {
    expect(segmentsIntersect(P(0, 0), P(2, 0), P(1, 0), P(3, 0))).toBe(true);
    expect(segmentsIntersect(P(0, 0), P(1, 0), P(2, 0), P(3, 0))).toBe(false);
  });

  it('disjoint: parallel, and a T that stops short', () => {
    expect(segmentsIntersect(P(0, 0), P(2, 0), P(0, 1), P(2, 1))).toBe(false);
    expect(segmentsIntersect(P(0, 0), P(2, 0), P(1, 0.01), P(1, 3))).toBe(false);
    // The lines cross (at (3, 3)) but the segments end before.
    expect(segmentsIntersect(P(0, 0), P(2, 2), P(6, 0), P(4, 2))).toBe(false);
  });

  it('is symmetric in its two segments and in the order of each segment’s ends', () => {
    const a = [P(0, 0), P(2, 2)] as const;
    const b = [P(0, 2), P(2, 0)] as const;
    expect(segmentsIntersect(b[0], b[1], a[0], a[1])).toBe(true);
    expect(segmentsIntersect(a[1], a[0], b[1], b[0])).toBe(true);
  });
});

describe('polygonsTouch', () => {
  const unit = square(0, 0, 1, 1);

  it('crossing squares', () => {
    expect(polygonsTouch(unit, square(0.5, 0.5, 1.5, 1.5))).toBe(true);
  });

  it('touching along an edge and at a single corner', () => {
    expect(polygonsTouch(unit, square(1, 0, 2, 1))).toBe(true);
    expect(polygonsTouch(unit, square(1, 1, 2, 2))).toBe(true);
  });

  it('disjoint squares, also when their bounding boxes overlap', () => {
    expect(polygonsTouch(unit, square(1.01, 0, 2, 1))).toBe(false);
    // A triangle whose box covers the square's corner (1, 1) without touching it.
    expect(polygonsTouch(unit, [P(2, 0.5), P(2, 2), P(0.5, 2)])).toBe(false);
  });

  it('one polygon wholly inside the other (no edges cross), either way round', () => {
    const big = square(-5, -5, 5, 5);
    expect(polygonsTouch(unit, big)).toBe(true);
    expect(polygonsTouch(big, unit)).toBe(true);
  });
});

describe('footprintAt', () => {
  it('theta = pi/2: a 4 × 2 rectangle centred at (1, 2) facing +y, corners by hand', () => {
    // Front-left, rear-left, rear-right, front-right. Facing +y, "left" is −x:
    // front at y = 2 + 2 = 4, rear at y = 0; left side at x = 1 − 1 = 0, right at x = 2.
    const corners = footprintAt({ x: 1, y: 2, theta: Math.PI / 2 }, 4, 2);
    const expected = [P(0, 4), P(0, 0), P(2, 0), P(2, 4)];
    corners.forEach((c, i) => {
      expect(c.x).toBeCloseTo(expected[i].x, 12);
      expect(c.y).toBeCloseTo(expected[i].y, 12);
    });
  });

  it('theta = 0 and theta = pi: the same rectangle, front and left swapped', () => {
    const east = footprintAt({ x: 0, y: 0, theta: 0 }, 4, 2);
    expect(east).toEqual([P(2, 1), P(-2, 1), P(-2, -1), P(2, -1)]);
    const west = footprintAt({ x: 0, y: 0, theta: Math.PI }, 4, 2);
    [P(-2, -1), P(2, -1), P(2, 1), P(-2, 1)].forEach((e, i) => {
      expect(west[i].x).toBeCloseTo(e.x, 12);
      expect(west[i].y).toBeCloseTo(e.y, 12);
    });
  });

  it('theta = pi/6: corner (c·hl − s·hw, s·hl + c·hw) with c = √3/2, s = 1/2 (by hand)', () => {
    const [fl] = footprintAt({ x: 0, y: 0, theta: Math.PI / 6 }, 2, 1);
    expect(fl.x).toBeCloseTo(Math.sqrt(3) / 2 - 0.25, 12);
    expect(fl.y).toBeCloseTo(0.5 + Math.sqrt(3) / 4, 12);
  });
});

describe('boundingBox and pathLength', () => {
  it('by hand', () => {
    expect(boundingBox([P(1, 5), P(-2, 3), P(4, -1)])).toEqual({ minX: -2, minY: -1, maxX: 4, maxY: 5 });
    expect(pathLength([P(0, 0), P(3, 4), P(3, 10)])).toBe(11);
    expect(pathLength([P(1, 1)])).toBe(0);
  });
});
