import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { User } from '../../server/db/models';
import { createTestApp, resetRateLimits, signedInAgent } from '../support/api';

const t = createTestApp();
afterAll(() => t.close());
beforeEach(() => resetRateLimits(t.ctx));

const userCount = () => User.count();

describe('validation', () => {
  it('answers a bad sign-in body with 400 and a message per field', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: 'not-an-email', password: '' }).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.fields).toEqual({ email: 'Enter a valid e-mail address.', password: 'Enter your password.' });
  });

  it('answers malformed JSON with 400', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email": "a@b.test",').expect(400);
    expect(res.body.error.code).toBe('malformed_json');
  });

  it('refuses unknown fields and writes nothing', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const before = await userCount();
    const res = await admin
      .post('/api/users')
      .send({ email: 'extra.field@demo.driftproof.test', name: 'Extra Field', role: 'assessor', isAdmin: true })
      .expect(400);
    expect(res.body.error.fields).toEqual({ isAdmin: 'This field is not allowed.' });
    expect(await userCount()).toBe(before);
  });

  it('refuses an oversize body with 413 and writes nothing', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const before = await userCount();
    const res = await admin
      .post('/api/users')
      .send({ email: 'big.body@demo.driftproof.test', name: 'x'.repeat(200_000), role: 'assessor' })
      .expect(413);
    expect(res.body.error.code).toBe('body_too_large');
    expect(await userCount()).toBe(before);
  });

  it('validates query strings and route parameters', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const query = await admin.get('/api/users').query({ pageSize: 1000, sortField: 'passwordHash' }).expect(400);
    expect(Object.keys(query.body.error.fields).sort()).toEqual(['pageSize', 'sortField']);
    const param = await admin.patch('/api/users/abc').send({ name: 'Nobody' }).expect(400);
    expect(param.body.error.fields.id).toBeDefined();
  });

  it('requires an organization for organization roles and refuses one for the others', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const missing = await admin.post('/api/users').send({ email: 'no.org@demo.driftproof.test', name: 'No Org', role: 'employer' }).expect(400);
    expect(missing.body.error.fields.organizationId).toMatch(/Choose the organization/);
    const extra = await admin.post('/api/users').send({ email: 'with.org@demo.driftproof.test', name: 'With Org', role: 'assessor', organizationId: 1 }).expect(400);
    expect(extra.body.error.fields.organizationId).toMatch(/do not belong/);
    const unknown = await admin.post('/api/users').send({ email: 'bad.org@demo.driftproof.test', name: 'Bad Org', role: 'hr', organizationId: 9999 }).expect(400);
    expect(unknown.body.error.fields.organizationId).toBe('That organization does not exist.');
  });
});
