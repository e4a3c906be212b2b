import { describe, expect, it } from 'vitest';
import { formatCredentialNumber, normalizeCredentialNumber } from '@shared/credentials';
import type { BulkCheckRow, CredentialCheck, CredentialView } from '@/api';
import {
  BULK_EXAMPLE_CSV,
  NUMBER_EXAMPLE,
  ROW_OUTCOME_LOOK,
  STATUS_LOOK,
  bulkFileProblem,
  countByStatus,
  describeBulk,
  expiresIn,
  filterCredentials,
  isExpiringSoon,
  readNumberInput,
  resultsFileName,
  revokeReasonProblem,
  rowOutcome,
  summarizeBulk,
  verificationVerdict,
} from '@/components/credentials/credential-logic';

const NOW = new Date('2026-03-01T12:00:00Z');
const DAY = 86_400_000;
const at = (days: number) => new Date(NOW.getTime() + days * DAY).toISOString();

function credential(over: Partial<CredentialView> = {}): CredentialView {
  return {
    id: 1,
    number: formatCredentialNumber('7K2MQ9XD'),
    holderName: 'Åsa Lindqvist',
    userId: 10,
    organizationId: 1,
    organizationName: 'Quillmoor Parcel Depot',
    levelId: 'aisle-operator',
    levelName: 'Aisle operator',
    trials: [],
    issuedAt: at(-300),
    expiresAt: at(400),
    status: 'active',
    revokedAt: null,
    revokeReason: null,
    ...over,
  };
}

function check(over: Partial<CredentialCheck> = {}): CredentialCheck {
  return {
    found: true,
    number: 'DPC-7K2M-Q9XD-7',
    holderName: 'Åsa Lindqvist',
    levelName: 'Aisle operator',
    organizationName: 'Quillmoor Parcel Depot',
    issuedAt: at(-300),
    expiresAt: at(400),
    status: 'active',
    revokedAt: null,
    signatureValid: true,
    ...over,
  };
}

const day = (iso: string) => iso.slice(0, 10);

describe('every status reads in words and has an icon (colour is never the only cue)', () => {
  it('for credentials and for rows of a bulk check', () => {
    for (const look of [...Object.values(STATUS_LOOK), ...Object.values(ROW_OUTCOME_LOOK)]) {
      expect(look.label.length).toBeGreaterThan(2);
      expect(look.icon).toMatch(/^pi pi-[a-z-]+$/);
    }
    // Different meanings never share an icon.
    const icons = Object.values(STATUS_LOOK).map((l) => l.icon);
    expect(new Set(icons).size).toBe(icons.length);
  });
});

describe('the number field', () => {
  it('accepts what people type and gives the printed form', () => {
    expect(readNumberInput('  dpc 7k2m q9xd 7 ')).toEqual({ ok: true, number: 'DPC-7K2M-Q9XD-7' });
    expect(readNumberInput('7K2M-Q9XD-7')).toEqual({ ok: true, number: 'DPC-7K2M-Q9XD-7' });
  });

  it('says at once that a text cannot be a number (wrong check character, length, characters), and asks for one when empty', () => {
    for (const bad of ['DPC-7K2M-Q9XD-8', 'DPC-7K2M-Q9XD', 'hello', 'DPC-7K2M-Q9XD-7-1']) {
      const read = readNumberInput(bad);
      expect(read.ok, bad).toBe(false);
      if (!read.ok) expect(read.message).toMatch(/not a valid credential number/);
    }
    expect(readNumberInput('   ')).toEqual({ ok: false, message: expect.stringMatching(/^Enter the credential number/) });
  });

  it('the example shown in the field is itself well formed', () => {
    expect(normalizeCredentialNumber(NUMBER_EXAMPLE)).toBe(NUMBER_EXAMPLE);
  });
});

describe('what a verification answer means', () => {
  const date = (iso: string) => day(iso);

  it('active and genuine, with its expiry', () => {
    const v = verificationVerdict(check(), date);
    expect(v).toMatchObject({ headline: 'Active and genuine', tone: 'good', doNotRely: false });
    expect(v.detail).toContain(day(at(400)));
  });

  it('expired and revoked name their dates', () => {
    expect(verificationVerdict(check({ status: 'expired', expiresAt: at(-3) }), date)).toMatchObject({ headline: `Expired on ${day(at(-3))}`, doNotRely: true });
    expect(verificationVerdict(check({ status: 'revoked', revokedAt: at(-1) }), date)).toMatchObject({ headline: `Revoked on ${day(at(-1))}`, tone: 'bad', doNotRely: true });
  });

  it('a broken signature or a QR link that is not the one on record outweighs an active status', () => {
    expect(verificationVerdict(check({ signatureValid: false }), date)).toMatchObject({ headline: 'Signature not valid', doNotRely: true });
    expect(verificationVerdict(check({ printedSignatureMatches: false }), date)).toMatchObject({ headline: 'The QR link does not match the record', doNotRely: true });
    expect(verificationVerdict(check({ printedSignatureMatches: true }), date).headline).toBe('Active and genuine');
  });
});

describe('expiry', () => {
  it('expiring soon means active with 60 days or fewer left (as GET /api/credentials?expiringWithinDays=60)', () => {
    expect(isExpiringSoon(credential({ expiresAt: at(59.9) }), NOW)).toBe(true);
    expect(isExpiringSoon(credential({ expiresAt: at(60) }), NOW)).toBe(true);
    expect(isExpiringSoon(credential({ expiresAt: at(60.01) }), NOW)).toBe(false);
    expect(isExpiringSoon(credential({ expiresAt: at(10), status: 'revoked', revokedAt: at(-1) }), NOW)).toBe(false);
    expect(isExpiringSoon(credential({ expiresAt: at(-1), status: 'expired' }), NOW)).toBe(false);
  });

  it('says how long is left in whole days, rounded up', () => {
    expect(expiresIn(at(20), NOW)).toBe('in 20 days');
    expect(expiresIn(at(19.2), NOW)).toBe('in 20 days');
    expect(expiresIn(at(0.5), NOW)).toBe('within a day');
    expect(expiresIn(at(-0.5), NOW)).toBeNull();
  });
});

describe('the credentials list', () => {
  const items = [
    credential({ id: 1 }),
    credential({ id: 2, number: formatCredentialNumber('00000001'), holderName: 'Rune Halvorsen', expiresAt: at(20) }),
    credential({ id: 3, number: formatCredentialNumber('00000002'), holderName: 'Old Timer', status: 'expired', expiresAt: at(-5) }),
    credential({ id: 4, number: formatCredentialNumber('00000003'), holderName: 'Mara Kettle', status: 'revoked', revokedAt: at(-2), levelName: 'Dock approach' }),
  ];
  const ids = (list: CredentialView[]) => list.map((c) => c.id);

  it('filters by status and by expiring soon', () => {
    expect(ids(filterCredentials(items, { status: 'revoked' }, NOW))).toEqual([4]);
    expect(ids(filterCredentials(items, { expiringSoon: true }, NOW))).toEqual([2]);
    expect(ids(filterCredentials(items, {}, NOW))).toEqual([1, 2, 3, 4]);
  });

  it('searches names without regard to case or accents, levels, and numbers as typed', () => {
    expect(ids(filterCredentials(items, { text: 'asa' }, NOW))).toEqual([1]);
    expect(ids(filterCredentials(items, { text: 'DOCK' }, NOW))).toEqual([4]);
    expect(ids(filterCredentials(items, { text: 'dpc 0000 0001 ' + items[1].number.slice(-1).toLowerCase() }, NOW))).toEqual([2]);
    expect(ids(filterCredentials(items, { text: '7k2m' }, NOW))).toEqual([1]);
    expect(ids(filterCredentials(items, { text: 'rune', status: 'expired' }, NOW))).toEqual([]);
  });

  it('counts each status and the ones expiring soon', () => {
    expect(countByStatus(items, NOW)).toEqual({ active: 2, expired: 1, revoked: 1, expiringSoon: 1, total: 4 });
  });
});

describe('revocation reasons', () => {
  it('follow the server rule: 10 to 2000 characters once trimmed', () => {
    expect(revokeReasonProblem('   ')).toBe('Write the reason.');
    expect(revokeReasonProblem('  too short ')).toMatch(/at least 10/); // nine characters once trimmed
    expect(revokeReasonProblem('  exactly10! ')).toBeNull();
    expect(revokeReasonProblem('short')).toMatch(/at least 10/);
    expect(revokeReasonProblem('x'.repeat(2001))).toMatch(/under 2000/);
    expect(revokeReasonProblem('Exam conditions were not met.')).toBeNull();
  });
});

describe('bulk verification', () => {
  const row = (over: Partial<BulkCheckRow> = {}): BulkCheckRow => ({
    line: 2,
    number: 'DPC-7K2M-Q9XD-7',
    name: null,
    found: true,
    status: 'active',
    holderName: 'Åsa Lindqvist',
    levelName: 'Aisle operator',
    expiresAt: at(400),
    nameMatches: null,
    signatureValid: true,
    ...over,
  });
  const notFound = row({ found: false, status: null, holderName: null, levelName: null, expiresAt: null, signatureValid: null });

  it('gives each row one outcome, the most serious first', () => {
    expect(rowOutcome(row())).toBe('valid');
    expect(rowOutcome(row({ name: 'Asa Lindqvist', nameMatches: true }))).toBe('valid');
    expect(rowOutcome(row({ name: 'Someone Else', nameMatches: false }))).toBe('name');
    expect(rowOutcome(row({ status: 'expired', nameMatches: false }))).toBe('expired');
    expect(rowOutcome(row({ status: 'revoked' }))).toBe('revoked');
    expect(rowOutcome(row({ status: 'revoked', signatureValid: false }))).toBe('signature');
    expect(rowOutcome(notFound)).toBe('not_found');
  });

  it('sums up a file', () => {
    const summary = summarizeBulk([row(), row(), notFound, row({ status: 'revoked' })]);
    expect(summary).toMatchObject({ total: 4, valid: 2, not_found: 1, revoked: 1, expired: 0 });
    expect(describeBulk(summary)).toBe('2 valid, 1 not found, 1 revoked');
    expect(describeBulk(summarizeBulk([]))).toBe('no rows');
  });

  it('refuses an empty, too large or non-CSV file before sending it', () => {
    expect(bulkFileProblem({ name: 'numbers.csv', size: 0 })).toMatch(/empty/);
    expect(bulkFileProblem({ name: 'numbers.csv', size: 2 * 1024 * 1024 })).toMatch(/2\.0 MB.*at most 1 MB/);
    expect(bulkFileProblem({ name: 'numbers.xlsx', size: 100 })).toMatch(/CSV/);
    expect(bulkFileProblem({ name: 'Numbers.CSV', size: 1024 * 1024 })).toBeNull();
  });

  it('the example file has the columns the server reads and well-formed numbers', () => {
    const [header, ...lines] = BULK_EXAMPLE_CSV.trim().split(/\r\n/);
    expect(header).toBe('number,name');
    for (const line of lines) expect(normalizeCredentialNumber(line.split(',')[0])).not.toBeNull();
  });

  it('names the download after the uploaded file', () => {
    expect(resultsFileName('HR staff (2026).csv', NOW)).toBe('HR-staff-2026-checked-2026-03-01.csv');
    expect(resultsFileName('.csv', NOW)).toBe('numbers-checked-2026-03-01.csv');
  });
});
