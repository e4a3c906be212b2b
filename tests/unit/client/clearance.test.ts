import { describe, expect, it } from 'vitest';
import { ellipseReach, passClearance, ringAcross } from '@/drive/clearance';

const rect = (x0: number, y0: number, x1: number, y1: number) => ({
  polygon: [
    { x: x0, y: y0 },
    { x: x1, y: y0 },
    { x: x1, y: y1 },
    { x: x0, y: y1 },
  ],
});

describe('pass clearance', () => {
  it('measures the room on each side of the robot along the pass (long-aisle-run gap: 1.8 m, 0.7 m wide robot)', () => {
    // Pallet stacks of content/sites/tessel-row-hall.json; pass path of content/trials/long-aisle-run.json.
    const stacks = [rect(37.6, 8.5, 39.0, 10.2), rect(37.6, 5.0, 39.0, 6.7)];
    const c = passClearance(
      [
        { x: 36.5, y: 7.6 },
        { x: 40.5, y: 7.6 },
      ],
      stacks,
      0.7,
    );
    expect(c.left).toBeCloseTo(0.9 - 0.35, 9);
    expect(c.right).toBeCloseTo(0.9 - 0.35, 9);
    expect(c.direction).toEqual({ x: 1, y: 0 });
    expect(c.at.x).toBeGreaterThanOrEqual(37.6);
    expect(c.at.x).toBeLessThanOrEqual(39.0);
  });

  it('says null for a side with nothing within reach, and ignores what lies straight ahead', () => {
    const c = passClearance(
      [
        { x: 0, y: 0 },
        { x: 2, y: 0 },
      ],
      [rect(-1, 1, 3, 2), rect(2.5, -0.2, 3, 0.2)],
      0.5,
    );
    expect(c.left).toBeCloseTo(0.75, 9);
    expect(c.right).toBeNull();
  });
});

describe('ring reach', () => {
  it('is the semi-axis along an axis and in between otherwise', () => {
    const ring = { major: 0.4, minor: 0.1, angle: 0 };
    expect(ellipseReach(ring, { x: 1, y: 0 })).toBeCloseTo(0.4, 12);
    expect(ellipseReach(ring, { x: 0, y: 1 })).toBeCloseTo(0.1, 12);
    // Support function of an ellipse: sqrt(a² cos² + b² sin²) (standard result for the ellipse's width).
    expect(ellipseReach(ring, { x: Math.SQRT1_2, y: Math.SQRT1_2 })).toBeCloseTo(Math.sqrt((0.16 + 0.01) / 2), 12);
  });

  it('across the direction of travel: a ring long along the aisle reaches little across it', () => {
    expect(ringAcross({ major: 0.5, minor: 0.05, angle: 0 }, { x: 1, y: 0 })).toBeCloseTo(0.05, 12);
    expect(ringAcross({ major: 0.5, minor: 0.05, angle: Math.PI / 2 }, { x: 1, y: 0 })).toBeCloseTo(0.5, 12);
  });
});
