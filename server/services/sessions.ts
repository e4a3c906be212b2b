import type { Transaction } from 'sequelize';
import { User } from '../db/models';

/** Signs an account out everywhere: its sessions live in the connect-pg-simple table. */
export async function endSessionsOf(userId: number, transaction?: Transaction) {
  await User.sequelize!.query(`DELETE FROM session WHERE sess->'passport'->>'user' = :userId`, {
    replacements: { userId: String(userId) },
    transaction,
  });
}
