/**
 * Row-level problems of calibration uploads, and the strict number reading used by the CSV
 * adapters.
 * @module
 */

/**
 * One thing wrong with an upload. `row` is the row as the user sees it: for a CSV file the
 * line in the file (the header is row 1); for a list of runs given directly, the run's 1-based
 * position (or its own `row`). `row` is `null` when the problem concerns the whole upload
 * (for example too few runs in one direction). `column` names the CSV column when one is at
 * fault.
 */
export interface RowProblem {
  row: number | null;
  column?: string;
  message: string;
}

/** Orders problems by row (whole-upload problems first), keeping the order within a row. */
export function sortProblems(problems: readonly RowProblem[]): RowProblem[] {
  return problems
    .map((p, i) => ({ p, i }))
    .sort((a, b) => (a.p.row ?? 0) - (b.p.row ?? 0) || a.i - b.i)
    .map(({ p }) => p);
}

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d*,\d+$/;

/** Result of reading one CSV cell as a number. */
export type CellNumber = { ok: true; value: number } | { ok: false; message: string };

/**
 * Reads a CSV cell as a plain decimal number (`-0.125`, `3e-2`, `.5`). Rejects what
 * `Number()` would quietly accept or misread: an empty cell (0), hexadecimal, `Infinity`,
 * units (`0.12m`) and a decimal comma (`0,12`), each with a message that says what to write.
 * `what` names the value for the message, e.g. `x_error (metres)`.
 */
export function readDecimal(cell: string | undefined, what: string): CellNumber {
  const text = (cell ?? '').trim();
  if (text === '') return { ok: false, message: `${what} is empty; write a number.` };
  if (DECIMAL_COMMA.test(text)) {
    return { ok: false, message: `${what} "${text}" uses a decimal comma; write it with a decimal point (${text.replace(',', '.')}).` };
  }
  if (!DECIMAL.test(text)) return { ok: false, message: `${what} "${text}" is not a plain number; write digits with a decimal point and no unit.` };
  const value = Number(text);
  if (!Number.isFinite(value)) return { ok: false, message: `${what} "${text}" is too large to be a measurement.` };
  return { ok: true, value };
}

/**
 * Checks the header of a CSV upload (keys of the records, already trimmed and lower-cased by
 * the reader): every required column present, nothing unknown. Problems are reported on row 1.
 */
export function checkHeader(
  header: readonly string[],
  required: readonly string[],
  optional: readonly string[],
): RowProblem[] {
  const missing = required.filter((c) => !header.includes(c));
  const known = new Set([...required, ...optional]);
  const unknown = header.filter((h) => !known.has(h));
  if (missing.length === 0 && unknown.length === 0) return [];
  const wanted = `${required.join(',')}${optional.length ? ` (optional: ${optional.join(', ')})` : ''}`;
  const parts = [`The header row must name the columns ${wanted}.`];
  if (missing.length) parts.push(`Missing: ${missing.join(', ')}.`);
  if (unknown.length) parts.push(`Not a column we read: ${unknown.join(', ')}.`);
  return [{ row: 1, message: parts.join(' ') }];
}
