/** Employer sign-up: a company creates its organization and first employer account, then confirms the e-mail. */
import { UniqueConstraintError } from 'sequelize';
import type { EmployerSignup, PublicUser } from '../../shared/schemas';
import { hashPassword } from '../auth/passwords';
import type { AppContext } from '../context';
import { Organization, User } from '../db/models';
import { HttpError } from '../http/errors';
import { emailConfirmationEmail } from './emails';
import { INVITATION_HOURS, issuePasswordToken, passwordLink, spendToken } from './password-tokens';
import { JOBS } from '../jobs/queue';

const taken = (field: 'email' | 'organizationName', message: string) => new HttpError(409, `${field === 'email' ? 'email' : 'organization'}_taken`, message, { [field]: message });

export async function signUpEmployer(ctx: AppContext, input: EmployerSignup): Promise<PublicUser> {
  const passwordHash = await hashPassword(input.password, ctx.config.bcryptCost);
  try {
    const user = await ctx.sequelize.transaction(async (transaction) => {
      const organization = await Organization.create({ name: input.organizationName }, { transaction });
      const created = await User.create(
        { email: input.email, name: input.name, role: 'employer', organizationId: organization.id, passwordHash, lastSignInAt: null, emailConfirmedAt: null },
        { transaction },
      );
      await ctx.jobs.send(JOBS.confirmationMail, { userId: created.id }, { transaction });
      created.organization = organization;
      return created;
    });
    return user.toPublic();
  } catch (error) {
    if (error instanceof UniqueConstraintError) {
      const onEmail = Object.keys(error.fields ?? {}).includes('email');
      throw onEmail ? taken('email', 'An account with this e-mail already exists.') : taken('organizationName', 'An organization with this name already exists.');
    }
    throw error;
  }
}

/** Spends the confirmation link and marks the address confirmed. */
export async function confirmEmail(ctx: AppContext, token: string): Promise<void> {
  await ctx.sequelize.transaction(async (transaction) => {
    const userId = await spendToken(token, ['email_confirmation'], transaction);
    await User.update({ emailConfirmedAt: new Date() }, { where: { id: userId }, transaction });
  });
}

/** Queues a new confirmation link for a signed-in employer who has not confirmed yet. */
export async function resendConfirmation(ctx: AppContext, userId: number): Promise<void> {
  await ctx.jobs.send(JOBS.confirmationMail, { userId });
}

/** The job: issues a confirmation link and e-mails it. */
export async function sendConfirmationMail(ctx: AppContext, userId: number): Promise<void> {
  const user = await User.findByPk(userId, { include: [{ model: Organization, as: 'organization' }] });
  if (!user || user.emailConfirmedAt) return;
  const token = await issuePasswordToken(user.id, 'email_confirmation');
  await ctx.mailer.send(emailConfirmationEmail(user.email, user.name, user.organization?.name ?? '', passwordLink(ctx.config.appUrl, token, 'email_confirmation'), INVITATION_HOURS));
}
