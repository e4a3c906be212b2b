/**
 * Fleet calibration, upload 1: the runs of the UMBmark bidirectional square test → the
 * systematic errors Ed and Eb, E_max,syst and the corrected wheel diameters and wheelbase.
 *
 * Method and formulas: J. Borenstein & L. Feng, "Measurement and correction of systematic
 * odometry errors in mobile robots", IEEE Trans. Robotics and Automation 12(6), 1996. The
 * formulas themselves are applied by `umbmarkCalibrate` of the motion engine; this module
 * checks the runs, adds the centres of gravity, E_max,syst, the heading cross-check and the
 * corrected geometry.
 * @module
 */
import {
  normalizeAngle,
  umbmarkCalibrate,
  wheelDiameterFactors,
  type DiffDriveRobot,
  type Point2,
  type UmbmarkResult,
} from '../motion/index';
import { checkHeader, readDecimal, sortProblems, type RowProblem } from './problems';

/** Travel direction of a run: `cw` clockwise (right turns), `ccw` counter-clockwise (left turns). */
export type UmbmarkDirection = 'cw' | 'ccw';

/**
 * One run of the bidirectional square test.
 *
 * `x`, `y` (metres) and `heading` (radians, optional) are the robot's ACTUAL final pose minus
 * the final pose its odometry computed (which is the start, for a robot that completed the
 * square by its odometry), in the start frame: x forward along the first leg, y to the left,
 * heading counter-clockwise. This is the paper's ε = x_abs − x_calc.
 * `row` says where the run came from, for messages (default: its 1-based position).
 */
export interface UmbmarkRun {
  direction: UmbmarkDirection;
  x: number;
  y: number;
  heading?: number;
  row?: number;
}

/** Runs per direction that the method prescribes (Borenstein & Feng 1996). */
export const UMBMARK_RUNS_PER_DIRECTION = 5;
/** Side of the test square in metres (Borenstein & Feng 1996 use 4 m × 4 m). */
export const UMBMARK_SIDE_LENGTH = 4;
/** Outlier rule: factor on the typical spread (see {@link checkUmbmarkRuns}). */
export const UMBMARK_OUTLIER_FACTOR = 6;
/** Outlier rule: a run closer than this (metres) to the middle of its direction is never an outlier. */
export const UMBMARK_OUTLIER_FLOOR = 0.02;
/** Largest plausible heading error of one run, radians (90°). */
export const UMBMARK_MAX_HEADING_ERROR = Math.PI / 2;

/** Options of the checks; every field has the default of the constants above. */
export interface UmbmarkCheckOptions {
  /** Side of the square, metres. */
  sideLength?: number;
  /** Fewest runs accepted in each direction. */
  minRunsPerDirection?: number;
  /** Outlier rule factor k. */
  outlierFactor?: number;
  /** Outlier rule floor, metres. */
  outlierFloor?: number;
}

/** Runs that passed the checks (each with its `row`) and the problems found. */
export interface UmbmarkRunCheck {
  runs: UmbmarkRun[];
  problems: RowProblem[];
}

const DIRECTION_WORDS: Record<UmbmarkDirection, string> = { cw: 'clockwise', ccw: 'counter-clockwise' };

function metres(v: number): string {
  return `${v.toFixed(3)} m`;
}

function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 === 1 ? s[(n - 1) / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
}

function positiveFinite(v: number, name: string): void {
  if (!Number.isFinite(v) || v <= 0) throw new RangeError(`${name} must be a positive number of metres`);
}

/**
 * Checks a list of runs given as data (for example a JSON body). Each problem names the row:
 * the run's own `row` if it has one, else its 1-based position. Reported:
 * - a missing or unknown `direction` (only `cw` and `ccw`);
 * - `x`, `y` missing or not finite numbers; `heading`, when given, not a finite number;
 * - implausible values: a return error larger than the square's side (almost always a unit
 *   mistake), or a heading error beyond {@link UMBMARK_MAX_HEADING_ERROR};
 * - too few usable runs in a direction (fewer than `minRunsPerDirection`, default 5), with
 *   `row: null`;
 * - outliers, by this rule (ours): in each direction with at least 3 usable runs, take the
 *   coordinate-wise median end point and each run's distance d from it; s is the median of
 *   those distances over ALL runs of both directions (pooled, so five runs a side give a stable
 *   scale). A run is an outlier when d > max(k·s, floor), k = 6, floor = 2 cm. With 5 clean
 *   normally scattered runs a side this flags about 1 upload in 200, and it flags a run shifted
 *   by 12 standard deviations about 98 times in 100 (simulated; see the tests).
 *
 * Runs with a row problem are not returned and take no part in the count or the outlier rule.
 */
export function checkUmbmarkRuns(input: readonly unknown[], options: UmbmarkCheckOptions = {}): UmbmarkRunCheck {
  const sideLength = options.sideLength ?? UMBMARK_SIDE_LENGTH;
  positiveFinite(sideLength, 'sideLength');
  const minRuns = options.minRunsPerDirection ?? UMBMARK_RUNS_PER_DIRECTION;
  const k = options.outlierFactor ?? UMBMARK_OUTLIER_FACTOR;
  const floor = options.outlierFloor ?? UMBMARK_OUTLIER_FLOOR;

  const problems: RowProblem[] = [];
  const usable: UmbmarkRun[] = [];
  input.forEach((item, index) => {
    const rec = (typeof item === 'object' && item !== null ? item : {}) as Record<string, unknown>;
    const row = typeof rec.row === 'number' && Number.isInteger(rec.row) && rec.row > 0 ? rec.row : index + 1;
    const before = problems.length;
    if (typeof item !== 'object' || item === null) {
      problems.push({ row, message: 'This run is not a record with direction, x and y.' });
      return;
    }
    const dir = rec.direction;
    if (dir === undefined || dir === null || dir === '') {
      problems.push({ row, message: 'The direction is missing; give cw (clockwise) or ccw (counter-clockwise).' });
    } else if (dir !== 'cw' && dir !== 'ccw') {
      problems.push({ row, message: `The direction ${JSON.stringify(dir)} is neither cw nor ccw.` });
    }
    for (const key of ['x', 'y'] as const) {
      const v = rec[key];
      if (v === undefined || v === null) problems.push({ row, message: `The ${key} error is missing (metres).` });
      else if (typeof v !== 'number' || !Number.isFinite(v)) {
        problems.push({ row, message: `The ${key} error must be a finite number of metres, not ${JSON.stringify(v)}.` });
      }
    }
    const h = rec.heading;
    const hasHeading = h !== undefined && h !== null;
    if (hasHeading && (typeof h !== 'number' || !Number.isFinite(h))) {
      problems.push({ row, message: `The heading error must be a finite number of radians, not ${JSON.stringify(h)}.` });
    }
    if (problems.length > before) return;
    const x = rec.x as number;
    const y = rec.y as number;
    const dist = Math.hypot(x, y);
    if (dist > sideLength) {
      problems.push({
        row,
        message: `This run ends ${metres(dist)} from where its odometry says it is, more than the square's side (${sideLength} m); errors are in metres: check the units.`,
      });
    }
    if (hasHeading && Math.abs(h as number) > UMBMARK_MAX_HEADING_ERROR) {
      problems.push({
        row,
        message: `A heading error of ${(h as number).toFixed(3)} rad is more than a quarter turn; heading errors are in radians: check the units.`,
      });
    }
    if (problems.length > before) return;
    const run: UmbmarkRun = { direction: dir as UmbmarkDirection, x, y, row };
    if (hasHeading) run.heading = h as number;
    usable.push(run);
  });

  for (const d of ['cw', 'ccw'] as const) {
    const count = usable.filter((r) => r.direction === d).length;
    if (count < minRuns) {
      problems.push({
        row: null,
        message: `${count === 0 ? 'No' : `Only ${count}`} usable ${DIRECTION_WORDS[d]} (${d}) run${count === 1 ? '' : 's'}; the bidirectional square test needs at least ${minRuns} in each direction.`,
      });
    }
  }

  // Outlier rule (see above): distances from the coordinate-wise median of each direction.
  const distances = new Map<UmbmarkRun, number>();
  const middles = new Map<UmbmarkDirection, Point2>();
  for (const d of ['cw', 'ccw'] as const) {
    const group = usable.filter((r) => r.direction === d);
    if (group.length < 3) continue;
    const middle = { x: median(group.map((r) => r.x)), y: median(group.map((r) => r.y)) };
    middles.set(d, middle);
    for (const r of group) distances.set(r, Math.hypot(r.x - middle.x, r.y - middle.y));
  }
  const outliers = new Set<UmbmarkRun>();
  if (distances.size > 0) {
    const spread = median([...distances.values()]);
    const limit = Math.max(k * spread, floor);
    for (const [run, dist] of distances) {
      if (dist <= limit) continue;
      outliers.add(run);
      const word = DIRECTION_WORDS[run.direction];
      problems.push({
        row: run.row ?? null,
        message: `This ${word} run ends ${metres(dist)} from the middle of the ${word} runs, more than ${k} × the typical spread of all runs (${metres(spread)}) and more than ${metres(floor)}: measure it again, or replace it with a new run.`,
      });
    }
  }
  return { runs: usable.filter((r) => !outliers.has(r)), problems: sortProblems(problems) };
}

/** Columns of the UMBmark CSV upload. */
export const UMBMARK_CSV_COLUMNS = {
  required: ['direction', 'x_error', 'y_error'],
  optional: ['heading_error'],
} as const;

/** Where the CSV records came from. */
export interface CsvRecordsOptions {
  /** Header of the file (trimmed, lower-case); default the keys of the first record. */
  header?: readonly string[];
  /**
   * Line in the file of each record, when the reader skipped lines (for example blank lines);
   * default: record i is row i + 2 (the header is row 1).
   */
  rowNumbers?: readonly number[];
}

/** Records of a CSV file as a reader returns them: column name → cell text. */
export type CsvRecord = Readonly<Record<string, string | undefined>>;

const DIRECTION_ALIASES: Record<string, UmbmarkDirection> = {
  cw: 'cw',
  clockwise: 'cw',
  ccw: 'ccw',
  counterclockwise: 'ccw',
  'counter-clockwise': 'ccw',
  anticlockwise: 'ccw',
  'anti-clockwise': 'ccw',
};

/**
 * Reads the records of a UMBmark CSV upload (columns `direction,x_error,y_error` and optional
 * `heading_error`; x and y errors in metres, heading error in radians; direction `cw` or `ccw`,
 * also written out as clockwise / counter-clockwise / anticlockwise, any case) into runs.
 * Rows are numbered as in the file, the header being row 1. Header problems are reported on
 * row 1 and stop the reading. Each run carries its `row`, so the later checks name the same
 * rows. An empty `heading_error` cell means no heading was measured for that run.
 */
export function umbmarkRunsFromCsvRecords(
  records: readonly CsvRecord[],
  options: CsvRecordsOptions = {},
): UmbmarkRunCheck {
  const header = options.header ?? (records.length > 0 ? Object.keys(records[0]) : []);
  const headerProblems = checkHeader(header, UMBMARK_CSV_COLUMNS.required, UMBMARK_CSV_COLUMNS.optional);
  if (headerProblems.length > 0) return { runs: [], problems: headerProblems };
  if (records.length === 0) return { runs: [], problems: [{ row: null, message: 'The file has no runs under its header row.' }] };
  const problems: RowProblem[] = [];
  const runs: UmbmarkRun[] = [];
  records.forEach((record, index) => {
    const row = options.rowNumbers?.[index] ?? index + 2;
    const before = problems.length;
    const dirText = (record.direction ?? '').trim().toLowerCase();
    const direction = DIRECTION_ALIASES[dirText];
    if (dirText === '') {
      problems.push({ row, column: 'direction', message: 'The direction is empty; write cw (clockwise) or ccw (counter-clockwise).' });
    } else if (!direction) {
      problems.push({ row, column: 'direction', message: `The direction "${record.direction?.trim()}" is neither cw nor ccw.` });
    }
    const x = readDecimal(record.x_error, 'x_error (metres)');
    const y = readDecimal(record.y_error, 'y_error (metres)');
    if (!x.ok) problems.push({ row, column: 'x_error', message: x.message });
    if (!y.ok) problems.push({ row, column: 'y_error', message: y.message });
    const headingText = (record.heading_error ?? '').trim();
    const heading = headingText === '' ? null : readDecimal(headingText, 'heading_error (radians)');
    if (heading && !heading.ok) problems.push({ row, column: 'heading_error', message: heading.message });
    if (problems.length > before || !x.ok || !y.ok || !direction) return;
    const run: UmbmarkRun = { direction, x: x.value, y: y.value, row };
    if (heading?.ok) run.heading = heading.value;
    runs.push(run);
  });
  return { runs, problems };
}

/** Wheel diameters and wheelbase to enter in the robot's controller, from Ed and Eb. */
export interface CorrectedGeometry {
  /** Left wheel diameter D_L = c_L·D, metres (D = 2·nominal wheel radius). */
  leftWheelDiameter: number;
  /** Right wheel diameter D_R = c_R·D, metres. */
  rightWheelDiameter: number;
  /** Wheelbase b_actual = Eb·b_nominal, metres. */
  wheelbase: number;
  /** Correction factors c_L = 2/(Ed + 1) and c_R = 2/(1/Ed + 1). */
  leftFactor: number;
  rightFactor: number;
}

/**
 * The correction of Borenstein & Feng (1996): D_L = c_L·D, D_R = c_R·D with
 * c_L = 2/(Ed + 1), c_R = 2/(1/Ed + 1) (so D_R/D_L = Ed and the mean stays the nominal D,
 * `wheelDiameterFactors` of the motion engine), and b_actual = Eb·b_nominal.
 */
export function correctedGeometry(
  robot: Pick<DiffDriveRobot, 'wheelRadius' | 'wheelbase'>,
  ed: number,
  eb: number,
): CorrectedGeometry {
  positiveFinite(robot.wheelRadius, 'wheelRadius');
  positiveFinite(robot.wheelbase, 'wheelbase');
  if (!(ed > 0) || !(eb > 0) || !Number.isFinite(ed) || !Number.isFinite(eb)) {
    throw new RangeError('Ed and Eb must be positive finite ratios');
  }
  const f = wheelDiameterFactors(ed);
  const d = 2 * robot.wheelRadius;
  return {
    leftWheelDiameter: f.left * d,
    rightWheelDiameter: f.right * d,
    wheelbase: eb * robot.wheelbase,
    leftFactor: f.left,
    rightFactor: f.right,
  };
}

/**
 * The same angles from the measured heading errors (only when every run has one): over a
 * square the heading error is θ_ccw = 4(β − α) and θ_cw = 4(β + α) (four turns each short by
 * alpha, four legs each curving left by beta, in the paper's model), so
 * alpha = (θ̄_cw − θ̄_ccw)/8 and beta = (θ̄_cw + θ̄_ccw)/8; Ed and Eb then follow from the
 * published formulas. Floor measurements of heading are usually far coarser than of position,
 * so this is a cross-check, not the result.
 */
export interface UmbmarkHeadingCheck {
  meanCw: number;
  meanCcw: number;
  alpha: number;
  beta: number;
  ed: number;
  eb: number;
}

/** Everything the UMBmark upload reports; lengths in metres, angles in radians. */
export interface UmbmarkReport extends UmbmarkResult {
  sideLength: number;
  /** The runs used, per direction (for the plot of end points). */
  runs: { cw: UmbmarkRun[]; ccw: UmbmarkRun[] };
  /** Centres of gravity of the end points (x_c.g., y_c.g.) per direction. */
  centres: { cw: Point2; ccw: Point2 };
  /** r_c.g. = distance of each centre of gravity from the origin. */
  centreDistances: { cw: number; ccw: number };
  /** E_max,syst = max(r_c.g.,cw, r_c.g.,ccw), the UMBmark measure of systematic odometry error. */
  eMaxSyst: number;
  heading: UmbmarkHeadingCheck | null;
  corrected: CorrectedGeometry;
}

function centre(runs: readonly UmbmarkRun[]): Point2 {
  let x = 0;
  let y = 0;
  for (const r of runs) {
    x += r.x;
    y += r.y;
  }
  return { x: x / runs.length, y: y / runs.length };
}

function edFromBeta(beta: number, sideLength: number, wheelbase: number): number {
  if (beta === 0) return 1;
  const radius = sideLength / 2 / Math.sin(beta / 2);
  return (radius + wheelbase / 2) / (radius - wheelbase / 2);
}

/**
 * Computes the UMBmark report from checked runs (at least one per direction; use
 * {@link checkUmbmarkRuns} or {@link calibrateUmbmarkRuns} first): centres of gravity,
 * r_c.g. and E_max,syst, then alpha, beta, R, Ed and Eb by the published formulas
 * (`umbmarkCalibrate`, Borenstein & Feng 1996), the heading cross-check and the corrected
 * geometry for `robot` (nominal wheel radius and wheelbase).
 */
export function umbmarkReport(
  runs: readonly UmbmarkRun[],
  robot: Pick<DiffDriveRobot, 'wheelRadius' | 'wheelbase'>,
  sideLength: number = UMBMARK_SIDE_LENGTH,
): UmbmarkReport {
  positiveFinite(sideLength, 'sideLength');
  positiveFinite(robot.wheelbase, 'wheelbase');
  const cw = runs.filter((r) => r.direction === 'cw');
  const ccw = runs.filter((r) => r.direction === 'ccw');
  if (cw.length === 0 || ccw.length === 0) throw new RangeError('umbmarkReport: need at least one run in each direction');
  const formulas = umbmarkCalibrate(cw, ccw, sideLength, robot.wheelbase);
  const centres = { cw: centre(cw), ccw: centre(ccw) };
  const centreDistances = { cw: Math.hypot(centres.cw.x, centres.cw.y), ccw: Math.hypot(centres.ccw.x, centres.ccw.y) };
  let heading: UmbmarkHeadingCheck | null = null;
  if (runs.every((r) => typeof r.heading === 'number')) {
    const mean = (group: readonly UmbmarkRun[]): number =>
      group.reduce((s, r) => s + normalizeAngle(r.heading as number), 0) / group.length;
    const meanCw = mean(cw);
    const meanCcw = mean(ccw);
    const alpha = (meanCw - meanCcw) / 8;
    const beta = (meanCw + meanCcw) / 8;
    heading = {
      meanCw,
      meanCcw,
      alpha,
      beta,
      ed: edFromBeta(beta, sideLength, robot.wheelbase),
      eb: Math.PI / 2 / (Math.PI / 2 - alpha),
    };
  }
  return {
    ...formulas,
    sideLength,
    runs: { cw: [...cw], ccw: [...ccw] },
    centres,
    centreDistances,
    eMaxSyst: Math.max(centreDistances.cw, centreDistances.ccw),
    heading,
    corrected: correctedGeometry(robot, formulas.ed, formulas.eb),
  };
}

/** Outcome of a whole UMBmark upload: the report, or the problems that stop it. */
export type UmbmarkCalibration =
  | { ok: true; report: UmbmarkReport; problems: [] }
  | { ok: false; problems: RowProblem[] };

/**
 * Checks runs given as data ({@link checkUmbmarkRuns}) and, when nothing is wrong, computes the
 * report ({@link umbmarkReport}). Any problem (including an outlier) stops the calculation: the
 * fleet profile should come from runs the employer stands behind.
 */
export function calibrateUmbmarkRuns(
  input: readonly unknown[],
  robot: Pick<DiffDriveRobot, 'wheelRadius' | 'wheelbase'>,
  options: UmbmarkCheckOptions = {},
): UmbmarkCalibration {
  const checked = checkUmbmarkRuns(input, options);
  if (checked.problems.length > 0) return { ok: false, problems: checked.problems };
  return { ok: true, report: umbmarkReport(checked.runs, robot, options.sideLength), problems: [] };
}

/**
 * The CSV upload in one call: {@link umbmarkRunsFromCsvRecords}, then the checks of
 * {@link checkUmbmarkRuns} on the rows that could be read (so a file with a bad cell also
 * hears about a missing run or an outlier), then the report. Problems are ordered by row.
 */
export function calibrateUmbmarkCsv(
  records: readonly CsvRecord[],
  robot: Pick<DiffDriveRobot, 'wheelRadius' | 'wheelbase'>,
  options: UmbmarkCheckOptions & CsvRecordsOptions = {},
): UmbmarkCalibration {
  const read = umbmarkRunsFromCsvRecords(records, options);
  if (read.problems.some((p) => p.row === 1 || p.row === null)) return { ok: false, problems: read.problems };
  const checked = checkUmbmarkRuns(read.runs, options);
  const problems = sortProblems([...read.problems, ...checked.problems]);
  if (problems.length > 0) return { ok: false, problems };
  return { ok: true, report: umbmarkReport(checked.runs, robot, options.sideLength), problems: [] };
}
