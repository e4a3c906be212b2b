import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { hashPassword } from '../../server/auth/passwords';
import { PasswordToken, User } from '../../server/db/models';
import { startWorkers } from '../../server/jobs/workers';
import { createTestApp, latestMailTo, resetRateLimits, signedInAgent, tokenFrom } from '../support/api';

const t = createTestApp();
beforeAll(() => startWorkers(t.ctx)); // e-mails go out from the job queue
afterAll(() => t.close());
beforeEach(() => resetRateLimits(t.ctx));

const email = 'reset.tester@demo.driftproof.test';
const firstPassword = 'first-password-123';

/** An account set up the way an admin does it: created, invited, password chosen from the link. */
beforeAll(async () => {
  const admin = await signedInAgent(t.app, 'admin');
  const started = new Date();
  await admin.post('/api/users').send({ email, name: 'Reset Tester', role: 'operator', organizationId: 1 }).expect(201);
  const invitation = await latestMailTo(email, started);
  expect(invitation.subject).toBe('Quillmoor Parcel Depot (demo) invites you to Driftproof');
  expect(invitation.textBody).toContain('&invited=1');
  await request(t.app).post('/api/auth/password-reset/confirm').send({ token: tokenFrom(invitation), password: firstPassword }).expect(204);
});

async function requestReset() {
  const started = new Date();
  await request(t.app).post('/api/auth/password-reset').send({ email }).expect(202);
  return tokenFrom(await latestMailTo(email, started));
}

describe('forgotten password', () => {
  it('e-mails a link through the SMTP sink that works once', async () => {
    const token = await requestReset();
    await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'second-password-456' }).expect(204);
    await request(t.app).post('/api/auth/sign-in').send({ email, password: 'second-password-456' }).expect(200);
    await request(t.app).post('/api/auth/sign-in').send({ email, password: firstPassword }).expect(401);

    const again = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'third-password-789' }).expect(400);
    expect(again.body.error.code).toBe('invalid_token');
    await request(t.app).post('/api/auth/sign-in').send({ email, password: 'second-password-456' }).expect(200);
  });

  it('refuses an expired link and leaves the password alone', async () => {
    const token = await requestReset();
    const user = await User.findOne({ where: { email } });
    const hashBefore = user!.passwordHash;
    await PasswordToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { userId: user!.id, usedAt: null } });
    const res = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'expired-link-password' }).expect(400);
    expect(res.body.error.message).toMatch(/used or has expired/);
    await user!.reload();
    expect(user!.passwordHash).toBe(hashBefore);
  });

  it('makes a link expire 30 minutes after it is issued', async () => {
    await requestReset();
    const user = await User.findOne({ where: { email } });
    const token = await PasswordToken.findOne({ where: { userId: user!.id, usedAt: null } });
    const minutes = (token!.expiresAt.getTime() - token!.createdAt.getTime()) / 60_000;
    expect(minutes).toBeCloseTo(30, 0);
  });

  it('spends a token only once under concurrent use', async () => {
    const token = await requestReset();
    const results = await Promise.all(
      ['race-password-aaa', 'race-password-bbb', 'race-password-ccc'].map((password) =>
        request(t.app).post('/api/auth/password-reset/confirm').send({ token, password }),
      ),
    );
    expect(results.map((r) => r.status).sort()).toEqual([204, 400, 400]);
  });

  it('answers the same for an unknown e-mail and sends nothing', async () => {
    const res = await request(t.app).post('/api/auth/password-reset').send({ email: 'ghost@demo.driftproof.test' }).expect(202);
    expect(res.body.message).toBe('If an account exists for that e-mail, a reset link is on its way.');
    // The sink stores a message before it accepts it, so a reply of 202 means any mail is already here.
    await expect(latestMailTo('ghost@demo.driftproof.test', new Date(0), 300)).rejects.toThrow(/No mail/);
  });

  it('ends the sessions of the account when its password is reset', async () => {
    await User.update({ passwordHash: await hashPassword('known-password-000', 4) }, { where: { email } });
    const agent = request.agent(t.app);
    await agent.post('/api/auth/sign-in').send({ email, password: 'known-password-000' }).expect(200);
    await agent.get('/api/auth/me').expect(200);
    const token = await requestReset();
    await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: 'after-reset-password' }).expect(204);
    await agent.get('/api/auth/me').expect(401);
  });

  it('rate-limits reset requests', async () => {
    for (let i = 0; i < 5; i++) await request(t.app).post('/api/auth/password-reset').send({ email: 'ghost@demo.driftproof.test' }).expect(202);
    const res = await request(t.app).post('/api/auth/password-reset').send({ email: 'ghost@demo.driftproof.test' }).expect(429);
    expect(res.body.error.message).toMatch(/Too many password reset requests/);
  });
});
