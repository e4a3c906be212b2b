/** A credential holder for tests: an operator of the demo organization with passed exam trials and an issued credential. */
import { randomUUID } from 'node:crypto';
import type { AppContext } from '../../server/context';
import { Attempt, AttemptScore, Credential, User } from '../../server/db/models';
import { issueCredentialsFor } from '../../server/services/credentials';

export async function credentialHolder(ctx: AppContext, name: string, now = new Date()): Promise<{ user: User; credential: Credential }> {
  const email = `${randomUUID().slice(0, 8)}@demo.driftproof.test`;
  const user = await User.create({ email, name, role: 'operator', organizationId: 1, passwordHash: null, lastSignInAt: null });
  const credential = await ctx.sequelize.transaction(async (transaction) => {
    for (const trialId of ['long-aisle-run', 'rack-end-slalom']) {
      const attempt = await Attempt.create(
        { id: randomUUID(), userId: user.id, organizationId: 1, trialId, contentHash: ctx.content.trialHashes.get(trialId)!, mode: 'exam', status: 'submitted', secretSeed: 's', publicSeed: 'p', submittedAt: now },
        { transaction },
      );
      await AttemptScore.create(
        { attemptId: attempt.id, version: 'scoring-1', result: {} as never, total: 90, passed: true, flagged: false, reviewStatus: 'confirmed', finalResult: {} as never, finalPassed: true, finalizedAt: now },
        { transaction },
      );
    }
    const issued = await issueCredentialsFor(ctx, user.id, transaction, now);
    if (issued.length !== 1 || issued[0].levelId !== 'aisle-operator') throw new Error('Expected one "aisle-operator" credential');
    return issued[0];
  });
  return { user, credential };
}
