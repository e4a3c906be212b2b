/** An organization as its employers see it: profile, seats, orders, operators and their progress. */
import { Op, QueryTypes } from 'sequelize';
import type { LevelProgress, OperatorProgress, OrganizationProfile, Page } from '../../shared/schemas';
import type { AppContext } from '../context';
import { containsPattern } from '../db/like';
import { LevelAssignment, Organization, User } from '../db/models';
import { csvCell } from '../http/csv';
import { notFound } from '../http/errors';
import { seatBalance } from './seats';

export async function organizationProfile(organizationId: number): Promise<OrganizationProfile> {
  const org = await Organization.findByPk(organizationId);
  if (!org) throw notFound('That organization');
  return { id: org.id, name: org.name, billingEmail: org.billingEmail ?? null, address: org.address ?? null, seatBalance: await seatBalance(org.id) };
}

export async function updateOrganization(organizationId: number, change: { name?: string; billingEmail?: string | null; address?: string | null }): Promise<OrganizationProfile> {
  const org = await Organization.findByPk(organizationId);
  if (!org) throw notFound('That organization');
  await org.update(change);
  return organizationProfile(organizationId);
}

/** Trials each operator passed in exam mode with a final result, by operator. */
async function passedTrials(ctx: AppContext, userIds: number[]): Promise<Map<number, Set<string>>> {
  if (userIds.length === 0) return new Map();
  const rows = await ctx.sequelize.query<{ user_id: number; trial_id: string }>(
    `SELECT DISTINCT a.user_id, a.trial_id FROM attempts a JOIN attempt_scores s ON s.attempt_id = a.id
     WHERE a.user_id IN (:userIds) AND a.mode = 'exam' AND s.final_passed = true`,
    { replacements: { userIds }, type: QueryTypes.SELECT },
  );
  const out = new Map<number, Set<string>>();
  for (const r of rows) out.set(r.user_id, (out.get(r.user_id) ?? new Set()).add(r.trial_id));
  return out;
}

export async function operatorProgress(ctx: AppContext, organizationId: number, page = 1, pageSize = 50, q?: string): Promise<Page<OperatorProgress>> {
  const where: Record<string, unknown> = { organizationId, role: 'operator' };
  const { rows, count } = await User.findAndCountAll({
    where: q ? { ...where, [Op.or]: [{ name: { [Op.iLike]: containsPattern(q) } }, { email: { [Op.iLike]: containsPattern(q) } }] } : where,
    order: [['name', 'ASC'], ['id', 'ASC']],
    limit: pageSize,
    offset: (page - 1) * pageSize,
  });
  const ids = rows.map((u) => u.id);
  const assignments = await LevelAssignment.findAll({ where: { userId: ids } });
  const passed = await passedTrials(ctx, ids);
  const items = rows.map((u) => {
    const assigned = new Set(assignments.filter((a) => a.userId === u.id).map((a) => a.levelId));
    const done = passed.get(u.id) ?? new Set<string>();
    const levels: LevelProgress[] = ctx.content.levels.map((level) => {
      const trialsPassed = level.requiredTrials.filter((t) => done.has(t)).length;
      return {
        levelId: level.id,
        assigned: assigned.has(level.id),
        trialsPassed,
        trialsRequired: level.requiredTrials.length,
        status: trialsPassed === level.requiredTrials.length ? 'passed' : trialsPassed > 0 ? 'in_progress' : 'not_started',
      };
    });
    return { id: u.id, name: u.name, email: u.email, active: u.active, invited: !u.passwordHash, lastSignInAt: u.lastSignInAt?.toISOString() ?? null, levels };
  });
  return { items, total: count, page, pageSize };
}


/** The operators and their progress as CSV (cells that a spreadsheet would run as formulas are neutralised). */
export async function operatorProgressCsv(ctx: AppContext, organizationId: number): Promise<string> {
  const { items } = await operatorProgress(ctx, organizationId, 1, 100_000);
  const header = ['name', 'email', 'status', ...ctx.content.levels.map((l) => `${l.id}`)];
  const lines = items.map((o) =>
    [o.name, o.email, !o.active ? 'inactive' : o.invited ? 'invited' : 'joined', ...o.levels.map((l) => `${l.assigned ? 'assigned' : 'not assigned'}; ${l.trialsPassed}/${l.trialsRequired} trials; ${l.status}`)]
      .map(csvCell)
      .join(','),
  );
  return [header.join(','), ...lines].join('\r\n') + '\r\n';
}
