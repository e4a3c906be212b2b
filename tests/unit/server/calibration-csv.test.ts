import { describe, expect, it } from 'vitest';
import { readCalibrationCsv } from '../../../server/services/calibration-csv';
import type { HttpError } from '../../../server/http/errors';

const WHAT = 'The test file';
const problemsOf = (fn: () => unknown) => {
  try {
    fn();
  } catch (error) {
    return ((error as HttpError).details as { details: { problems: { row: number | null; message: string }[] } }).details.problems;
  }
  throw new Error('expected calibration_rows');
};

describe('reading a calibration CSV', () => {
  it('counts the rows under the header, blank lines and CRLF endings aside, before parsing', () => {
    const ok = readCalibrationCsv(Buffer.from('a,b\r\n1,2\r\n\r\n  \r\n3,4\r\n5,6\r\n\r\n'), WHAT, 3);
    expect(ok.records).toEqual([{ a: '1', b: '2' }, { a: '3', b: '4' }, { a: '5', b: '6' }]);
    expect(ok.rowNumbers).toEqual([2, 5, 6]);
    const problems = problemsOf(() => readCalibrationCsv(Buffer.from('a,b\n1,2\n3,4\n5,6\n7,8'), WHAT, 3));
    expect(problems).toEqual([{ row: null, message: expect.stringMatching(/^The file has 4 rows under its header; at most 3 are read/) }]);
  });

  it('refuses a 5 MB file of one-character lines by its count, without building its 2.6 million records', () => {
    // The last line would stop the parser (an unclosed quote): the count must come first.
    const file = Buffer.from(`${'a\n'.repeat(2_621_440)}"unclosed\n`);
    const problems = problemsOf(() => readCalibrationCsv(file, WHAT, 20_000));
    expect(problems).toEqual([{ row: null, message: expect.stringMatching(/^The file has 2,621,440 rows under its header; at most 20,000/) }]);
  });
});
