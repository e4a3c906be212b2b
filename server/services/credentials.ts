/**
 * Credentials: issued when every required trial of a level is passed in exam mode with a final
 * result; numbered and signed; a PDF certificate made by a job; verified by anyone; revoked with
 * a reason; and renewal reminders 60 and 14 days before expiry, each sent once.
 */
import { randomBytes } from 'node:crypto';
import { parse } from 'csv-parse/sync';
import { Op, QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { credentialNumberFrom, credentialStatus, normalizeCredentialNumber, signedCredentialText } from '../../shared/credentials';
import type { AppContext } from '../context';
import { Credential, Organization, User } from '../db/models';
import type { BulkCheckRow, CredentialTrial, CredentialView, Verification } from '../../shared/schemas';
import { escapeHtml } from './mailer';
import { csvCell } from '../http/csv';
import { HttpError, notFound } from '../http/errors';
import { JOBS } from '../jobs/queue';
import { certificatePdf } from './certificates';
import { signatureCode, signatureValid, signText } from './signing';

/** Days before expiry; the nearer one first, so a credential found late gets only the nearer reminder. */
export const REMINDER_DAYS = [14, 60] as const;

const signedText = (c: Credential) =>
  signedCredentialText({ number: c.number, holderName: c.holderName, levelId: c.levelId, issuedAt: c.issuedAt.toISOString(), expiresAt: c.expiresAt.toISOString() });

const levelName = (ctx: AppContext, levelId: string) => ctx.content.levels.find((l) => l.id === levelId)?.name ?? levelId;

export function credentialView(ctx: AppContext, c: Credential & { organization?: Organization | null }, now = new Date()): CredentialView {
  return {
    id: c.id,
    number: c.number,
    holderName: c.holderName,
    userId: c.userId,
    organizationId: c.organizationId,
    organizationName: c.organization?.name ?? null,
    levelId: c.levelId,
    levelName: levelName(ctx, c.levelId),
    trials: c.trials,
    issuedAt: c.issuedAt.toISOString(),
    expiresAt: c.expiresAt.toISOString(),
    status: credentialStatus(c.expiresAt, c.revokedAt, now),
    revokedAt: c.revokedAt?.toISOString() ?? null,
    revokeReason: c.revokeReason,
  };
}

const addMonths = (d: Date, months: number) => {
  const out = new Date(d);
  out.setUTCMonth(out.getUTCMonth() + months);
  return out;
};

/** Issues the credentials a newly final result completes. Runs in the transaction that made the result final. */
export async function issueCredentialsFor(ctx: AppContext, userId: number, transaction: Transaction, now = new Date()): Promise<Credential[]> {
  const passes = await ctx.sequelize.query<{ trial_id: string; attempt_id: string; passed_at: Date }>(
    `SELECT DISTINCT ON (a.trial_id) a.trial_id, a.id AS attempt_id, s.finalized_at AS passed_at
     FROM attempts a JOIN attempt_scores s ON s.attempt_id = a.id
     WHERE a.user_id = :userId AND a.mode = 'exam' AND s.final_passed = true
     ORDER BY a.trial_id, s.finalized_at DESC`,
    { replacements: { userId }, type: QueryTypes.SELECT, transaction },
  );
  const passed = new Map(passes.map((p) => [p.trial_id, p]));
  const user = (await User.findByPk(userId, { transaction }))!;
  const issued: Credential[] = [];
  for (const level of ctx.content.levels) {
    if (!level.requiredTrials.every((t) => passed.has(t))) continue;
    const current = await Credential.findOne({
      where: { userId, levelId: level.id, revokedAt: null, expiresAt: { [Op.gt]: now } },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (current) continue;
    const trials: CredentialTrial[] = level.requiredTrials.map((t) => ({
      trialId: t,
      title: ctx.content.trials.get(t)?.title ?? t,
      attemptId: passed.get(t)!.attempt_id,
      passedAt: new Date(passed.get(t)!.passed_at).toISOString(),
    }));
    const issuedAt = new Date(Math.floor(now.getTime() / 1000) * 1000);
    const expiresAt = addMonths(issuedAt, level.validityMonths);
    for (let tries = 0; ; tries++) {
      const number = credentialNumberFrom(randomBytes(8));
      const signature = await signText(ctx, signedCredentialText({ number, holderName: user.name, levelId: level.id, issuedAt: issuedAt.toISOString(), expiresAt: expiresAt.toISOString() }));
      try {
        const credential = await Credential.create(
          { number, userId, organizationId: user.organizationId, levelId: level.id, holderName: user.name, trials, issuedAt, expiresAt, signature, revokedAt: null, revokedBy: null, revokeReason: null, pdf: null },
          { transaction },
        );
        await ctx.jobs.send(JOBS.credentialPdf, { credentialId: credential.id }, { transaction, singletonKey: `pdf-${credential.id}` });
        issued.push(credential);
        break;
      } catch (error) {
        if (!(error instanceof UniqueConstraintError) || tries > 5) throw error;
      }
    }
  }
  return issued;
}

export function verifyUrl(ctx: AppContext, credential: Credential): string {
  return `${ctx.config.appUrl}/verify/${credential.number}?s=${credential.signature}`;
}

export async function renderCertificate(ctx: AppContext, credential: Credential): Promise<Buffer> {
  const organization = credential.organizationId ? await Organization.findByPk(credential.organizationId) : null;
  return certificatePdf({
    number: credential.number,
    holderName: credential.holderName,
    organizationName: organization?.name ?? null,
    levelName: levelName(ctx, credential.levelId),
    trials: credential.trials,
    issuedAt: credential.issuedAt,
    expiresAt: credential.expiresAt,
    signatureCode: signatureCode(credential.signature),
    verifyUrl: verifyUrl(ctx, credential),
  });
}

/** The job: makes and stores the certificate PDF and e-mails it to the holder. */
export async function makeCertificate(ctx: AppContext, credentialId: number): Promise<void> {
  const credential = await Credential.unscoped().findByPk(credentialId);
  if (!credential) return;
  const pdf = await renderCertificate(ctx, credential);
  await credential.update({ pdf });
  const holder = await User.findByPk(credential.userId);
  if (!holder) return;
  const text = `Congratulations, ${credential.holderName}: you hold the Driftproof credential ${credential.number} for "${levelName(ctx, credential.levelId)}", valid until ${credential.expiresAt.toISOString().slice(0, 10)}. The certificate is attached; anyone can check it at ${verifyUrl(ctx, credential).split('?')[0]}.`;
  await ctx.mailer.send({
    to: holder.email,
    subject: `Your Driftproof credential ${credential.number}`,
    text,
    html: `<p style="font-family:Lato,Arial,sans-serif">${escapeHtml(text)}</p>`,
    attachments: [{ filename: `driftproof-${credential.number}.pdf`, content: pdf, contentType: 'application/pdf' }],
  });
}

/** Who may see a credential in full: the holder, their employer and HR, assessors and admins. */
function canSee(actor: Express.User, c: Credential): boolean {
  if (actor.role === 'admin' || actor.role === 'assessor') return true;
  if (actor.role === 'operator') return c.userId === actor.id;
  return c.organizationId !== null && c.organizationId === actor.organizationId;
}

export async function listCredentials(ctx: AppContext, actor: Express.User, filter: { expiringWithinDays?: number } = {}): Promise<CredentialView[]> {
  const where: Record<string | symbol, unknown> = {};
  if (actor.role === 'operator') where.userId = actor.id;
  else if (actor.role === 'employer' || actor.role === 'hr') where.organizationId = actor.organizationId;
  if (filter.expiringWithinDays !== undefined) {
    where.revokedAt = null;
    where.expiresAt = { [Op.gt]: new Date(), [Op.lte]: new Date(Date.now() + filter.expiringWithinDays * 86_400_000) };
  }
  const rows = await Credential.findAll({ where, include: [{ model: Organization, as: 'organization' }], order: [['issuedAt', 'DESC']], limit: 500 });
  return rows.map((c) => credentialView(ctx, c));
}

export async function credentialPdfFor(ctx: AppContext, actor: Express.User, id: number): Promise<{ number: string; pdf: Buffer }> {
  const credential = await Credential.unscoped().findByPk(id);
  // The certificate itself: its holder, their employer, and admins.
  if (!credential || !canSee(actor, credential) || actor.role === 'assessor' || actor.role === 'hr') throw notFound('That credential');
  const pdf = credential.pdf ?? (await renderCertificate(ctx, credential));
  return { number: credential.number, pdf };
}

/** Public verification. An unknown or malformed number says only "not found". */
export async function verifyCredential(ctx: AppContext, input: string, printedSignature?: string): Promise<Verification> {
  const number = normalizeCredentialNumber(input);
  const credential = number ? await Credential.findOne({ where: { number }, include: [{ model: Organization, as: 'organization' }] }) : null;
  if (!credential) return { found: false };
  const view = credentialView(ctx, credential);
  return {
    found: true,
    number: credential.number,
    holderName: credential.holderName,
    levelName: view.levelName,
    organizationName: view.organizationName,
    issuedAt: view.issuedAt,
    expiresAt: view.expiresAt,
    status: view.status,
    revokedAt: view.revokedAt,
    signatureValid: await signatureValid(ctx, signedText(credential), credential.signature),
    ...(printedSignature ? { printedSignatureMatches: printedSignature === credential.signature } : {}),
  };
}

const foldName = (s: string) => s.normalize('NFD').replace(/\p{M}/gu, '').toLowerCase().replace(/\s+/g, ' ').trim();

export const BULK_MAX_ROWS = 1000;

/** HR bulk verification of a CSV of numbers (column "number", optional column "name"). */
export async function bulkVerify(ctx: AppContext, file: Buffer): Promise<BulkCheckRow[]> {
  let records: Record<string, string>[];
  try {
    records = parse(file, { columns: (h: string[]) => h.map((c) => c.trim().toLowerCase()), skip_empty_lines: true, trim: true, bom: true });
  } catch (error) {
    throw new HttpError(400, 'malformed_csv', `The file is not a readable CSV: ${(error as Error).message}`);
  }
  if (records.length === 0 || !('number' in records[0])) throw new HttpError(400, 'bad_columns', 'The file needs a header with a "number" column (and optionally "name").');
  if (records.length > BULK_MAX_ROWS) throw new HttpError(400, 'too_many_rows', `At most ${BULK_MAX_ROWS} numbers a file.`);
  const results: BulkCheckRow[] = [];
  for (const [i, r] of records.entries()) {
    const v = await verifyCredential(ctx, r.number ?? '');
    const name = r.name ? r.name : null;
    const row = { line: i + 2, number: r.number ?? '', name };
    results.push(
      v.found
        ? { ...row, found: true, status: v.status, holderName: v.holderName, levelName: v.levelName, expiresAt: v.expiresAt, nameMatches: name ? foldName(name) === foldName(v.holderName) : null, signatureValid: v.signatureValid }
        : { ...row, found: false, status: null, holderName: null, levelName: null, expiresAt: null, nameMatches: null, signatureValid: null },
    );
  }
  return results;
}


export function bulkResultsCsv(results: BulkCheckRow[]): string {
  const header = 'line,number,name,found,status,holder_name,level,expires_at,name_matches,signature_valid';
  const rows = results.map((r) =>
    [String(r.line), r.number, r.name ?? '', r.found ? 'yes' : 'no', r.status ?? '', r.holderName ?? '', r.levelName ?? '', r.expiresAt?.slice(0, 10) ?? '', r.nameMatches === null ? '' : r.nameMatches ? 'yes' : 'no', r.signatureValid === null ? '' : r.signatureValid ? 'yes' : 'no']
      .map(csvCell)
      .join(','),
  );
  return [header, ...rows].join('\r\n') + '\r\n';
}

/** Revokes with a reason; the holder and their employers are told by e-mail. */
export async function revokeCredential(ctx: AppContext, actor: Express.User, id: number, reason: string): Promise<CredentialView> {
  return ctx.sequelize.transaction(async (transaction) => {
    const credential = await Credential.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!credential) throw notFound('That credential');
    if (credential.revokedAt) throw new HttpError(409, 'already_revoked', 'This credential is already revoked.');
    await credential.update({ revokedAt: new Date(), revokedBy: actor.id, revokeReason: reason }, { transaction });
    await ctx.jobs.send(JOBS.credentialNotice, { credentialId: id, kind: 'revoked' }, { transaction });
    return credentialView(ctx, credential);
  });
}

/** Holder and employer addresses of a credential. */
async function recipients(credential: Credential): Promise<string[]> {
  const holder = await User.findByPk(credential.userId);
  const employers = credential.organizationId ? await User.findAll({ where: { organizationId: credential.organizationId, role: 'employer', active: true } }) : [];
  return [holder?.email, ...employers.map((e) => e.email)].filter((e): e is string => !!e);
}

/** The job: tells holder and employer about a revocation or an expiry coming up. */
export async function sendCredentialNotice(ctx: AppContext, credentialId: number, kind: 'revoked' | `expires-in-${number}`): Promise<void> {
  const credential = await Credential.findByPk(credentialId);
  if (!credential) return;
  const to = await recipients(credential);
  if (to.length === 0) return;
  const level = levelName(ctx, credential.levelId);
  const text =
    kind === 'revoked'
      ? `The Driftproof credential ${credential.number} of ${credential.holderName} for "${level}" was revoked on ${credential.revokedAt?.toISOString().slice(0, 10)}. Reason: ${credential.revokeReason}`
      : `The Driftproof credential ${credential.number} of ${credential.holderName} for "${level}" expires on ${credential.expiresAt.toISOString().slice(0, 10)}. Renew it by passing the level's exam drives again before then.`;
  await ctx.mailer.send({
    to: to.join(', '),
    subject: kind === 'revoked' ? `Driftproof credential ${credential.number} revoked` : `Driftproof credential ${credential.number} expires on ${credential.expiresAt.toISOString().slice(0, 10)}`,
    text,
    html: `<p style="font-family:Lato,Arial,sans-serif">${escapeHtml(text)}</p>`,
  });
}

/**
 * The scheduled job: for every active credential within 60 (or 14) days of expiry, records the
 * reminder and queues its e-mail. The record's primary key makes each reminder happen once, even
 * if the job runs twice or on two machines. `now` is a parameter so the clock can be controlled.
 */
export async function queueRenewalReminders(ctx: AppContext, now = new Date()): Promise<number> {
  let queued = 0;
  for (const days of REMINDER_DAYS) {
    await ctx.sequelize.transaction(async (transaction) => {
      const due = await ctx.sequelize.query<{ credential_id: number }>(
        `INSERT INTO credential_reminders (credential_id, days_before, sent_at)
         SELECT id, :days, :now FROM credentials
         WHERE revoked_at IS NULL AND expires_at > :now AND expires_at <= :now::timestamptz + make_interval(days => :days)
           AND NOT EXISTS (SELECT 1 FROM credential_reminders r WHERE r.credential_id = credentials.id AND r.days_before <= :days)
         ON CONFLICT DO NOTHING
         RETURNING credential_id`,
        { replacements: { days, now }, type: QueryTypes.SELECT, transaction },
      );
      for (const { credential_id: credentialId } of due) {
        await ctx.jobs.send(JOBS.credentialNotice, { credentialId, kind: `expires-in-${days}` }, { transaction });
        queued += 1;
      }
    });
  }
  return queued;
}
