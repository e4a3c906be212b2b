import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { ROSTER_COLUMNS, type RosterPreview, type RosterRow } from '@shared/schemas';
import {
  ROSTER_IDLE,
  canImport,
  checkRosterFile,
  formatBytes,
  importLabel,
  importResultText,
  previewSummary,
  rosterBusy,
  rosterReducer,
  rosterTemplate,
  uploadPercent,
  type RosterEvent,
  type RosterState,
} from '@/components/employer/roster';

const LEVELS = ['aisle-operator', 'floor-and-dock', 'drift-judgement'];

function row(line: number, status: RosterRow['status'], errors: string[] = []): RosterRow {
  return { line, email: `p${line}@example.com`, name: `Person ${line}`, levelIds: [], status, errors };
}

function preview(rows: RosterRow[]): RosterPreview {
  const ok = rows.filter((r) => r.errors.length === 0);
  return {
    rows,
    errors: rows.length - ok.length,
    toInvite: ok.filter((r) => r.status === 'new').length,
    toUpdate: ok.filter((r) => r.status === 'existing').length,
    duplicates: rows.filter((r) => r.status === 'duplicate').length,
  };
}

describe('the roster template', () => {
  it('has the documented header and example rows that the server parser reads back', () => {
    const text = rosterTemplate(LEVELS);
    expect(text.split('\r\n')[0]).toBe(ROSTER_COLUMNS.join(','));
    // csv-parse is the parser the server reads rosters with (server/services/enrolment.ts).
    const records = parse(text, { columns: true, skip_empty_lines: true }) as Record<string, string>[];
    expect(records).toEqual([
      { email: 'first.operator@example.com', name: 'First Operator', levels: 'aisle-operator' },
      { email: 'second.operator@example.com', name: 'Second Operator', levels: 'aisle-operator;floor-and-dock;drift-judgement' },
    ]);
  });

  it('still works before the levels are known', () => {
    const records = parse(rosterTemplate([]), { columns: true }) as Record<string, string>[];
    expect(records.map((r) => r.levels)).toEqual(['', '']);
  });
});

describe('checks before uploading', () => {
  it('refuses files that cannot be a roster, with the reason', () => {
    expect(checkRosterFile({ name: 'roster.csv', size: 120, type: 'text/csv' })).toBeNull();
    expect(checkRosterFile({ name: 'ROSTER.CSV', size: 120, type: '' })).toBeNull();
    // Spreadsheet programs on some systems label CSV files as vnd.ms-excel.
    expect(checkRosterFile({ name: 'export', size: 120, type: 'application/vnd.ms-excel' })).toBeNull();
    expect(checkRosterFile({ name: 'roster.xlsx', size: 120, type: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet' })).toMatch(
      /not a CSV file/,
    );
    expect(checkRosterFile({ name: 'empty.csv', size: 0, type: 'text/csv' })).toBe('"empty.csv" is empty.');
    expect(checkRosterFile({ name: 'big.csv', size: 5 * 1024 * 1024 + 1, type: 'text/csv' })).toBe(
      '"big.csv" is 5.0 MB; a roster file is at most 5 MB. Split it into several files.',
    );
    expect(checkRosterFile({ name: 'edge.csv', size: 5 * 1024 * 1024, type: 'text/csv' })).toBeNull();
  });

  it('formats sizes', () => {
    expect(formatBytes(1)).toBe('1 byte');
    expect(formatBytes(900)).toBe('900 bytes');
    expect(formatBytes(2048)).toBe('2 KB');
    expect(formatBytes(5 * 1024 * 1024)).toBe('5 MB');
    expect(formatBytes(2.45 * 1024 * 1024)).toBe('2.5 MB');
  });
});

describe('the preview in words', () => {
  it('offers the import of new and enrolled operators when no row has an error', () => {
    const p = preview([row(2, 'new'), row(3, 'existing'), row(4, 'duplicate')]);
    expect(canImport(p)).toBe(true);
    expect(importLabel(p)).toBe('Import 2 operators');
    expect(previewSummary(p)).toBe('3 rows read, 1 new to invite, 1 already enrolled (levels are added), 1 repeated row (merged with the first).');
  });

  it('blocks the import while any row has an error', () => {
    const p = preview([row(2, 'new'), row(3, 'new', ['Enter a valid e-mail address.']), row(4, 'new', ['No level "x".'])]);
    expect(canImport(p)).toBe(false);
    expect(importLabel(p)).toBe('Import 1 operator');
    expect(previewSummary(p)).toMatch(/2 rows have errors: nothing can be imported until the file is fixed/);
  });

  it('has nothing to import when every row repeats', () => {
    const p = { ...preview([row(2, 'duplicate')]), toInvite: 0 };
    expect(canImport(p)).toBe(false);
    expect(previewSummary(p)).toMatch(/There is nothing to import\.$/);
  });

  it('says what the import did', () => {
    expect(importResultText(preview([row(2, 'new'), row(3, 'new')]))).toBe(
      'Imported: 2 operators invited (each gets an e-mail with a sign-up link).',
    );
    expect(importResultText(preview([row(2, 'existing')]))).toBe('Imported: 1 enrolled operator given the levels of the roster.');
  });

  it('turns upload progress into a percentage, unknown while the size is', () => {
    expect(uploadPercent(null)).toBeNull();
    expect(uploadPercent({ loaded: 10, total: 0 })).toBeNull();
    expect(uploadPercent({ loaded: 512, total: 1024 })).toBe(50);
    expect(uploadPercent({ loaded: 2000, total: 1024 })).toBe(100);
  });
});

describe('the steps of the roster section', () => {
  const run = (events: RosterEvent[], from: RosterState = ROSTER_IDLE) => events.reduce(rosterReducer, from);
  const good = preview([row(2, 'new'), row(3, 'new')]);
  const bad = preview([row(2, 'new'), row(3, 'new', ['Enter a name.'])]);

  it('goes choose → check → preview → import → done', () => {
    let state = run([{ type: 'choose', fileName: 'r.csv' }]);
    expect(state).toEqual({ step: 'checking', fileName: 'r.csv', percent: 0 });
    expect(rosterBusy(state)).toBe(true);
    state = run([{ type: 'progress', percent: 60 }], state);
    expect(state).toMatchObject({ step: 'checking', percent: 60 });
    state = run([{ type: 'previewed', preview: good }], state);
    expect(state).toEqual({ step: 'previewed', fileName: 'r.csv', preview: good });
    expect(rosterBusy(state)).toBe(false);
    state = run([{ type: 'import' }, { type: 'progress', percent: null }], state);
    expect(state).toEqual({ step: 'importing', fileName: 'r.csv', preview: good, percent: null });
    state = run([{ type: 'imported', result: good }], state);
    expect(state).toEqual({ step: 'imported', fileName: 'r.csv', result: good });
    expect(run([{ type: 'reset' }], state)).toBe(ROSTER_IDLE);
  });

  it('does not import a preview with errors', () => {
    const state = run([{ type: 'choose', fileName: 'r.csv' }, { type: 'previewed', preview: bad }, { type: 'import' }]);
    expect(state.step).toBe('previewed');
  });

  it('keeps the preview when the import is refused, and takes the one the server sends back', () => {
    const refused = run([
      { type: 'choose', fileName: 'r.csv' },
      { type: 'previewed', preview: good },
      { type: 'import' },
      { type: 'failed', message: 'Nothing was imported.', preview: bad },
    ]);
    expect(refused).toEqual({ step: 'failed', fileName: 'r.csv', message: 'Nothing was imported.', preview: bad });
    const offline = run([{ type: 'choose', fileName: 'r.csv' }, { type: 'previewed', preview: good }, { type: 'import' }, { type: 'failed', message: 'offline' }]);
    expect(offline).toMatchObject({ step: 'failed', preview: good });
  });

  it('ignores events that do not fit the step', () => {
    const checking = run([{ type: 'choose', fileName: 'a.csv' }]);
    expect(run([{ type: 'choose', fileName: 'b.csv' }], checking)).toBe(checking);
    expect(run([{ type: 'imported', result: good }], checking)).toBe(checking);
    expect(run([{ type: 'previewed', preview: good }])).toBe(ROSTER_IDLE);
    expect(run([{ type: 'progress', percent: 5 }])).toBe(ROSTER_IDLE);
    // A file refused before upload fails from idle, with no preview.
    expect(run([{ type: 'failed', message: 'too big' }])).toEqual({ step: 'failed', fileName: '', message: 'too big', preview: null });
  });
});
