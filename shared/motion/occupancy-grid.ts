/**
 * Occupancy grid of a site map, rasterised from polygons.
 * @module
 */
import type { Polygon } from './types';

/** Cell states. Unknown is the initial state of every cell. */
export const CellState = {
  Unknown: 0,
  Free: 1,
  Occupied: 2,
} as const;
export type CellState = (typeof CellState)[keyof typeof CellState];

/** Placement and size of a grid: cell (0, 0) has its lower-left corner at (originX, originY). */
export interface GridSpec {
  originX: number;
  originY: number;
  /** Number of columns. */
  width: number;
  /** Number of rows. */
  height: number;
  /** Cell edge length in metres. */
  resolution: number;
}

/** Polygons to rasterise: free space first, then obstacles on top. */
export interface GridPolygons {
  free?: readonly Polygon[];
  occupied?: readonly Polygon[];
}

/**
 * A 2-D occupancy grid (H. Moravec & A. Elfes, "High resolution maps from wide angle sonar",
 * ICRA 1985; Thrun, Burgard & Fox, Probabilistic Robotics, 2005, ch. 9) with three cell states,
 * used as the map m of p(x | m) in {@link sampleWithMap}. Row-major `cells`, row 0 at the
 * bottom (smallest y).
 */
export class OccupancyGrid {
  readonly originX: number;
  readonly originY: number;
  readonly width: number;
  readonly height: number;
  readonly resolution: number;
  readonly cells: Uint8Array;

  constructor(spec: GridSpec) {
    if (!(spec.width > 0 && spec.height > 0 && spec.resolution > 0)) {
      throw new RangeError('OccupancyGrid: width, height and resolution must be positive');
    }
    this.originX = spec.originX;
    this.originY = spec.originY;
    this.width = Math.floor(spec.width);
    this.height = Math.floor(spec.height);
    this.resolution = spec.resolution;
    this.cells = new Uint8Array(this.width * this.height);
  }

  /**
   * Builds a grid by rasterising polygons: every cell starts Unknown, cells whose centre is
   * inside a `free` polygon become Free, then cells whose centre is inside an `occupied`
   * polygon become Occupied (see {@link OccupancyGrid.fillPolygon}).
   */
  static fromPolygons(spec: GridSpec, polygons: GridPolygons): OccupancyGrid {
    const grid = new OccupancyGrid(spec);
    for (const p of polygons.free ?? []) grid.fillPolygon(p, CellState.Free);
    for (const p of polygons.occupied ?? []) grid.fillPolygon(p, CellState.Occupied);
    return grid;
  }

  /**
   * Sets every cell whose centre lies inside `polygon` to `state`: scan-line polygon fill
   * (J. D. Foley, A. van Dam, S. K. Feiner & J. F. Hughes, Computer Graphics: Principles and
   * Practice, 2nd ed., 1990, §3.6) with the even-odd rule and the same crossing arithmetic as
   * {@link pointInPolygon}, so a cell is filled exactly when pointInPolygon(cell centre) holds.
   */
  fillPolygon(polygon: Polygon, state: CellState): void {
    const n = polygon.length;
    if (n < 3) return;
    const res = this.resolution;
    const xs: number[] = [];
    for (let row = 0; row < this.height; row++) {
      const y = this.originY + (row + 0.5) * res;
      xs.length = 0;
      for (let i = 0, j = n - 1; i < n; j = i++) {
        const pi = polygon[i];
        const pj = polygon[j];
        if (pi.y > y !== pj.y > y) xs.push(((pj.x - pi.x) * (y - pi.y)) / (pj.y - pi.y) + pi.x);
      }
      if (xs.length < 2) continue;
      xs.sort((a, b) => a - b);
      const base = row * this.width;
      for (let k = 0; k + 1 < xs.length; k += 2) {
        // Centres x_c with xs[k] <= x_c < xs[k + 1] are inside (odd number of crossings right of x_c).
        let start = Math.max(0, Math.ceil((xs[k] - this.originX) / res - 0.5));
        while (start > 0 && this.centreX(start - 1) >= xs[k]) start--;
        while (start < this.width && this.centreX(start) < xs[k]) start++;
        let end = Math.min(this.width, Math.max(0, Math.ceil((xs[k + 1] - this.originX) / res - 0.5)));
        while (end > 0 && this.centreX(end - 1) >= xs[k + 1]) end--;
        while (end < this.width && this.centreX(end) < xs[k + 1]) end++;
        for (let col = start; col < end; col++) this.cells[base + col] = state;
      }
    }
  }

  /** x of the centre of column `col`. */
  centreX(col: number): number {
    return this.originX + (col + 0.5) * this.resolution;
  }

  /** y of the centre of row `row`. */
  centreY(row: number): number {
    return this.originY + (row + 0.5) * this.resolution;
  }

  /** Index into `cells` of the cell holding (x, y), or −1 outside the grid. */
  cellIndex(x: number, y: number): number {
    const col = Math.floor((x - this.originX) / this.resolution);
    const row = Math.floor((y - this.originY) / this.resolution);
    if (col < 0 || row < 0 || col >= this.width || row >= this.height) return -1;
    return row * this.width + col;
  }

  /** State of the cell holding (x, y); Unknown outside the grid. */
  stateAt(x: number, y: number): CellState {
    const i = this.cellIndex(x, y);
    return i < 0 ? CellState.Unknown : (this.cells[i] as CellState);
  }

  /**
   * p(x | m) for a robot at (x, y): 1 in a Free cell, 0 in an Occupied or Unknown cell and
   * outside the grid (the "consistency" of a pose with the map in Thrun, Burgard & Fox,
   * Probabilistic Robotics, 2005, §5.5, up to a constant factor).
   */
  probability(x: number, y: number): number {
    return this.stateAt(x, y) === CellState.Free ? 1 : 0;
  }
}
