import { afterAll, beforeEach, describe, expect, it, inject } from 'vitest';
import request from 'supertest';
import { createTestApp, demoEmail, resetRateLimits, signedInAgent } from '../support/api';

const t = createTestApp();
afterAll(() => t.close());
beforeEach(() => resetRateLimits(t.ctx));

const password = () => inject('demoPassword');
const cookieNames = (res: request.Response) => ([] as string[]).concat(res.headers['set-cookie'] ?? []).map((c) => c.split('=')[0]);

describe('sign-in', () => {
  it('signs in a demo account, answers /me, and signs out', async () => {
    const agent = request.agent(t.app);
    const res = await agent.post('/api/auth/sign-in').send({ email: demoEmail('assessor'), password: password() }).expect(200);
    expect(res.body.user).toMatchObject({ email: demoEmail('assessor'), role: 'assessor', organizationId: null, active: true });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    expect(cookieNames(res)).toContain('driftproof.sid');

    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.email).toBe(demoEmail('assessor'));

    await agent.post('/api/auth/sign-out').expect(204);
    const after = await agent.get('/api/auth/me').expect(401);
    expect(after.body.error.code).toBe('unauthenticated');
  });

  it('answers /me with the same account the sign-in returned, organization name included', async () => {
    const agent = request.agent(t.app);
    const signIn = await agent.post('/api/auth/sign-in').send({ email: demoEmail('employer'), password: password() }).expect(200);
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user).toEqual(signIn.body.user);
    expect(me.body.user.organizationName).toMatch(/\(demo\)$/);
    expect(me.body.user.lastSignInAt).not.toBeNull();
  });

  it('accepts the e-mail in any case and with spaces around it', async () => {
    await request(t.app).post('/api/auth/sign-in').send({ email: `  ${demoEmail('hr').toUpperCase()} `, password: password() }).expect(200);
  });

  it('sets an httpOnly, SameSite session cookie and gives a new session id at sign-in', async () => {
    const agent = request.agent(t.app);
    // A session that exists before sign-in (from an earlier, failed sign-in with a stored session) …
    const first = await agent.post('/api/auth/sign-in').send({ email: demoEmail('operator1'), password: password() }).expect(200);
    const cookie = ([] as string[]).concat(first.headers['set-cookie'])[0];
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const sidBefore = cookie.split(';')[0];
    // … is replaced by a fresh id when the user signs in again (session fixation defence).
    const second = await agent.post('/api/auth/sign-in').send({ email: demoEmail('operator1'), password: password() }).expect(200);
    const sidAfter = ([] as string[]).concat(second.headers['set-cookie'])[0].split(';')[0];
    expect(sidAfter).not.toBe(sidBefore);
  });

  it('gives one message for a wrong password and for an unknown e-mail', async () => {
    const wrong = await request(t.app).post('/api/auth/sign-in').send({ email: demoEmail('employer'), password: 'not-the-password' }).expect(401);
    const unknown = await request(t.app).post('/api/auth/sign-in').send({ email: 'nobody@demo.driftproof.test', password: 'not-the-password' }).expect(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error).toEqual({ code: 'invalid_credentials', message: 'That e-mail and password do not match an account.' });
    expect(cookieNames(wrong)).not.toContain('driftproof.sid');
  });

  it('rate-limits repeated failures for one account with a clear message, and a right password does not count', async () => {
    const email = demoEmail('operator2');
    await request(t.app).post('/api/auth/sign-in').send({ email, password: password() }).expect(200);
    for (let i = 0; i < 5; i++) {
      await request(t.app).post('/api/auth/sign-in').send({ email, password: `wrong-${i}-password` }).expect(401);
    }
    const limited = await request(t.app).post('/api/auth/sign-in').send({ email, password: password() }).expect(429);
    expect(limited.body.error.code).toBe('rate_limited');
    expect(limited.body.error.message).toMatch(/Too many failed sign-ins/);
    expect(limited.headers['retry-after']).toBeDefined();
    // Another account from the same address is not locked by these failures.
    await request(t.app).post('/api/auth/sign-in').send({ email: demoEmail('hr'), password: password() }).expect(200);
  });

  it('refuses a deactivated account, and ends its sessions', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const created = await admin.post('/api/users').send({ email: 'leaving.operator@demo.driftproof.test', name: 'Leaving Operator', role: 'operator', organizationId: 1 }).expect(201);
    const id = created.body.user.id;
    await t.ctx.sequelize.query(`UPDATE users SET password_hash = (SELECT password_hash FROM users WHERE email = :email) WHERE id = :id`, {
      replacements: { email: demoEmail('operator1'), id },
    });
    const operator = request.agent(t.app);
    await operator.post('/api/auth/sign-in').send({ email: 'leaving.operator@demo.driftproof.test', password: password() }).expect(200);
    await admin.patch(`/api/users/${id}`).send({ active: false }).expect(200);
    await operator.get('/api/auth/me').expect(401);
    const refused = await request(t.app).post('/api/auth/sign-in').send({ email: 'leaving.operator@demo.driftproof.test', password: password() }).expect(403);
    expect(refused.body.error.code).toBe('account_inactive');
  });
});

describe('health', () => {
  it('reports that the database is up', async () => {
    const res = await request(t.app).get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok', database: 'up' });
  });

  it('answers unknown API paths with a JSON 404', async () => {
    const res = await request(t.app).get('/api/no-such-thing').expect(404);
    expect(res.body.error.code).toBe('not_found');
  });
});
