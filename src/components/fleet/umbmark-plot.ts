/**
 * The data of the UMBmark plot: each run's end point (actual minus odometry, in the start
 * frame: x forward along the first leg, y to the left) in millimetres, the centre of gravity
 * of each direction, the origin (where a robot without systematic error would stop), and one
 * square, "nice" axis range for both axes so that distances read the same in x and y.
 */
import type { UmbmarkReport, UmbmarkRun } from '@shared/calibration';
import { toMillimetres } from './fleet-format';

export interface PlotPoint {
  /** Millimetres. */
  x: number;
  y: number;
  /** Row of the CSV file, for the tooltip. */
  row?: number;
}

export interface UmbmarkPlotData {
  cw: PlotPoint[];
  ccw: PlotPoint[];
  centres: { cw: PlotPoint; ccw: PlotPoint };
  origin: PlotPoint;
  /** The same range for x and y, millimetres, with the origin inside. */
  range: { min: number; max: number; step: number };
}

function point(run: Pick<UmbmarkRun, 'x' | 'y' | 'row'>): PlotPoint {
  const p: PlotPoint = { x: toMillimetres(run.x), y: toMillimetres(run.y) };
  if (typeof run.row === 'number') p.row = run.row;
  return p;
}

/** The smallest of 1, 2, 2.5, 5 × 10^k that is at least `value` (value > 0). */
export function niceStep(value: number): number {
  if (!(value > 0) || !Number.isFinite(value)) return 1;
  const power = 10 ** Math.floor(Math.log10(value));
  for (const m of [1, 2, 2.5, 5, 10]) {
    if (m * power >= value * (1 - 1e-12)) return m * power;
  }
  return 10 * power;
}

/**
 * A symmetric range ±R around the origin that holds every point with a margin of about 12 %,
 * R a whole number of nice ticks (about four a side). At least ±1 mm.
 */
export function squareRange(points: readonly PlotPoint[]): { min: number; max: number; step: number } {
  let reach = 0;
  for (const p of points) reach = Math.max(reach, Math.abs(p.x), Math.abs(p.y));
  const wanted = Math.max(reach * 1.12, 1);
  const step = niceStep(wanted / 4);
  const max = Math.ceil(wanted / step - 1e-9) * step;
  return { min: -max, max, step };
}

export function umbmarkPlotData(report: Pick<UmbmarkReport, 'runs' | 'centres'>): UmbmarkPlotData {
  const cw = report.runs.cw.map(point);
  const ccw = report.runs.ccw.map(point);
  const centres = { cw: point(report.centres.cw), ccw: point(report.centres.ccw) };
  const origin = { x: 0, y: 0 };
  return { cw, ccw, centres, origin, range: squareRange([...cw, ...ccw, centres.cw, centres.ccw, origin]) };
}
