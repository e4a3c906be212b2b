import { describe, expect, it } from 'vitest';
import { calibrateUmbmarkRuns, type StandardisedResidual } from '@shared/calibration';
import { niceStep, squareRange, umbmarkPlotData } from '@/components/fleet/umbmark-plot';
import {
  EXPECTED_OUTSIDE_SHARE,
  RESIDUAL_LIMIT_MAX,
  outsideText,
  residualSeries,
  thinningText,
  tooManyOutside,
} from '@/components/fleet/residual-series';

/** Five runs a side (invented numbers, metres), as an employer's file would give them. */
const RUNS = [
  { direction: 'cw', x: 0.052, y: -0.031, row: 2 },
  { direction: 'cw', x: 0.061, y: -0.027, row: 3 },
  { direction: 'cw', x: 0.048, y: -0.036, row: 4 },
  { direction: 'cw', x: 0.057, y: -0.029, row: 5 },
  { direction: 'cw', x: 0.055, y: -0.033, row: 6 },
  { direction: 'ccw', x: -0.012, y: 0.044, row: 7 },
  { direction: 'ccw', x: -0.018, y: 0.039, row: 8 },
  { direction: 'ccw', x: -0.009, y: 0.047, row: 9 },
  { direction: 'ccw', x: -0.015, y: 0.041, row: 10 },
  { direction: 'ccw', x: -0.011, y: 0.046, row: 11 },
];

describe('the UMBmark plot data', () => {
  const calibration = calibrateUmbmarkRuns(RUNS, { wheelRadius: 0.075, wheelbase: 0.5 });
  if (!calibration.ok) throw new Error('the runs should pass the checks');
  const plot = umbmarkPlotData(calibration.report);

  it('gives every run in millimetres with its row, and the centres of gravity as the mean end point', () => {
    expect(plot.cw).toHaveLength(5);
    expect(plot.ccw).toHaveLength(5);
    expect(plot.cw[0]).toEqual({ x: expect.closeTo(52, 9), y: expect.closeTo(-31, 9), row: 2 });
    expect(plot.ccw[4].row).toBe(11);
    // Centre of gravity = arithmetic mean of the end points (Borenstein & Feng 1996).
    expect(plot.centres.cw.x).toBeCloseTo((52 + 61 + 48 + 57 + 55) / 5, 9);
    expect(plot.centres.ccw.y).toBeCloseTo((44 + 39 + 47 + 41 + 46) / 5, 9);
    expect(plot.origin).toEqual({ x: 0, y: 0 });
  });

  it('uses one symmetric range for both axes that holds every point with a margin', () => {
    const { min, max, step } = plot.range;
    expect(min).toBe(-max);
    expect(max).toBeGreaterThanOrEqual(61 * 1.12);
    expect(Math.abs(max / step - Math.round(max / step))).toBeLessThan(1e-9);
    for (const p of [...plot.cw, ...plot.ccw]) {
      expect(Math.abs(p.x)).toBeLessThan(max);
      expect(Math.abs(p.y)).toBeLessThan(max);
    }
  });

  it('picks nice steps and never a range below ±1 mm', () => {
    expect(niceStep(17)).toBe(20);
    expect(niceStep(2.2)).toBe(2.5);
    expect(niceStep(4)).toBe(5);
    expect(niceStep(0.3)).toBeCloseTo(0.5, 12);
    expect(niceStep(100)).toBe(100);
    expect(squareRange([{ x: 0, y: 0 }])).toEqual({ min: -1, max: 1, step: 0.25 });
  });
});

function residual(step: number, component: StandardisedResidual['component'], z: number): StandardisedResidual {
  return { step, component, residual: z * 0.01, sd: 0.01, z };
}

describe('the residual series', () => {
  const residuals = [
    residual(1, 'rot1', 0.5),
    residual(1, 'trans', -2.5),
    residual(2, 'rot1', 2.1),
    residual(3, 'rot1', -1),
    residual(4, 'rot1', -30),
    residual(4, 'rot2', 1),
  ];

  it('keeps one noise term, counts the points outside ±2 and clips far points to the y range', () => {
    const s = residualSeries(residuals, 'rot1');
    expect(s.count).toBe(4);
    expect(s.outside).toBe(2);
    expect(s.steps).toEqual({ first: 1, last: 4 });
    expect(s.limit).toBe(RESIDUAL_LIMIT_MAX);
    expect(s.clipped).toBe(1);
    expect(s.points.map((p) => p.y)).toEqual([0.5, 2.1, -1, -RESIDUAL_LIMIT_MAX]);
    expect(s.points.map((p) => p.x)).toEqual([1, 2, 3, 4]);
  });

  it('uses at least ±4 and an empty term gives an empty series', () => {
    expect(residualSeries(residuals, 'rot2').limit).toBe(4);
    const none = residualSeries([], 'trans');
    expect(none).toMatchObject({ count: 0, outside: 0, steps: { first: 1, last: 1 }, points: [] });
    expect(outsideText(none)).toBe('No residuals for this term.');
  });

  it('says how many points lie outside the band against what a standard normal gives', () => {
    // P(|Z| > 2) = 2·(1 − Φ(2)) = 0.0455003 (standard normal table, Φ(2) = 0.97724987).
    expect(EXPECTED_OUTSIDE_SHARE).toBeCloseTo(0.0455, 4);
    expect(outsideText({ count: 1000, outside: 48 })).toBe('48 of 1,000 outside ±2 (4.8 %; about 4.6 % expected)');
    // 1000 points: expected 45.5, SD √(1000·0.0455·0.9545) ≈ 6.6, so above about 65 is too many.
    expect(tooManyOutside({ count: 1000, outside: 60 })).toBe(false);
    expect(tooManyOutside({ count: 1000, outside: 70 })).toBe(true);
    expect(tooManyOutside({ count: 10, outside: 5 })).toBe(false);
  });

  it('says when the residuals were thinned for the plot', () => {
    expect(thinningText(800, 800)).toBe('All 800 residuals are shown.');
    expect(thinningText(3000, 9120)).toContain('3,000 of 9,120 residuals are shown');
  });
});
