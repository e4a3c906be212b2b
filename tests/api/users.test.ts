import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PublicUser } from '../../shared/schemas';
import { startWorkers } from '../../server/jobs/workers';
import { createTestApp, demoEmail, latestMailTo, signedInAgent } from '../support/api';

const t = createTestApp();
beforeAll(() => startWorkers(t.ctx)); // e-mails go out from the job queue
afterAll(() => t.close());

describe('admin: users', () => {
  it('pages, sorts and filters on the server', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const firstPage = await admin.get('/api/users').query({ pageSize: 2, sortField: 'email', sortOrder: 'asc' }).expect(200);
    expect(firstPage.body.items).toHaveLength(2);
    expect(firstPage.body.total).toBeGreaterThanOrEqual(6);
    const emails = firstPage.body.items.map((u: PublicUser) => u.email);
    expect(emails).toEqual([...emails].sort());

    const secondPage = await admin.get('/api/users').query({ page: 2, pageSize: 2, sortField: 'email' }).expect(200);
    expect(secondPage.body.items[0].email > emails[1]).toBe(true);

    const operators = await admin.get('/api/users').query({ role: 'operator', q: 'demo.driftproof' }).expect(200);
    expect(operators.body.items.every((u: PublicUser) => u.role === 'operator')).toBe(true);
    expect(operators.body.items.map((u: PublicUser) => u.email)).toEqual(expect.arrayContaining([demoEmail('operator1'), demoEmail('operator2')]));

    const byName = await admin.get('/api/users').query({ q: 'castellane' }).expect(200);
    expect(byName.body.items.map((u: PublicUser) => u.email)).toEqual([demoEmail('assessor')]);

    const percent = await admin.get('/api/users').query({ q: '%' }).expect(200);
    expect(percent.body.total).toBe(0);
  });

  it('creates a user, e-mails an invitation, and refuses the same e-mail twice', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const started = new Date();
    const res = await admin.post('/api/users').send({ email: 'New.Assessor@Demo.Driftproof.test', name: 'New Assessor', role: 'assessor' }).expect(201);
    expect(res.body.user).toMatchObject({ email: 'new.assessor@demo.driftproof.test', role: 'assessor', active: true, organizationId: null });
    const mail = await latestMailTo('new.assessor@demo.driftproof.test', started);
    expect(mail.htmlBody).toContain('Choose your password');

    const twice = await admin.post('/api/users').send({ email: 'new.assessor@demo.driftproof.test', name: 'Again', role: 'assessor' }).expect(409);
    expect(twice.body.error.code).toBe('email_taken');
  });

  it('changes a role and the organization with it, deactivates and reactivates', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const created = await admin.post('/api/users').send({ email: 'role.change@demo.driftproof.test', name: 'Role Change', role: 'operator', organizationId: 1 }).expect(201);
    const id = created.body.user.id;
    const toAssessor = await admin.patch(`/api/users/${id}`).send({ role: 'assessor' }).expect(200);
    expect(toAssessor.body.user).toMatchObject({ role: 'assessor', organizationId: null });
    const backToHr = await admin.patch(`/api/users/${id}`).send({ role: 'hr' }).expect(400);
    expect(backToHr.body.error.fields.organizationId).toBeDefined();
    await admin.patch(`/api/users/${id}`).send({ role: 'hr', organizationId: 1 }).expect(200);
    const off = await admin.patch(`/api/users/${id}`).send({ active: false }).expect(200);
    expect(off.body.user.active).toBe(false);
    const inactive = await admin.get('/api/users').query({ status: 'inactive', q: 'role.change' }).expect(200);
    expect(inactive.body.total).toBe(1);
    const on = await admin.patch(`/api/users/${id}`).send({ active: true }).expect(200);
    expect(on.body.user.active).toBe(true);
  });

  it('does not let an admin demote or deactivate their own account', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const me = (await admin.get('/api/auth/me')).body.user as PublicUser;
    const res = await admin.patch(`/api/users/${me.id}`).send({ active: false }).expect(409);
    expect(res.body.error.code).toBe('own_account');
    await admin.patch(`/api/users/${me.id}`).send({ role: 'operator', organizationId: 1 }).expect(409);
    await admin.patch(`/api/users/${me.id}`).send({ name: 'Rowan Tallis' }).expect(200);
  });

  it('answers 404 for an account that does not exist', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    const res = await admin.patch('/api/users/999999').send({ name: 'Nobody' }).expect(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('admin: mail sink', () => {
  it('lists captured messages newest first and shows one with its bodies', async () => {
    const admin = await signedInAgent(t.app, 'admin');
    await admin.post('/api/users').send({ email: 'mail.reader@demo.driftproof.test', name: 'Mail Reader', role: 'assessor' }).expect(201);
    await latestMailTo('mail.reader@demo.driftproof.test');
    const list = await admin.get('/api/mail-messages').query({ q: 'mail.reader' }).expect(200);
    expect(list.body.items[0]).toMatchObject({ to: 'mail.reader@demo.driftproof.test', subject: 'Your Driftproof account is ready' });
    const one = await admin.get(`/api/mail-messages/${list.body.items[0].id}`).expect(200);
    expect(one.body.message.html).toContain('<a href="http://127.0.0.1:3999/reset-password?token=');
    expect(one.body.message.text).toContain('Hello Mail Reader');
    await admin.get('/api/mail-messages/999999').expect(404);
  });
});
