import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, demoEmail, resetRateLimits, signedInAgent } from '../support/api';
import { inject } from 'vitest';

const t = createTestApp();
afterAll(() => t.close());
beforeEach(() => resetRateLimits(t.ctx));

describe('CSRF: state changes only from our own origin', () => {
  it('refuses a cross-site POST with the session cookie, and allows the same request from our origin', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const body = { email: 'csrf.victim@demo.driftproof.test', name: 'Csrf Victim', role: 'assessor' };
    const cross = await admin.post('/api/users').set('Origin', 'https://evil.example.test').send(body).expect(403);
    expect(cross.body.error.code).toBe('cross_site');
    await admin.post('/api/users').set('Sec-Fetch-Site', 'cross-site').send(body).expect(403);
    await admin.post('/api/users').set('Origin', 'null').send(body).expect(403);
    const list = await admin.get('/api/users').query({ q: 'csrf.victim' }).expect(200);
    expect(list.body.total).toBe(0);
    await admin.post('/api/users').set('Origin', 'http://127.0.0.1:3999').set('Sec-Fetch-Site', 'same-origin').send(body).expect(201);
    await admin.post('/api/auth/sign-out').set('Origin', 'http://localhost:3999').expect(204);
  });

  it('reads (GET) are not blocked, sign-in from another site is', async () => {
    await request(t.app).get('/api/health').set('Origin', 'https://evil.example.test').expect(200);
    await request(t.app).post('/api/auth/sign-in').set('Origin', 'https://evil.example.test').send({ email: demoEmail('hr'), password: inject('demoPassword') }).expect(403);
  });
});

describe('sessions', () => {
  it('sign-out ends the session on the server: the old cookie no longer works', async () => {
    const agent = await signedInAgent(t.app, 'hr');
    const cookie = agent.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false }).map((c) => c.toValueString()).join('; ');
    await agent.post('/api/auth/sign-out').expect(204);
    await request(t.app).get('/api/auth/me').set('Cookie', cookie).expect(401);
  });

  it('ends a session at the absolute limit from sign-in, however busy', async () => {
    const agent = await signedInAgent(t.app, 'assessor');
    await agent.get('/api/auth/me').expect(200);
    // Thirteen hours ago, as far as the stored session knows.
    await t.ctx.sequelize.query(
      `UPDATE session SET sess = jsonb_set(sess::jsonb, '{signedInAt}', to_jsonb((extract(epoch from now()) * 1000 - 13 * 3600 * 1000)::bigint))::json
       WHERE sess->'passport'->>'user' = (SELECT id::text FROM users WHERE email = :email)`,
      { replacements: { email: demoEmail('assessor') } },
    );
    await agent.get('/api/auth/me').expect(401);
  });

  it('has an idle limit: the cookie and the stored session expire after two idle hours', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: demoEmail('employer'), password: inject('demoPassword') }).expect(200);
    const cookie = ([] as string[]).concat(res.headers['set-cookie'])[0];
    const expires = new Date(/Expires=([^;]+)/.exec(cookie)![1]).getTime();
    expect(Math.round((expires - Date.now()) / 60_000)).toBe(120);
    const agent = request.agent(t.app);
    agent.jar.setCookies([cookie.split(';')[0]]);
    await agent.get('/api/auth/me').expect(200);
    await t.ctx.sequelize.query(`UPDATE session SET expire = now() - interval '1 minute' WHERE sess->'passport'->>'user' = (SELECT id::text FROM users WHERE email = :email)`, {
      replacements: { email: demoEmail('employer') },
    });
    await agent.get('/api/auth/me').expect(401);
  });
});
