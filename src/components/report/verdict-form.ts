/**
 * The assessor's verdict form as plain data, and its way to the API: the body is built from the
 * rows the assessor changed, checked with the shared verdictSchema (the same rule the server
 * applies), and every message — the browser's or the server's — is mapped back to the field it
 * belongs to.
 */
import { verdictSchema, type Rubric, type VerdictInput } from '@shared/schemas';
import { applyAmendments, type AttemptScore, type Grade } from '@shared/scoring';

export type VerdictKind = VerdictInput['verdict'];

export interface CallRow {
  callPointId: string;
  label: string;
  /** The grade the scoring engine gave. */
  engineGrade: Grade;
  change: boolean;
  grade: Grade | null;
  reason: string;
}

/** An outcome part the assessor may set: contacts as a count, docking and time as a percentage. */
export interface OutcomeRow {
  change: boolean;
  value: number | null;
  reason: string;
}

export interface VerdictForm {
  verdict: VerdictKind | null;
  /** The overall reason: optional for confirm and amend, required for void. */
  reason: string;
  calls: CallRow[];
  contacts: OutcomeRow;
  /** Docking part, 0–100 %. */
  docking: OutcomeRow;
  /** Time part, 0–100 %. */
  time: OutcomeRow;
}

export type OutcomeKey = 'contacts' | 'docking' | 'time';
export const OUTCOME_KEYS: readonly OutcomeKey[] = ['contacts', 'docking', 'time'];

/** A fresh form for a score: nothing chosen, every row at the engine's value. */
export function emptyVerdictForm(score: AttemptScore): VerdictForm {
  return {
    verdict: null,
    reason: '',
    calls: score.calls.map((c) => ({ callPointId: c.callPointId, label: c.label, engineGrade: c.grade, change: false, grade: null, reason: '' })),
    contacts: { change: false, value: score.outcome.contacts, reason: '' },
    docking: { change: false, value: roundPercent(score.parts.docking), reason: '' },
    time: { change: false, value: roundPercent(score.parts.time), reason: '' },
  };
}

const roundPercent = (share: number) => Math.round(share * 1000) / 10;

/** Field keys: where a message is shown. */
export const fieldKeys = {
  verdict: 'verdict',
  reason: 'reason',
  amendments: 'amendments',
  callGrade: (id: string) => `call:${id}:grade`,
  callReason: (id: string) => `call:${id}:reason`,
  outcomeValue: (key: OutcomeKey) => `${key}:value`,
  outcomeReason: (key: OutcomeKey) => `${key}:reason`,
} as const;

/** Which field each amendment came from, in the order they are sent. */
type Source = { kind: 'call'; id: string } | { kind: OutcomeKey };

function amendmentsOf(form: VerdictForm): { amendments: unknown[]; sources: Source[] } {
  const amendments: unknown[] = [];
  const sources: Source[] = [];
  for (const row of form.calls) {
    if (!row.change) continue;
    amendments.push({ target: 'call', callPointId: row.callPointId, grade: row.grade ?? undefined, reason: row.reason });
    sources.push({ kind: 'call', id: row.callPointId });
  }
  const { contacts, docking, time } = form;
  if (contacts.change) {
    amendments.push({ target: 'contacts', contacts: contacts.value ?? undefined, reason: contacts.reason });
    sources.push({ kind: 'contacts' });
  }
  if (docking.change) {
    amendments.push({ target: 'docking', dockScore: docking.value === null ? undefined : docking.value / 100, reason: docking.reason });
    sources.push({ kind: 'docking' });
  }
  if (time.change) {
    amendments.push({ target: 'time', timeScore: time.value === null ? undefined : time.value / 100, reason: time.reason });
    sources.push({ kind: 'time' });
  }
  return { amendments, sources };
}

/**
 * The request body as the form stands (not yet checked). An empty overall reason is left out
 * (it is optional for confirm and amend; void then fails the check with its own message).
 */
export function verdictBody(form: VerdictForm): Record<string, unknown> {
  const reason = form.reason.trim() ? form.reason : undefined;
  if (form.verdict === 'amend') return { verdict: 'amend', ...(reason !== undefined ? { reason } : {}), amendments: amendmentsOf(form).amendments };
  if (form.verdict === 'void') return { verdict: 'void', reason: form.reason };
  return { verdict: form.verdict ?? undefined, ...(reason !== undefined ? { reason } : {}) };
}

/** The form field a schema path (or the server's dotted field name) points at. */
export function fieldKeyFor(form: VerdictForm, path: readonly (string | number)[]): string {
  const [head, index, leaf] = path;
  if (head === 'amendments' && typeof index === 'number') {
    const source = amendmentsOf(form).sources[index];
    if (!source) return fieldKeys.amendments;
    if (source.kind === 'call') return leaf === 'reason' ? fieldKeys.callReason(source.id) : fieldKeys.callGrade(source.id);
    return leaf === 'reason' ? fieldKeys.outcomeReason(source.kind) : fieldKeys.outcomeValue(source.kind);
  }
  if (head === 'amendments') return fieldKeys.amendments;
  if (head === 'reason') return fieldKeys.reason;
  return fieldKeys.verdict;
}

/** Messages the browser can give before sending, for fields whose schema message would not help. */
function friendlier(key: string, message: string): string {
  if (key === fieldKeys.verdict) return 'Choose confirm, amend or void.';
  if (key.endsWith(':grade')) return 'Choose the new grade.';
  if (key === fieldKeys.outcomeValue('contacts')) return 'Enter the number of contacts: a whole number, 0 or more.';
  if (key === fieldKeys.outcomeValue('docking') || key === fieldKeys.outcomeValue('time')) return 'Enter a percentage from 0 to 100.';
  return message;
}

export type VerdictCheck = { ok: true; body: VerdictInput } | { ok: false; errors: Record<string, string> };

/** Checks the form with the shared verdictSchema; on failure, one message per field. */
export function checkVerdict(form: VerdictForm): VerdictCheck {
  const errors: Record<string, string> = {};
  // A row marked as changed must really change something.
  for (const row of form.calls) {
    if (row.change && row.grade === row.engineGrade) errors[fieldKeys.callGrade(row.callPointId)] = 'Choose a grade other than the engine’s, or leave this call unchanged.';
  }
  const parsed = verdictSchema.safeParse(verdictBody(form));
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = fieldKeyFor(form, issue.path as (string | number)[]);
      errors[key] ??= friendlier(key, issue.message);
    }
  }
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  return { ok: true, body: parsed.data! };
}

/** The server's field errors ("amendments.0.reason") as form field keys. */
export function serverFieldErrors(form: VerdictForm, fields: Record<string, string>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [name, message] of Object.entries(fields)) {
    const path = name.split('.').map((part) => (/^\d+$/.test(part) ? Number(part) : part));
    out[fieldKeyFor(form, path)] ??= message;
  }
  return out;
}

/**
 * What the score would be with the amendments as they stand (rows without a valid value are
 * left out), totalled by the same rule the server uses.
 */
export function previewAmended(form: VerdictForm, score: AttemptScore, rubric: Rubric): AttemptScore {
  const amendments = [];
  for (const row of form.calls) {
    if (row.change && row.grade) amendments.push({ target: 'call' as const, callPointId: row.callPointId, grade: row.grade, reason: '' });
  }
  const { contacts, docking, time } = form;
  if (contacts.change && contacts.value !== null && Number.isInteger(contacts.value) && contacts.value >= 0) {
    amendments.push({ target: 'contacts' as const, contacts: contacts.value, reason: '' });
  }
  const share = (v: number | null) => (v !== null && v >= 0 && v <= 100 ? v / 100 : null);
  const dock = docking.change ? share(docking.value) : null;
  if (dock !== null) amendments.push({ target: 'docking' as const, dockScore: dock, reason: '' });
  const t = time.change ? share(time.value) : null;
  if (t !== null) amendments.push({ target: 'time' as const, timeScore: t, reason: '' });
  return amendments.length ? applyAmendments(score, amendments, rubric) : score;
}
