/** Accounts as the admin manages them: a paged list, creation with an invitation, changes. */
import { Op, UniqueConstraintError, type Order, type WhereOptions } from 'sequelize';
import { roleNeedsOrganization, type Page, type PublicUser, type UserCreate, type UserListQuery, type UserUpdate } from '../../shared/schemas';
import type { AppContext } from '../context';
import { Organization, User } from '../db/models';
import { containsPattern } from '../db/like';
import { HttpError, notFound } from '../http/errors';
import { JOBS } from '../jobs/queue';
import { endSessionsOf } from './sessions';

const withOrganization = [{ model: Organization, as: 'organization' }];


export async function listUsers(query: UserListQuery): Promise<Page<PublicUser>> {
  const where: WhereOptions<User> = {};
  if (query.q) Object.assign(where, { [Op.or]: [{ email: { [Op.iLike]: containsPattern(query.q) } }, { name: { [Op.iLike]: containsPattern(query.q) } }] });
  if (query.role) Object.assign(where, { role: query.role });
  if (query.status) Object.assign(where, { active: query.status === 'active' });
  const direction = query.sortOrder === 'desc' ? 'DESC' : 'ASC';
  const order: Order = [[query.sortField, query.sortField === 'lastSignInAt' ? `${direction} NULLS LAST` : direction], ['id', 'ASC']];
  const { rows, count } = await User.findAndCountAll({
    where,
    order,
    include: withOrganization,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { items: rows.map((u) => u.toPublic()), total: count, page: query.page, pageSize: query.pageSize };
}

async function assertOrganizationExists(organizationId: number | null | undefined) {
  if (organizationId == null) return;
  if (!(await Organization.findByPk(organizationId))) {
    throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { organizationId: 'That organization does not exist.' });
  }
}

const emailTaken = () =>
  new HttpError(409, 'email_taken', 'An account with this e-mail already exists.', { email: 'An account with this e-mail already exists.' });

/** Creates an account without a password and queues its invitation e-mail; both or neither. */
export async function createUser(ctx: AppContext, input: UserCreate): Promise<PublicUser> {
  await assertOrganizationExists(input.organizationId);
  try {
    const user = await ctx.sequelize.transaction(async (transaction) => {
      const created = await User.create(
        { email: input.email, name: input.name, role: input.role, organizationId: input.organizationId ?? null, passwordHash: null, lastSignInAt: null },
        { transaction },
      );
      await ctx.jobs.send(JOBS.invitationMail, { userId: created.id }, { transaction });
      return created;
    });
    await user.reload({ include: withOrganization });
    return user.toPublic();
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw emailTaken();
    throw error;
  }
}

/** Changes name, role, organization or active state; an admin cannot demote or deactivate themself. */
export async function updateUser(ctx: AppContext, actorId: number, userId: number, change: UserUpdate): Promise<PublicUser> {
  return ctx.sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('That account');
    if (userId === actorId && ((change.role && change.role !== user.role) || change.active === false)) {
      throw new HttpError(409, 'own_account', 'You cannot change the role of, or deactivate, your own account.');
    }
    const role = change.role ?? user.role;
    const organizationId = change.organizationId !== undefined ? change.organizationId : roleNeedsOrganization(role) ? user.organizationId : null;
    if (roleNeedsOrganization(role) && organizationId == null) {
      throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { organizationId: 'Choose the organization this account belongs to.' });
    }
    await assertOrganizationExists(organizationId);
    const wasActive = user.active;
    await user.update({ name: change.name ?? user.name, role, organizationId, active: change.active ?? user.active }, { transaction });
    if (wasActive && !user.active) await endSessionsOf(user.id, transaction);
    await user.reload({ include: withOrganization, transaction });
    return user.toPublic();
  });
}

export async function listOrganizations() {
  const rows = await Organization.findAll({ order: [['name', 'ASC']] });
  return rows.map((o) => ({ id: o.id, name: o.name }));
}
