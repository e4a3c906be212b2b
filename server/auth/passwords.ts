import bcrypt from 'bcryptjs';

export const hashPassword = (password: string, cost: number) => bcrypt.hash(password, cost);

// A real hash of a random string: comparing against it when no account matches takes as long as
// a real comparison, so response times do not reveal which e-mails have accounts.
const DUMMY_HASH = bcrypt.hashSync('no-account-has-this-password', 10);

/** Compares a password with a stored hash; without a hash it still spends the time and answers false. */
export async function passwordMatches(password: string, hash: string | null): Promise<boolean> {
  const matches = await bcrypt.compare(password, hash ?? DUMMY_HASH);
  return hash !== null && matches;
}
