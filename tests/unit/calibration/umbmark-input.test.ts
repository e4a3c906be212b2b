import { describe, expect, it } from 'vitest';
import { createRng } from '../../../shared/motion/index';
import {
  calibrateUmbmarkCsv,
  calibrateUmbmarkRuns,
  checkUmbmarkRuns,
  readDecimal,
  umbmarkRunsFromCsvRecords,
  type UmbmarkRun,
} from '../../../shared/calibration/index';

// Source of the rules checked here: our own upload rules as stated in
// shared/calibration/umbmark-runs.ts and README.md (5 runs each way as Borenstein & Feng 1996
// prescribe; the outlier rule; CSV rows numbered as in the file, header = row 1).

const tugger = { wheelRadius: 0.1, wheelbase: 0.5 };

/** A clean upload: 5 runs each way scattered by about 1 cm around two centres. */
function cleanRecords(): Record<string, string>[] {
  const cw = [
    ['-0.152', '-0.201', '0.061'],
    ['-0.141', '-0.188', '0.058'],
    ['-0.160', '-0.195', '0.064'],
    ['-0.148', '-0.210', '0.060'],
    ['-0.155', '-0.199', '0.059'],
  ];
  const ccw = [
    ['-0.051', '0.102', '-0.031'],
    ['-0.060', '0.110', '-0.029'],
    ['-0.044', '0.095', '-0.033'],
    ['-0.057', '0.104', '-0.030'],
    ['-0.049', '0.099', '-0.032'],
  ];
  return [
    ...cw.map(([x, y, h]) => ({ direction: 'cw', x_error: x, y_error: y, heading_error: h })),
    ...ccw.map(([x, y, h]) => ({ direction: 'ccw', x_error: x, y_error: y, heading_error: h })),
  ];
}

describe('UMBmark CSV upload: row-level messages', () => {
  it('a clean file gives a report and no problems', () => {
    const result = calibrateUmbmarkCsv(cleanRecords(), tugger);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.report.runs.cw.map((r) => r.row)).toEqual([2, 3, 4, 5, 6]);
    expect(result.report.runs.ccw.map((r) => r.row)).toEqual([7, 8, 9, 10, 11]);
    expect(result.report.heading).not.toBeNull();
  });

  it('names the bad rows as in the file (header = row 1) and the column at fault', () => {
    const records = cleanRecords();
    records[1] = { ...records[1], direction: '' }; // file row 3
    records[3] = { ...records[3], x_error: 'abc' }; // row 5
    records[6] = { ...records[6], y_error: '0,104' }; // row 8: decimal comma
    records[7] = { ...records[7], x_error: '0.05m' }; // row 9: a unit
    records[8] = { ...records[8], direction: 'left' }; // row 10
    records[9] = { ...records[9], heading_error: 'NaN' }; // row 11
    const result = calibrateUmbmarkCsv(records, tugger);
    expect(result.ok).toBe(false);
    const rows = result.problems.map((p) => [p.row, p.column]);
    expect(rows).toEqual(
      expect.arrayContaining([
        [3, 'direction'],
        [5, 'x_error'],
        [8, 'y_error'],
        [9, 'x_error'],
        [10, 'direction'],
        [11, 'heading_error'],
      ]),
    );
    const message = (row: number): string => result.problems.find((p) => p.row === row)!.message;
    expect(message(3)).toMatch(/direction is empty.*cw.*ccw/);
    expect(message(5)).toMatch(/"abc" is not a plain number/);
    expect(message(8)).toMatch(/decimal comma.*0\.104/);
    expect(message(9)).toMatch(/no unit/);
    expect(message(10)).toMatch(/"left" is neither cw nor ccw/);
    // Two cw and four ccw rows are unusable: both directions now have too few runs.
    const whole = result.problems.filter((p) => p.row === null).map((p) => p.message);
    expect(whole).toHaveLength(2);
    expect(whole[0]).toMatch(/Only 3 usable clockwise \(cw\) runs.*at least 5/);
    expect(whole[1]).toMatch(/Only 1 usable counter-clockwise \(ccw\) run;/);
    // Problems come in file order, whole-file ones first.
    const numbered = result.problems.map((p) => p.row ?? 0);
    expect([...numbered].sort((a, b) => a - b)).toEqual(numbered);
  });

  it('uses the reader’s own line numbers when given (blank lines skipped)', () => {
    const records = cleanRecords();
    records[4] = { ...records[4], y_error: '' };
    const rowNumbers = records.map((_, i) => i + 2 + (i >= 3 ? 2 : 0));
    const result = calibrateUmbmarkCsv(records, tugger, { rowNumbers });
    expect(result.problems.find((p) => p.column === 'y_error')?.row).toBe(8);
  });

  it('reads direction words in any case; an empty heading cell means no heading', () => {
    const records = cleanRecords().map((r, i): Record<string, string> => ({
      ...r,
      direction: i < 5 ? ['CW', 'Clockwise', 'cw ', 'clockwise', 'cw'][i] : ['CCW', 'Counter-Clockwise', 'anticlockwise', 'counterclockwise', 'Anti-clockwise'][i - 5],
    }));
    records[0].heading_error = '';
    const read = umbmarkRunsFromCsvRecords(records);
    expect(read.problems).toEqual([]);
    expect(read.runs.filter((r) => r.direction === 'cw')).toHaveLength(5);
    expect(read.runs[0].heading).toBeUndefined();
    const result = calibrateUmbmarkCsv(records, tugger);
    expect(result.ok && result.report.heading).toBeNull();
  });

  it('rejects a wrong header on row 1 and reads no further', () => {
    const missing = calibrateUmbmarkCsv([{ direction: 'cw', x: '0.1', y_error: '0.1' }], tugger);
    expect(missing.ok).toBe(false);
    expect(missing.problems).toHaveLength(1);
    expect(missing.problems[0].row).toBe(1);
    expect(missing.problems[0].message).toMatch(/Missing: x_error\..*Not a column we read: x\./);
    const empty = calibrateUmbmarkCsv([], tugger, { header: ['direction', 'x_error', 'y_error'] });
    expect(empty.problems).toEqual([{ row: null, message: 'The file has no runs under its header row.' }]);
  });

  it('flags values in the wrong unit: a return error beyond the square’s side, a heading in degrees', () => {
    const records = cleanRecords();
    records[2] = { ...records[2], x_error: '-160', y_error: '-195' }; // millimetres, row 4
    records[6] = { ...records[6], heading_error: '-1.7' }; // degrees, row 8
    const result = calibrateUmbmarkCsv(records, tugger);
    expect(result.ok).toBe(false);
    expect(result.problems.find((p) => p.row === 4)?.message).toMatch(/more than the square's side.*check the units/);
    expect(result.problems.find((p) => p.row === 8)?.message).toMatch(/radians: check the units/);
  });

  it('flags an outlying run by the stated rule, naming its row', () => {
    const records = cleanRecords();
    records[8] = { ...records[8], x_error: '0.250' }; // ccw run 30 cm from the others, row 10
    const result = calibrateUmbmarkCsv(records, tugger);
    expect(result.ok).toBe(false);
    expect(result.problems).toHaveLength(1);
    expect(result.problems[0].row).toBe(10);
    expect(result.problems[0].message).toMatch(/counter-clockwise run ends 0\.29\d m from the middle.*more than 6 ×/);
    // The floor: runs that agree to the millimetre do not make a 1.5 cm difference an outlier.
    const tight = cleanRecords().map((r) => ({ ...r, x_error: r.direction === 'cw' ? '-0.150' : '-0.050', y_error: r.direction === 'cw' ? '-0.200' : '0.100' }));
    tight[0] = { ...tight[0], x_error: '-0.165' };
    expect(calibrateUmbmarkCsv(tight, tugger).ok).toBe(true);
    tight[0] = { ...tight[0], x_error: '-0.175' };
    expect(calibrateUmbmarkCsv(tight, tugger).problems[0]?.row).toBe(2);
  });
});

describe('UMBmark runs given as data', () => {
  it('rejects missing directions, non-finite and non-number values, each on its row', () => {
    const runs: unknown[] = [
      { direction: 'cw', x: 0.1, y: 0.2 },
      { x: 0.1, y: 0.2 },
      { direction: 'cw', x: Number.NaN, y: 0.2 },
      { direction: 'cw', x: 0.1, y: Infinity },
      { direction: 'ccw', x: '0.1', y: 0.2 },
      { direction: 'ccw', x: 0.1, y: 0.2, heading: Number.NaN },
      null,
    ];
    const check = checkUmbmarkRuns(runs);
    const byRow = (row: number): string[] => check.problems.filter((p) => p.row === row).map((p) => p.message);
    expect(byRow(1)).toEqual([]);
    expect(byRow(2)[0]).toMatch(/direction is missing/);
    expect(byRow(3)[0]).toMatch(/x error must be a finite number of metres, not null/);
    expect(byRow(4)[0]).toMatch(/y error must be a finite number of metres, not null/);
    expect(byRow(5)[0]).toMatch(/x error must be a finite number of metres, not "0.1"/);
    expect(byRow(6)[0]).toMatch(/heading error must be a finite number of radians/);
    expect(byRow(7)[0]).toMatch(/not a record/);
    expect(check.runs).toHaveLength(1);
    expect(calibrateUmbmarkRuns(runs, tugger).ok).toBe(false);
  });

  it('asks for 5 runs each way, or the number set in the options', () => {
    const four: UmbmarkRun[] = [0, 1, 2, 3].flatMap((k) => [
      { direction: 'cw' as const, x: -0.1 + 0.01 * k, y: -0.2 },
      { direction: 'ccw' as const, x: -0.05, y: 0.1 + 0.01 * k },
    ]);
    const strict = checkUmbmarkRuns(four);
    expect(strict.problems.map((p) => p.row)).toEqual([null, null]);
    expect(checkUmbmarkRuns(four, { minRunsPerDirection: 4 }).problems).toEqual([]);
    expect(checkUmbmarkRuns(four.filter((r) => r.direction === 'cw')).problems.map((p) => p.message)).toEqual([
      expect.stringMatching(/^Only 4 usable clockwise/),
      expect.stringMatching(/^No usable counter-clockwise \(ccw\) runs; .* at least 5/),
    ]);
  });

  it('the outlier rule flags about 1 clean upload in 200 and nearly every run shifted by 12 standard deviations (simulated)', () => {
    const rng = createRng('outlier-rule');
    const sigma = 0.03; // 3 cm of scatter: the 2 cm floor rarely matters
    const upload = (shift: number): UmbmarkRun[] =>
      (['cw', 'ccw'] as const).flatMap((direction, d) =>
        [0, 1, 2, 3, 4].map((k) => ({
          direction,
          x: (d ? -0.05 : -0.15) + sigma * rng.normal() + (d === 0 && k === 0 ? shift : 0),
          y: (d ? 0.1 : -0.2) + sigma * rng.normal(),
          row: 2 + 5 * d + k,
        })),
      );
    let falseAlarms = 0;
    let caught = 0;
    const trials = 2000;
    for (let t = 0; t < trials; t++) {
      if (checkUmbmarkRuns(upload(0)).problems.length > 0) falseAlarms++;
      if (checkUmbmarkRuns(upload(12 * sigma)).problems.some((p) => p.row === 2)) caught++;
    }
    expect(falseAlarms / trials).toBeLessThan(0.015);
    expect(caught / trials).toBeGreaterThan(0.95);
  });
});

describe('readDecimal', () => {
  it('accepts plain decimals and rejects what Number() would misread', () => {
    expect(readDecimal(' -0.125 ', 'v')).toEqual({ ok: true, value: -0.125 });
    expect(readDecimal('3e-2', 'v')).toEqual({ ok: true, value: 0.03 });
    expect(readDecimal('.5', 'v')).toEqual({ ok: true, value: 0.5 });
    for (const bad of ['', '   ', '0x10', 'Infinity', '1e999', '1,5', '12 cm', '--1', '1.2.3']) {
      expect(readDecimal(bad, 'v').ok).toBe(false);
    }
  });
});
