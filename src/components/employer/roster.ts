/**
 * The CSV roster on the browser side: the template, checks before uploading, the wording of a
 * preview, and the steps of the page (choose → check → preview → import → done) as a pure reducer.
 */
import { ROSTER_COLUMNS, ROSTER_MAX_BYTES, ROSTER_MAX_ROWS, type RosterPreview, type RosterRow } from '@shared/schemas';

export { ROSTER_COLUMNS, ROSTER_MAX_BYTES, ROSTER_MAX_ROWS };

/** Separates level ids inside the levels column. */
export const LEVEL_SEPARATOR = ';';

/** "2.4 MB", "812 KB", "90 bytes". */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} byte${bytes === 1 ? '' : 's'}`;
  if (bytes < 1024 * 1024) return `${Math.round(bytes / 1024)} KB`;
  const mb = bytes / (1024 * 1024);
  return `${Number.isInteger(mb) ? mb : mb.toFixed(1)} MB`;
}

/** A CSV cell, quoted when it has to be. */
function cell(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * A roster to fill in: the header and two example rows (addresses on the reserved example.com
 * domain), the second with every level id given, so the format is plain to see.
 */
export function rosterTemplate(levelIds: readonly string[]): string {
  const first = levelIds.slice(0, 1).join(LEVEL_SEPARATOR);
  const all = levelIds.join(LEVEL_SEPARATOR);
  const rows = [
    [...ROSTER_COLUMNS],
    ['first.operator@example.com', 'First Operator', first],
    ['second.operator@example.com', 'Second Operator', all],
  ];
  return rows.map((row) => row.map(cell).join(',')).join('\r\n') + '\r\n';
}

/** A message when the file cannot be a roster we accept, before anything is uploaded; null when it may be. */
export function checkRosterFile(file: { name: string; size: number; type?: string }): string | null {
  const csvName = /\.(csv|txt)$/i.test(file.name);
  const csvType = !file.type || /^(text\/(csv|plain)|application\/(vnd\.ms-excel|csv))$/i.test(file.type);
  if (!csvName && !csvType) return `"${file.name}" is not a CSV file. Save the roster as CSV (comma-separated) and choose it again.`;
  if (file.size === 0) return `"${file.name}" is empty.`;
  if (file.size > ROSTER_MAX_BYTES) {
    return `"${file.name}" is ${formatBytes(file.size)}; a roster file is at most ${formatBytes(ROSTER_MAX_BYTES)}. Split it into several files.`;
  }
  return null;
}

/** Operators the import would write: new ones and ones already enrolled (their levels are added). */
export function importCount(preview: RosterPreview): number {
  return preview.toInvite + preview.toUpdate;
}

export function canImport(preview: RosterPreview): boolean {
  return preview.errors === 0 && importCount(preview) > 0;
}

/** "Import 2 operators" */
export function importLabel(preview: RosterPreview): string {
  const n = importCount(preview);
  return `Import ${n} operator${n === 1 ? '' : 's'}`;
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** One sentence that says what the import would do, or why it cannot. */
export function previewSummary(preview: RosterPreview): string {
  const parts = [
    plural(preview.rows.length, 'row', 'rows') + ' read',
    `${preview.toInvite} new to invite`,
    `${preview.toUpdate} already enrolled (levels are added)`,
  ];
  if (preview.duplicates > 0) parts.push(`${plural(preview.duplicates, 'repeated row', 'repeated rows')} (merged with the first)`);
  const summary = `${parts.join(', ')}.`;
  if (preview.errors > 0) {
    return `${summary} ${plural(preview.errors, 'row has', 'rows have')} errors: nothing can be imported until the file is fixed and uploaded again.`;
  }
  if (importCount(preview) === 0) return `${summary} There is nothing to import.`;
  return summary;
}

export const ROW_STATUS_LABELS: Record<RosterRow['status'], string> = {
  new: 'New',
  existing: 'Already enrolled',
  duplicate: 'Repeated row',
};

/** What the import did, in words. */
export function importResultText(result: RosterPreview): string {
  const parts: string[] = [];
  if (result.toInvite > 0) parts.push(`${plural(result.toInvite, 'operator invited', 'operators invited')} (each gets an e-mail with a sign-up link)`);
  if (result.toUpdate > 0) parts.push(`${plural(result.toUpdate, 'enrolled operator', 'enrolled operators')} given the levels of the roster`);
  return `Imported: ${parts.join('; ') || 'nothing to change'}.`;
}

/** Whole percent of an upload, or null while its size is unknown. */
export function uploadPercent(progress: { loaded: number; total: number } | null): number | null {
  if (!progress || progress.total <= 0) return null;
  return Math.min(100, Math.round((progress.loaded / progress.total) * 100));
}

// ---------------------------------------------------------------------------------------
// The steps of the roster section

export type RosterState =
  | { step: 'idle' }
  | { step: 'checking'; fileName: string; percent: number | null }
  | { step: 'previewed'; fileName: string; preview: RosterPreview }
  | { step: 'importing'; fileName: string; preview: RosterPreview; percent: number | null }
  | { step: 'imported'; fileName: string; result: RosterPreview }
  | { step: 'failed'; fileName: string; message: string; preview: RosterPreview | null };

export type RosterEvent =
  | { type: 'choose'; fileName: string }
  | { type: 'progress'; percent: number | null }
  | { type: 'previewed'; preview: RosterPreview }
  | { type: 'import' }
  | { type: 'imported'; result: RosterPreview }
  | { type: 'failed'; message: string; preview?: RosterPreview | null }
  | { type: 'reset' };

export const ROSTER_IDLE: RosterState = { step: 'idle' };

/** The next state; an event that does not fit the current step leaves it unchanged. */
export function rosterReducer(state: RosterState, event: RosterEvent): RosterState {
  switch (event.type) {
    case 'reset':
      return ROSTER_IDLE;
    case 'choose':
      if (state.step === 'checking' || state.step === 'importing') return state;
      return { step: 'checking', fileName: event.fileName, percent: 0 };
    case 'progress':
      if (state.step === 'checking' || state.step === 'importing') return { ...state, percent: event.percent };
      return state;
    case 'previewed':
      if (state.step !== 'checking') return state;
      return { step: 'previewed', fileName: state.fileName, preview: event.preview };
    case 'import':
      if (state.step !== 'previewed' || !canImport(state.preview)) return state;
      return { step: 'importing', fileName: state.fileName, preview: state.preview, percent: 0 };
    case 'imported':
      if (state.step !== 'importing') return state;
      return { step: 'imported', fileName: state.fileName, result: event.result };
    case 'failed':
      if (state.step === 'idle') return { step: 'failed', fileName: '', message: event.message, preview: event.preview ?? null };
      return {
        step: 'failed',
        fileName: state.fileName,
        message: event.message,
        // A refused import keeps the preview it was refused with (the server sends it back).
        preview: event.preview ?? ('preview' in state ? state.preview : null),
      };
  }
}

/** True while an upload is on its way (the file input and buttons wait). */
export function rosterBusy(state: RosterState): boolean {
  return state.step === 'checking' || state.step === 'importing';
}
