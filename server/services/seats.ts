/**
 * Exam seats: an append-only ledger per organization (purchase +n, grant +n, exam start −1, void
 * +1, refund −n); the balance is the sum. Taking a seat locks the organization's row first, so
 * parallel exam starts never spend more seats than there are.
 */
import { QueryTypes, type Transaction } from 'sequelize';
import { Organization, SeatLedgerEntry, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';

export async function seatBalance(organizationId: number, transaction?: Transaction): Promise<number> {
  const [row] = await SeatLedgerEntry.sequelize!.query<{ balance: number }>(
    'SELECT coalesce(sum(delta), 0)::int AS balance FROM seat_ledger WHERE organization_id = :organizationId',
    { replacements: { organizationId }, type: QueryTypes.SELECT, transaction },
  );
  return row.balance;
}

/**
 * Serialises seat changes of one organization. FOR NO KEY UPDATE, not FOR UPDATE: rows inserted in
 * the same transaction that reference the organization take FOR KEY SHARE, which this does not
 * conflict with, so two exam starts queue here instead of deadlocking.
 */
export async function lockOrganization(organizationId: number, transaction: Transaction) {
  const org = await Organization.findByPk(organizationId, { transaction, lock: transaction.LOCK.NO_KEY_UPDATE });
  if (!org) throw notFound('That organization');
  return org;
}

/** Spends one of the organization's seats on an exam attempt, or refuses with 402. */
export async function takeExamSeat(organizationId: number | null, attemptId: string, actorId: number, transaction: Transaction): Promise<void> {
  if (organizationId === null) throw new HttpError(402, 'no_exam_seat', 'Exam drives need an organization with seats.');
  await lockOrganization(organizationId, transaction);
  if ((await seatBalance(organizationId, transaction)) < 1) {
    throw new HttpError(402, 'no_exam_seat', 'Your organization has no exam seat left. Ask your employer to buy seats, or drive in practice mode.');
  }
  await SeatLedgerEntry.create({ organizationId, delta: -1, kind: 'exam_start', attemptId, actorId, orderId: null }, { transaction });
}

/** Gives the seat of a voided exam attempt back to its organization (once). */
export async function returnExamSeat(attemptId: string, transaction: Transaction): Promise<void> {
  const start = await SeatLedgerEntry.findOne({ where: { attemptId, kind: 'exam_start' }, transaction });
  if (!start) return;
  await SeatLedgerEntry.findOrCreate({
    where: { attemptId, kind: 'void_return' },
    defaults: { organizationId: start.organizationId, delta: 1, kind: 'void_return', attemptId, actorId: null, orderId: null },
    transaction,
  });
}

/** Seats an admin gives an organization without payment (demo, goodwill). */
export async function grantSeats(organizationId: number, count: number, actorId: number): Promise<number> {
  return SeatLedgerEntry.sequelize!.transaction(async (transaction) => {
    await lockOrganization(organizationId, transaction);
    await SeatLedgerEntry.create({ organizationId, delta: count, kind: 'grant', actorId, attemptId: null, orderId: null }, { transaction });
    return seatBalance(organizationId, transaction);
  });
}

/** The seats an operator's organization has left. */
export async function availableExamSeats(userId: number): Promise<number> {
  const user = await User.findByPk(userId);
  return user?.organizationId ? seatBalance(user.organizationId) : 0;
}

export async function ledgerOf(organizationId: number, limit = 50) {
  const rows = await SeatLedgerEntry.findAll({ where: { organizationId }, order: [['id', 'DESC']], limit });
  return rows.map((r) => ({ id: Number(r.id), delta: r.delta, kind: r.kind, orderId: r.orderId, attemptId: r.attemptId, createdAt: r.createdAt.toISOString() }));
}

