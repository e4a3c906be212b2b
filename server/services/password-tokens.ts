/**
 * One-time links to choose a password: a forgotten-password reset or an invitation to a new
 * account. The raw token only travels in the e-mail; the database keeps its SHA-256 hash.
 * Using a token is one atomic UPDATE, so a link works once even under concurrent clicks.
 */
import { createHash, randomBytes } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { hashPassword } from '../auth/passwords';
import type { AppContext } from '../context';
import { PasswordToken, User } from '../db/models';
import type { PasswordTokenPurpose } from '../db/models/password-token';
import { HttpError } from '../http/errors';
import { invitationEmail, operatorInvitationEmail, passwordResetEmail } from './emails';
import { endSessionsOf } from './sessions';
import { JOBS } from '../jobs/queue';

export const RESET_MINUTES = 30;
export const INVITATION_HOURS = 72;

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** Issues a token (and retires the user's earlier unused ones of the same purpose). */
export async function issuePasswordToken(userId: number, purpose: PasswordTokenPurpose, transaction?: Transaction): Promise<string> {
  const token = randomBytes(32).toString('base64url');
  const ttlMs = purpose === 'reset' ? RESET_MINUTES * 60_000 : INVITATION_HOURS * 3_600_000; // invitations and e-mail confirmations
  await PasswordToken.update({ usedAt: new Date() }, { where: { userId, purpose, usedAt: null }, transaction });
  await PasswordToken.create({ userId, purpose, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + ttlMs), usedAt: null }, { transaction });
  return token;
}

export const passwordLink = (appUrl: string, token: string, purpose: PasswordTokenPurpose) =>
  purpose === 'email_confirmation' ? `${appUrl}/confirm-email?token=${token}` : `${appUrl}/reset-password?token=${token}${purpose === 'invitation' ? '&invited=1' : ''}`;

/** Spends a token of the given purpose; returns its user id, or throws the invalid-link error. */
export async function spendToken(token: string, purposes: PasswordTokenPurpose[], transaction: Transaction): Promise<number> {
  const [count, spent] = await PasswordToken.update(
    { usedAt: new Date() },
    { where: { tokenHash: hashToken(token), purpose: purposes, usedAt: null, expiresAt: { [Op.gt]: new Date() } }, returning: true, transaction },
  );
  if (count !== 1) throw new HttpError(400, 'invalid_token', INVALID_TOKEN_MESSAGE);
  return spent[0].userId;
}

/**
 * Queues a reset link when an active account has this e-mail; says nothing either way. The e-mail
 * goes out from the job queue, so the answer takes as long whether or not the account exists, and
 * a mail server that is down only delays it.
 */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const user = await User.findOne({ where: { email, active: true } });
  if (user) await ctx.jobs.send(JOBS.resetMail, { userId: user.id });
}

/** The job: issues a fresh reset link and e-mails it. */
export async function sendResetMail({ config, mailer }: AppContext, userId: number): Promise<void> {
  const user = await User.findOne({ where: { id: userId, active: true } });
  if (!user) return;
  const token = await issuePasswordToken(user.id, 'reset');
  await mailer.send(passwordResetEmail(user.email, user.name, passwordLink(config.appUrl, token, 'reset'), RESET_MINUTES));
}

export const INVALID_TOKEN_MESSAGE = 'This link has already been used or has expired. Ask for a new one.';

/** Sets a new password from a token: the token is spent, and every session of the account ends. */
export async function confirmPasswordReset({ config, sequelize }: AppContext, token: string, password: string): Promise<void> {
  const passwordHash = await hashPassword(password, config.bcryptCost);
  await sequelize.transaction(async (transaction) => {
    const userId = await spendToken(token, ['reset', 'invitation'], transaction);
    // Following an e-mailed link also proves the address.
    const [updated] = await User.update({ passwordHash, emailConfirmedAt: new Date() }, { where: { id: userId, active: true }, transaction });
    if (updated !== 1) throw new HttpError(400, 'invalid_token', INVALID_TOKEN_MESSAGE);
    await PasswordToken.update({ usedAt: new Date() }, { where: { userId, usedAt: null }, transaction });
    await endSessionsOf(userId, transaction);
  });
}

export async function sendInvitation({ config, mailer }: AppContext, user: User, transaction?: Transaction, organizationName?: string) {
  const token = await issuePasswordToken(user.id, 'invitation', transaction);
  const link = passwordLink(config.appUrl, token, 'invitation');
  await mailer.send(
    organizationName ? operatorInvitationEmail(user.email, user.name, organizationName, link, INVITATION_HOURS) : invitationEmail(user.email, user.name, link, INVITATION_HOURS),
  );
}
