import { describe, expect, it } from 'vitest';
import {
  CellState,
  createRng,
  OccupancyGrid,
  pointInPolygon,
  sampleOdometry,
  sampleWithMap,
  type OdometryAlphas,
  type Polygon,
  type Pose,
} from '../../../shared/motion/index';

function starPolygon(seed: string, cx: number, cy: number, points: number): Polygon {
  const rng = createRng(seed);
  const poly: { x: number; y: number }[] = [];
  for (let i = 0; i < points; i++) {
    const a = (2 * Math.PI * i) / points;
    const r = 0.5 + 2.5 * rng.uniform();
    poly.push({ x: cx + r * Math.cos(a), y: cy + r * Math.sin(a) });
  }
  return poly;
}

const spec = { originX: -1, originY: -2, width: 80, height: 60, resolution: 0.1 };

describe('OccupancyGrid rasterisation', () => {
  it('fills exactly the cells whose centre pointInPolygon puts inside (even-odd rule)', () => {
    const polygons: Polygon[] = [
      starPolygon('star-a', 2, 1, 11),
      starPolygon('star-b', 5.5, 2.5, 7), // runs past the grid edge
      [
        { x: 0.23, y: -1.5 },
        { x: 3.77, y: -1.5 },
        { x: 3.77, y: -0.31 },
        { x: 0.23, y: -0.31 },
      ],
      [
        { x: -3, y: -3 },
        { x: 1, y: 5 },
        { x: 0.5, y: -0.7 },
      ],
    ];
    for (const polygon of polygons) {
      const grid = new OccupancyGrid(spec);
      grid.fillPolygon(polygon, CellState.Occupied);
      let filled = 0;
      for (let row = 0; row < grid.height; row++) {
        for (let col = 0; col < grid.width; col++) {
          const expected = pointInPolygon(grid.centreX(col), grid.centreY(row), polygon);
          const state = grid.cells[row * grid.width + col];
          expect(state === CellState.Occupied).toBe(expected);
          if (expected) filled++;
        }
      }
      expect(filled).toBeGreaterThan(20);
    }
  });

  it('free first, obstacles on top, unknown elsewhere; p(x | m) is 1 only in free cells', () => {
    const grid = OccupancyGrid.fromPolygons(spec, {
      free: [
        [
          { x: 0, y: -1 },
          { x: 6, y: -1 },
          { x: 6, y: 3 },
          { x: 0, y: 3 },
        ],
      ],
      occupied: [
        [
          { x: 2, y: 0 },
          { x: 3, y: 0 },
          { x: 3, y: 1 },
          { x: 2, y: 1 },
        ],
      ],
    });
    expect(grid.stateAt(1, 0.5)).toBe(CellState.Free);
    expect(grid.stateAt(2.5, 0.5)).toBe(CellState.Occupied);
    expect(grid.stateAt(-0.5, 0.5)).toBe(CellState.Unknown);
    expect(grid.stateAt(100, 0)).toBe(CellState.Unknown);
    expect(grid.probability(1, 0.5)).toBe(1);
    expect(grid.probability(2.5, 0.5)).toBe(0);
    expect(grid.probability(-0.5, 0.5)).toBe(0);
    expect(grid.probability(-50, 0)).toBe(0);
    expect(grid.cellIndex(-1, -2)).toBe(0);
    expect(grid.cellIndex(-1.0001, -2)).toBe(-1);
  });
});

describe('sampleWithMap (Thrun, Burgard & Fox 2005, Table 5.7)', () => {
  // A 1 m step east from (0, 0) towards a wall at x = 1.05 with unknown space beyond y = 0.15.
  const grid = OccupancyGrid.fromPolygons(
    { originX: -1, originY: -1, width: 300, height: 200, resolution: 0.01 },
    {
      free: [
        [
          { x: -1, y: -1 },
          { x: 2, y: -1 },
          { x: 2, y: 0.15 },
          { x: -1, y: 0.15 },
        ],
      ],
      occupied: [
        [
          { x: 1.05, y: -1 },
          { x: 1.2, y: -1 },
          { x: 1.2, y: 1 },
          { x: 1.05, y: 1 },
        ],
      ],
    },
  );
  const prevPose: Pose = { x: 0, y: 0, theta: 0 };
  const prevOdom: Pose = { x: 0, y: 0, theta: 0 };
  const odom: Pose = { x: 1, y: 0, theta: 0 };
  const alphas: OdometryAlphas = [0.01, 0.01, 0.005, 0.001];

  it('accepts only poses in free cells, with weight p(x | m) = 1', () => {
    const rng = createRng('map-accept');
    for (let i = 0; i < 5000; i++) {
      const { pose, weight } = sampleWithMap(prevPose, prevOdom, odom, alphas, grid, rng, 1000);
      expect(weight).toBe(1);
      expect(grid.stateAt(pose.x, pose.y)).toBe(CellState.Free);
    }
  });

  it('draws from the motion model restricted to the free space', () => {
    // Rejection sampling gives the unconstrained distribution conditioned on p(x | m) > 0:
    // compare with unconstrained draws filtered to free cells (independent streams).
    const n = 40_000;
    const rngMap = createRng('map-cond');
    const rngFree = createRng('map-free');
    let sumMap = 0;
    let sumMap2 = 0;
    let sumFree = 0;
    let sumFree2 = 0;
    let kept = 0;
    let tried = 0;
    for (let i = 0; i < n; i++) {
      const y = sampleWithMap(prevPose, prevOdom, odom, alphas, grid, rngMap, 1000).pose.y;
      sumMap += y;
      sumMap2 += y * y;
    }
    while (kept < n) {
      const p = sampleOdometry(prevPose, prevOdom, odom, alphas, rngFree);
      tried++;
      if (grid.probability(p.x, p.y) > 0) {
        kept++;
        sumFree += p.y;
        sumFree2 += p.y * p.y;
      }
    }
    const mMap = sumMap / n;
    const mFree = sumFree / n;
    const se = Math.sqrt((sumMap2 / n - mMap * mMap + sumFree2 / n - mFree * mFree) / n);
    expect(Math.abs(mMap - mFree)).toBeLessThan(4 * se);
    // The map matters here: a good share of raw draws land in the wall or the unknown space,
    // and the restricted mean differs clearly from the unrestricted one (0).
    expect(kept / tried).toBeLessThan(0.9);
    expect(mMap).toBeLessThan(-10 * se);
  });

  it('gives up after maxTries with weight 0, having drawn 3 normals per try', () => {
    const blocked = OccupancyGrid.fromPolygons(
      { originX: -1, originY: -1, width: 30, height: 20, resolution: 0.1 },
      {},
    );
    const rng = createRng('map-exhaust');
    const twin = createRng('map-exhaust');
    const out = sampleWithMap(prevPose, prevOdom, odom, alphas, blocked, rng, 7);
    expect(out.weight).toBe(0);
    for (let i = 0; i < 21; i++) twin.normal();
    expect(rng.uniform()).toBe(twin.uniform());
  });
});
