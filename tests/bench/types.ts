/** One printed benchmark figure, optionally with its target. */
export interface BenchFigure {
  label: string;
  value: number;
  unit: string;
  /** Human-readable target, e.g. ">= 12 M/s". */
  target?: string;
  /** Whether the target is met (undefined when there is no target). */
  met?: boolean;
  /** Digits after the decimal point when printing (default 2). */
  digits?: number;
}

/** A benchmark module: `npm run bench` runs every registered module in order. */
export interface BenchModule {
  /** Short name, also used to select modules: `npm run bench -- motion`. */
  name: string;
  /** One-line description printed as the section heading. */
  title: string;
  run(): BenchFigure[] | Promise<BenchFigure[]>;
}
