import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, signedInAgent } from '../support/api';

const t = createTestApp();
afterAll(() => t.close());

const adminRoutes: Array<[method: 'get' | 'post' | 'patch', path: string]> = [
  ['get', '/api/users'],
  ['post', '/api/users'],
  ['patch', '/api/users/1'],
  ['get', '/api/organizations'],
  ['get', '/api/mail-messages'],
  ['get', '/api/mail-messages/1'],
];

describe('role guards on admin routes', () => {
  it.each(adminRoutes)('anonymous %s %s gets 401', async (method, path) => {
    const res = await request(t.app)[method](path).send({});
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  for (const account of ['employer', 'hr', 'assessor', 'operator1'] as const) {
    it.each(adminRoutes)(`${account}: %s %s gets 403`, async (method, path) => {
      const agent = await signedInAgent(t.app, account);
      const res = await agent[method](path).send({ name: 'Should Not Change' });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    });
  }

  it('admin passes the same guard', async () => {
    const agent = await signedInAgent(t.app, 'admin');
    await agent.get('/api/users').expect(200);
    await agent.get('/api/organizations').expect(200);
    await agent.get('/api/mail-messages').expect(200);
  });

  it('a forbidden change writes nothing', async () => {
    const agent = await signedInAgent(t.app, 'employer');
    await agent.patch('/api/users/1').send({ name: 'Should Not Change' }).expect(403);
    const admin = await signedInAgent(t.app, 'admin');
    const list = await admin.get('/api/users').query({ q: 'Should Not Change' }).expect(200);
    expect(list.body.total).toBe(0);
  });
});
