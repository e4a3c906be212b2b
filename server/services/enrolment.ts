/**
 * Enrolling operators into an organization: one by one from a form, or many from a CSV roster
 * (preview with per-row errors first; import all or nothing). New operators get an e-mailed,
 * single-use invitation through the job queue, sent only once the import has committed.
 */
import { parse } from 'csv-parse/sync';
import { Op, type Transaction } from 'sequelize';
import { emailSchema, personNameSchema, ROSTER_COLUMNS, ROSTER_MAX_ROWS, type OperatorEnrol, type RosterPreview, type RosterRow } from '../../shared/schemas';
import type { AppContext } from '../context';
import { LevelAssignment, Organization, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { JOBS } from '../jobs/queue';
import { sendInvitation } from './password-tokens';
import { lockOrganization } from './seats';

function checkLevels(ctx: AppContext, levelIds: string[]): string[] {
  const known = new Set(ctx.content.levels.map((l) => l.id));
  return levelIds.filter((id) => !known.has(id)).map((id) => `No level "${id}".`);
}

async function assignLevels(userId: number, levelIds: string[], actorId: number, transaction: Transaction) {
  for (const levelId of new Set(levelIds)) {
    await LevelAssignment.findOrCreate({ where: { userId, levelId }, defaults: { userId, levelId, assignedBy: actorId }, transaction });
  }
}

/** An operator of another organization, or an account that is not an operator, cannot be enrolled here. */
function enrolmentConflict(existing: User, organizationId: number): string | null {
  if (existing.role !== 'operator') return 'This e-mail belongs to an account that is not an operator.';
  if (existing.organizationId !== organizationId) return 'This e-mail belongs to an operator of another organization.';
  return null;
}

export async function enrolOperator(ctx: AppContext, actor: Express.User, organizationId: number, input: OperatorEnrol): Promise<{ id: number; invited: boolean }> {
  const badLevels = checkLevels(ctx, input.levelIds);
  if (badLevels.length) throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { levelIds: badLevels.join(' ') });
  return ctx.sequelize.transaction(async (transaction) => {
    await lockOrganization(organizationId, transaction);
    const existing = await User.findOne({ where: { email: input.email }, transaction });
    if (existing) {
      const conflict = enrolmentConflict(existing, organizationId);
      if (conflict) throw new HttpError(409, 'email_taken', conflict, { email: conflict });
      await assignLevels(existing.id, input.levelIds, actor.id, transaction);
      return { id: existing.id, invited: false };
    }
    const user = await User.create({ email: input.email, name: input.name, role: 'operator', organizationId, passwordHash: null, lastSignInAt: null }, { transaction });
    await assignLevels(user.id, input.levelIds, actor.id, transaction);
    await ctx.jobs.send(JOBS.invitationMail, { userId: user.id }, { transaction });
    return { id: user.id, invited: true };
  });
}

/** Reads a roster file into rows with their errors; writes nothing. */
export async function previewRoster(ctx: AppContext, organizationId: number, file: Buffer): Promise<RosterPreview> {
  let records: Record<string, string>[];
  try {
    records = parse(file, { columns: (header: string[]) => header.map((h) => h.trim().toLowerCase()), skip_empty_lines: true, trim: true, bom: true, relax_column_count: false });
  } catch (error) {
    throw new HttpError(400, 'malformed_csv', `The file is not a readable CSV roster: ${(error as Error).message}`);
  }
  if (records.length === 0) throw new HttpError(400, 'empty_roster', 'The roster has no rows under its header.');
  const header = Object.keys(records[0]);
  const missing = ROSTER_COLUMNS.filter((c) => c !== 'levels' && !header.includes(c));
  const unknown = header.filter((h) => !(ROSTER_COLUMNS as readonly string[]).includes(h));
  if (missing.length || unknown.length) {
    throw new HttpError(
      400,
      'bad_roster_columns',
      `The header must be: email,name,levels (levels optional).${missing.length ? ` Missing: ${missing.join(', ')}.` : ''}${unknown.length ? ` Unknown: ${unknown.join(', ')}.` : ''}`,
    );
  }
  if (records.length > ROSTER_MAX_ROWS) throw new HttpError(400, 'roster_too_long', `A roster has at most ${ROSTER_MAX_ROWS} rows; this one has ${records.length}. Split it into several files.`);

  const emails = records.map((r) => emailSchema.safeParse(r.email ?? ''));
  const existing = new Map(
    (await User.findAll({ where: { email: emails.filter((e) => e.success).map((e) => e.data!) } })).map((u) => [u.email, u]),
  );
  const seen = new Map<string, number>();
  const rows: RosterRow[] = records.map((record, index) => {
    const errors: string[] = [];
    const email = emails[index];
    const name = personNameSchema.safeParse(record.name ?? '');
    if (!email.success) errors.push(email.error.issues[0].message);
    if (!name.success) errors.push(name.error.issues[0].message);
    const levelIds = (record.levels ?? '').split(';').map((l) => l.trim()).filter(Boolean);
    errors.push(...checkLevels(ctx, levelIds));
    const address = email.success ? email.data : (record.email ?? '');
    let status: RosterRow['status'] = 'new';
    const account = existing.get(address);
    if (seen.has(address)) status = 'duplicate';
    else if (account) {
      const conflict = enrolmentConflict(account, organizationId);
      if (conflict) errors.push(conflict);
      status = 'existing';
    }
    if (email.success && !seen.has(address)) seen.set(address, index);
    return { line: index + 2, email: address, name: name.success ? name.data : (record.name ?? ''), levelIds, status, errors };
  });
  const ok = rows.filter((r) => r.errors.length === 0);
  return {
    rows,
    errors: rows.filter((r) => r.errors.length > 0).length,
    toInvite: ok.filter((r) => r.status === 'new').length,
    toUpdate: ok.filter((r) => r.status === 'existing').length,
    duplicates: rows.filter((r) => r.status === 'duplicate').length,
  };
}

/** Imports a roster all or nothing: any row with an error means nothing is written. Duplicate rows merge their levels. */
export async function importRoster(ctx: AppContext, actor: Express.User, organizationId: number, file: Buffer): Promise<RosterPreview> {
  const preview = await previewRoster(ctx, organizationId, file);
  if (preview.errors > 0) {
    throw new HttpError(400, 'roster_has_errors', `${preview.errors} row${preview.errors === 1 ? ' has' : 's have'} errors. Nothing was imported; fix the file and upload it again.`, undefined, {
      preview,
    });
  }
  const levelsByEmail = new Map<string, { name: string; levelIds: string[] }>();
  for (const row of preview.rows) {
    const entry = levelsByEmail.get(row.email) ?? { name: row.name, levelIds: [] };
    entry.levelIds.push(...row.levelIds);
    levelsByEmail.set(row.email, entry);
  }
  await ctx.sequelize.transaction(async (transaction) => {
    await lockOrganization(organizationId, transaction);
    for (const [email, { name, levelIds }] of levelsByEmail) {
      let user = await User.findOne({ where: { email }, transaction });
      if (user && enrolmentConflict(user, organizationId)) throw new HttpError(409, 'email_taken', `${email}: ${enrolmentConflict(user, organizationId)}`);
      if (!user) {
        user = await User.create({ email, name, role: 'operator', organizationId, passwordHash: null, lastSignInAt: null }, { transaction });
        await ctx.jobs.send(JOBS.invitationMail, { userId: user.id }, { transaction });
      }
      await assignLevels(user.id, levelIds, actor.id, transaction);
    }
  });
  return preview;
}

/** The job: e-mails an invitation with a fresh single-use link (an operator's names their organization). */
export async function sendOperatorInvitation(ctx: AppContext, userId: number): Promise<void> {
  const user = await User.findByPk(userId, { include: [{ model: Organization, as: 'organization' }] });
  if (!user || user.passwordHash || !user.active) return;
  await sendInvitation(ctx, user, undefined, user.role === 'operator' ? (user.organization?.name ?? 'Your employer') : undefined);
}

/** Sends a new invitation to an operator of the organization who has not joined yet. */
export async function resendInvitation(ctx: AppContext, organizationId: number, userId: number): Promise<void> {
  const user = await User.findOne({ where: { id: userId, organizationId, role: 'operator' } });
  if (!user) throw notFound('That operator');
  if (user.passwordHash) throw new HttpError(409, 'already_joined', 'This operator has already joined.');
  await ctx.jobs.send(JOBS.invitationMail, { userId });
}

/** Replaces the levels assigned to an operator of the organization. */
export async function setLevels(ctx: AppContext, actor: Express.User, organizationId: number, userId: number, levelIds: string[]): Promise<string[]> {
  const bad = checkLevels(ctx, levelIds);
  if (bad.length) throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { levelIds: bad.join(' ') });
  return ctx.sequelize.transaction(async (transaction) => {
    const user = await User.findOne({ where: { id: userId, organizationId, role: 'operator' }, transaction });
    if (!user) throw notFound('That operator');
    await LevelAssignment.destroy({ where: { userId, levelId: { [Op.notIn]: levelIds.length ? levelIds : [''] } }, transaction });
    await assignLevels(userId, levelIds, actor.id, transaction);
    return [...new Set(levelIds)].sort();
  });
}
