/**
 * Reading a calibration upload (UMBmark runs or paired poses) into the records that
 * shared/calibration checks: UTF-8 text, comma-separated, a header row. Everything that stops a
 * file from being read becomes a row problem with the line in the file, so the employer sees
 * the same kind of message for a broken file as for a bad number.
 */
import { parse } from 'csv-parse/sync';
import type { CsvRecord, RowProblem } from '../../shared/calibration';
import { FLEET_MAX_PROBLEMS } from '../../shared/schemas';
import { HttpError } from '../http/errors';

/** Records of a calibration file with the header (trimmed, lower case) and the line of each record. */
export interface CalibrationRecords {
  header: string[];
  records: CsvRecord[];
  rowNumbers: number[];
}

/** The one error of a calibration upload with row problems: 400 `calibration_rows`, at most FLEET_MAX_PROBLEMS listed. */
export function calibrationRowsError(problems: readonly RowProblem[], what: string): HttpError {
  const count = problems.length;
  const listed = count > FLEET_MAX_PROBLEMS ? ` (the first ${FLEET_MAX_PROBLEMS} are listed)` : '';
  const message =
    count === 1
      ? `${what}: ${problems[0].row === null ? '' : `row ${problems[0].row}: `}${problems[0].message} Nothing was saved.`
      : `${what} has ${count} problems${listed}. Nothing was saved; fix them and upload the file again.`;
  return new HttpError(400, 'calibration_rows', message, undefined, { details: { problems: problems.slice(0, FLEET_MAX_PROBLEMS) } });
}

const utf8 = new TextDecoder('utf-8', { fatal: true });

/** The text of an upload, or a problem: not UTF-8, or binary (NUL bytes). */
function textOf(file: Buffer): { text: string } | { problem: RowProblem } {
  let text: string;
  try {
    text = utf8.decode(file);
  } catch {
    return { problem: { row: null, message: 'The file is not a text CSV file (it is not UTF-8 text). Export the data as CSV (comma-separated values).' } };
  }
  if (text.includes('\u0000')) return { problem: { row: null, message: 'The file is not a text CSV file (it contains binary data). Export the data as CSV (comma-separated values).' } };
  if (text.trim() === '') return { problem: { row: null, message: 'The file is empty. It needs a header row and one row per measurement.' } };
  return { text };
}

/**
 * The lines of a text that hold something other than white space: an upper bound on its CSV
 * records, counted without building them (a 5 MB file of one-character lines is 2.6 million
 * records, which would take seconds and gigabytes to parse).
 */
function filledLines(text: string): number {
  let count = 0;
  let filled = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10) {
      if (filled) count++;
      filled = false;
    } else if (!filled && c !== 13 && c !== 32 && c !== 9) filled = true;
  }
  return filled ? count + 1 : count;
}

/**
 * Reads a calibration CSV. Throws `calibration_rows` when the file cannot be read as a table:
 * not text, a quoting error, rows with more or fewer cells than the header, a semicolon-separated
 * file, or more than `maxRows` filled lines under the header (counted before parsing). Cells are trimmed; empty lines are skipped (row numbers stay
 * those of the file).
 */
export function readCalibrationCsv(file: Buffer, what: string, maxRows: number): CalibrationRecords {
  const decoded = textOf(file);
  if ('problem' in decoded) throw calibrationRowsError([decoded.problem], what);
  const underHeader = filledLines(decoded.text) - 1;
  if (underHeader > maxRows) {
    throw calibrationRowsError([{ row: null, message: `The file has ${underHeader.toLocaleString('en')} rows under its header; at most ${maxRows.toLocaleString('en')} are read. Split or thin the log.` }], what);
  }
  let rows: { record: string[]; info: { lines: number } }[];
  try {
    rows = parse(decoded.text, { relax_column_count: true, skip_empty_lines: true, info: true, bom: true, trim: true }) as unknown as typeof rows;
  } catch (error) {
    const line = (error as { lines?: number }).lines;
    const reason = (error as Error).message.replace(/ at line \d+.*$/s, '');
    throw calibrationRowsError([{ row: typeof line === 'number' ? line : null, message: `The file is not a readable CSV here: ${reason}. Check the quotes on this row.` }], what);
  }
  if (rows.length === 0) throw calibrationRowsError([{ row: null, message: 'The file is empty. It needs a header row and one row per measurement.' }], what);
  const [head, ...body] = rows;
  const header = head.record.map((h) => h.trim().toLowerCase());
  if (header.length === 1 && header[0].includes(';')) {
    throw calibrationRowsError(
      [{ row: head.info.lines, message: 'The columns are separated by semicolons. Save the file with commas between columns and decimal points in numbers.' }],
      what,
    );
  }
  const problems: RowProblem[] = [];
  const records: CsvRecord[] = [];
  const rowNumbers: number[] = [];
  for (const { record, info } of body) {
    if (record.length !== header.length) {
      const hint = record.length > header.length ? ' A decimal comma splits a number in two: write numbers with a decimal point.' : '';
      problems.push({ row: info.lines, message: `This row has ${record.length} cells but the header names ${header.length} columns.${hint}` });
      continue;
    }
    records.push(Object.fromEntries(header.map((h, i) => [h, record[i]])));
    rowNumbers.push(info.lines);
  }
  if (problems.length > 0) throw calibrationRowsError(problems, what);
  return { header, records, rowNumbers };
}
