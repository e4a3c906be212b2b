/**
 * Pure rules of the credential pages: how each status reads (always words and an icon, never
 * colour alone), what a verification answer means for the person holding the certificate, the
 * filters of the credentials list, and the summary of a bulk check.
 */
import { revokeCredentialSchema } from '@shared/schemas';
import { normalizeCredentialNumber } from '@shared/credentials';
import type { BulkCheckRow, CredentialCheck, CredentialStatus, CredentialView } from '@/api';

export const STATUSES: readonly CredentialStatus[] = ['active', 'expired', 'revoked'];

/** The tone picks the colour; the label and the icon carry the meaning on their own. */
export type Tone = 'good' | 'muted' | 'bad' | 'caution';

export interface StatusLook {
  label: string;
  icon: string;
  tone: Tone;
}

export const STATUS_LOOK: Record<CredentialStatus, StatusLook> = {
  active: { label: 'Active', icon: 'pi pi-check-circle', tone: 'good' },
  expired: { label: 'Expired', icon: 'pi pi-history', tone: 'muted' },
  revoked: { label: 'Revoked', icon: 'pi pi-ban', tone: 'bad' },
};

const DAY_MS = 86_400_000;

/** The window of the "expiring soon" filter and lists, in days (as the renewal reminders use). */
export const EXPIRING_SOON_DAYS = 60;

/** Active and expiring within `days` (the same rule as GET /api/credentials?expiringWithinDays). */
export function isExpiringSoon(c: Pick<CredentialView, 'status' | 'expiresAt'>, now: Date = new Date(), days = EXPIRING_SOON_DAYS): boolean {
  if (c.status !== 'active') return false;
  const left = new Date(c.expiresAt).getTime() - now.getTime();
  return left > 0 && left <= days * DAY_MS;
}

/** "in 12 days", "within a day"; null once past (the status then says expired). */
export function expiresIn(iso: string, now: Date = new Date()): string | null {
  const left = new Date(iso).getTime() - now.getTime();
  if (left <= 0) return null;
  const days = Math.ceil(left / DAY_MS);
  return days <= 1 ? 'within a day' : `in ${days} days`;
}

// ---------------------------------------------------------------------------------------
// The number field

export type NumberInput = { ok: true; number: string } | { ok: false; message: string };

/** A well-formed number (its check character is right) that is only an example. */
export const NUMBER_EXAMPLE = 'DPC-7K2M-Q9XD-7';

/**
 * Reads what a person typed, without asking the server: the canonical number, or why it cannot
 * be one. Says nothing about whether the number exists (only the server knows, and it answers
 * "not found" without hints).
 */
export function readNumberInput(raw: string): NumberInput {
  if (raw.trim() === '') return { ok: false, message: 'Enter the credential number printed on the certificate.' };
  const number = normalizeCredentialNumber(raw);
  if (!number) {
    return {
      ok: false,
      message: `That is not a valid credential number. A number looks like ${NUMBER_EXAMPLE}: check each character against the certificate.`,
    };
  }
  return { ok: true, number };
}

// ---------------------------------------------------------------------------------------
// What a verification answer means

export interface VerificationVerdict {
  /** One line, e.g. "Active and genuine". */
  headline: string;
  detail: string;
  icon: string;
  tone: Tone;
  /** The person should not rely on the certificate. */
  doNotRely: boolean;
}

/**
 * The summary at the top of a verification. A broken signature or a QR link whose signature is
 * not the one on record outweighs the status: the certificate in hand is then not trustworthy.
 */
export function verificationVerdict(c: CredentialCheck, formatDate: (iso: string) => string): VerificationVerdict {
  if (!c.signatureValid) {
    return {
      headline: 'Signature not valid',
      detail: 'The record does not match its signature, so Driftproof cannot vouch for it. Do not rely on this credential.',
      icon: 'pi pi-exclamation-triangle',
      tone: 'bad',
      doNotRely: true,
    };
  }
  if (c.printedSignatureMatches === false) {
    return {
      headline: 'The QR link does not match the record',
      detail:
        'The credential number exists, but the signature in the link you opened is not the one Driftproof issued with it. The certificate may have been altered or copied. Do not rely on it.',
      icon: 'pi pi-exclamation-triangle',
      tone: 'bad',
      doNotRely: true,
    };
  }
  if (c.status === 'revoked') {
    return {
      headline: c.revokedAt ? `Revoked on ${formatDate(c.revokedAt)}` : 'Revoked',
      detail: 'Driftproof withdrew this credential. It no longer certifies its holder.',
      icon: STATUS_LOOK.revoked.icon,
      tone: 'bad',
      doNotRely: true,
    };
  }
  if (c.status === 'expired') {
    return {
      headline: `Expired on ${formatDate(c.expiresAt)}`,
      detail: 'This credential was genuine but its validity has ended. Its holder renews it by passing the level again.',
      icon: STATUS_LOOK.expired.icon,
      tone: 'muted',
      doNotRely: true,
    };
  }
  return {
    headline: 'Active and genuine',
    detail: `Issued by Driftproof and valid until ${formatDate(c.expiresAt)}. Compare the holder's name with an identity document.`,
    icon: STATUS_LOOK.active.icon,
    tone: 'good',
    doNotRely: false,
  };
}

// ---------------------------------------------------------------------------------------
// The credentials list

export interface CredentialFilter {
  /** Name, number or level, any case; a typed number is read like the verification field reads it. */
  text?: string;
  status?: CredentialStatus | null;
  expiringSoon?: boolean;
}

const fold = (s: string) => s.normalize('NFD').replace(/\p{M}/gu, '').toLowerCase();

export function filterCredentials(items: readonly CredentialView[], filter: CredentialFilter, now: Date = new Date()): CredentialView[] {
  const text = fold(filter.text?.trim() ?? '');
  const asNumber = text ? normalizeCredentialNumber(text) : null;
  const compact = text.replace(/[\s-]+/g, '');
  return items.filter((c) => {
    if (filter.status && c.status !== filter.status) return false;
    if (filter.expiringSoon && !isExpiringSoon(c, now)) return false;
    if (!text) return true;
    if (asNumber) return c.number === asNumber;
    return (
      fold(c.holderName).includes(text) ||
      fold(c.levelName).includes(text) ||
      (compact.length >= 3 && c.number.replace(/-/g, '').toLowerCase().includes(compact)) ||
      fold(c.organizationName ?? '').includes(text)
    );
  });
}

export type StatusCounts = Record<CredentialStatus, number> & { expiringSoon: number; total: number };

export function countByStatus(items: readonly CredentialView[], now: Date = new Date()): StatusCounts {
  const counts: StatusCounts = { active: 0, expired: 0, revoked: 0, expiringSoon: 0, total: items.length };
  for (const c of items) {
    counts[c.status] += 1;
    if (isExpiringSoon(c, now)) counts.expiringSoon += 1;
  }
  return counts;
}

// ---------------------------------------------------------------------------------------
// Revocation

export const REVOKE_REASON_MIN = 10;
export const REVOKE_REASON_MAX = 2000;

/** The same rule as the server's revoke route: a reason of 10 to 2000 characters once trimmed. */
export function revokeReasonProblem(reason: string): string | null {
  // The same rule the server applies (shared/schemas).
  const parsed = revokeCredentialSchema.safeParse({ reason });
  return parsed.success ? null : parsed.error.issues[0].message;
}

// ---------------------------------------------------------------------------------------
// Bulk verification

export const BULK_MAX_BYTES = 1024 * 1024;
export const BULK_MAX_ROWS = 1000;

/** What can be told about a chosen file before it is sent (the server checks the rest). */
export function bulkFileProblem(file: { name: string; size: number }): string | null {
  if (file.size === 0) return 'That file is empty.';
  if (file.size > BULK_MAX_BYTES) return `That file is ${(file.size / (1024 * 1024)).toFixed(1)} MB; a file of numbers is at most 1 MB.`;
  if (!/\.(csv|txt)$/i.test(file.name)) return 'Choose a CSV file (ending in .csv).';
  return null;
}

export type RowOutcome = 'valid' | 'not_found' | 'expired' | 'revoked' | 'signature' | 'name';

export const ROW_OUTCOME_LOOK: Record<RowOutcome, StatusLook> = {
  valid: { label: 'Valid', icon: 'pi pi-check-circle', tone: 'good' },
  not_found: { label: 'Not found', icon: 'pi pi-question-circle', tone: 'bad' },
  expired: { label: 'Expired', icon: 'pi pi-history', tone: 'muted' },
  revoked: { label: 'Revoked', icon: 'pi pi-ban', tone: 'bad' },
  signature: { label: 'Signature not valid', icon: 'pi pi-exclamation-triangle', tone: 'bad' },
  name: { label: 'Name differs', icon: 'pi pi-user-minus', tone: 'caution' },
};

/** The one thing to know about a row, the most serious first. */
export function rowOutcome(row: BulkCheckRow): RowOutcome {
  if (!row.found) return 'not_found';
  if (row.signatureValid === false) return 'signature';
  if (row.status === 'revoked') return 'revoked';
  if (row.status === 'expired') return 'expired';
  if (row.nameMatches === false) return 'name';
  return 'valid';
}

export type BulkSummary = Record<RowOutcome, number> & { total: number };

export function summarizeBulk(rows: readonly BulkCheckRow[]): BulkSummary {
  const summary: BulkSummary = { valid: 0, not_found: 0, expired: 0, revoked: 0, signature: 0, name: 0, total: rows.length };
  for (const row of rows) summary[rowOutcome(row)] += 1;
  return summary;
}

/** "3 valid, 1 revoked, 2 not found" in the order of ROW_OUTCOME_LOOK, leaving out zeros. */
export function describeBulk(summary: BulkSummary): string {
  const parts = (Object.keys(ROW_OUTCOME_LOOK) as RowOutcome[])
    .filter((k) => summary[k] > 0)
    .map((k) => `${summary[k]} ${ROW_OUTCOME_LOOK[k].label.toLowerCase()}`);
  return parts.length ? parts.join(', ') : 'no rows';
}

/** A small example file to start from. */
export const BULK_EXAMPLE_CSV = `number,name\r\n${NUMBER_EXAMPLE},Åsa Lindqvist\r\nDPC-0000-0000-0,\r\n`;

/** The name the results download gets: the uploaded file's name with "-checked", as CSV. */
export function resultsFileName(uploaded: string, today: Date = new Date()): string {
  const base = uploaded.replace(/\.[^.]*$/, '').replace(/[^\p{L}\p{N}_-]+/gu, '-').replace(/^-+|-+$/g, '') || 'numbers';
  return `${base}-checked-${today.toISOString().slice(0, 10)}.csv`;
}
