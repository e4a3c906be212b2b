/**
 * Exam seats, for now as grants an admin gives an operator. The one function that takes a seat
 * (takeExamSeat) is all the drive code knows; the seats issue replaces it with the organization's
 * paid ledger.
 */
import type { Transaction } from 'sequelize';
import { ExamSeatGrant, User } from '../db/models';
import { HttpError } from '../http/errors';

/** Claims one free seat of the operator for the attempt, or refuses with 402. Safe under races. */
export async function takeExamSeat(userId: number, attemptId: string, transaction: Transaction): Promise<void> {
  const [rows] = (await ExamSeatGrant.sequelize!.query(
    `UPDATE exam_seat_grants SET attempt_id = :attemptId, used_at = now()
     WHERE id = (SELECT id FROM exam_seat_grants WHERE user_id = :userId AND attempt_id IS NULL ORDER BY id LIMIT 1 FOR UPDATE SKIP LOCKED)
     RETURNING id`,
    { replacements: { userId, attemptId }, transaction },
  )) as [{ id: number }[], unknown];
  if (rows.length === 0) throw new HttpError(402, 'no_exam_seat', 'You have no exam seat left. Ask your employer for one, or drive in practice mode.');
}

export async function availableExamSeats(userId: number): Promise<number> {
  return ExamSeatGrant.count({ where: { userId, attemptId: null } });
}

export async function grantExamSeats(userId: number, count: number, grantedBy: number): Promise<number> {
  const user = await User.findByPk(userId);
  if (!user || user.role !== 'operator') {
    throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { userId: 'Exam seats go to operator accounts.' });
  }
  await ExamSeatGrant.bulkCreate(Array.from({ length: count }, () => ({ userId, grantedBy, attemptId: null, usedAt: null })));
  return availableExamSeats(userId);
}

/** Gives the seat of a voided exam attempt back (a technical fault is not the operator's loss). */
export async function returnExamSeat(attemptId: string, transaction: Transaction): Promise<void> {
  await ExamSeatGrant.update({ attemptId: null, usedAt: null }, { where: { attemptId }, transaction });
}
