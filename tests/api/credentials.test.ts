import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { User } from '../../server/db/models';
import { ensureDebianPackage } from '../../server/scripts/apt';
import { issueCredentialsFor, makeCertificate, queueRenewalReminders, renderCertificate } from '../../server/services/credentials';
import { credentialHolder } from '../support/credentials';
import { PROJECT_ROOT } from '../../server/config';
import { createTestApp, mailContaining, resetRateLimits, signedInAgent, type TestApp } from '../support/api';
import { startWorkers } from '../../server/jobs/workers';

const t: TestApp = createTestApp();
const tmp = mkdtempSync(path.join(PROJECT_ROOT, '.data', 'tmp', 'credential-'));
beforeAll(async () => {
  ensureDebianPackage('poppler-utils', '/usr/bin/pdftotext');
  ensureDebianPackage('zbar-tools', '/usr/bin/zbarimg');
  await startWorkers(t.ctx);
});
afterAll(() => t.close());

const holder = (name: string, now = new Date()) => credentialHolder(t.ctx, name, now);

describe('issuing', () => {
  it('issues once per level when every required trial is passed with a final result', async () => {
    const { user, credential } = await holder('Ivo Brandt');
    expect(credential.number).toMatch(/^DPC-[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]$/);
    expect(credential.trials.map((tr) => tr.trialId)).toEqual(['long-aisle-run', 'rack-end-slalom']);
    // Validity from the level: 24 months.
    expect(credential.expiresAt.getUTCFullYear() - credential.issuedAt.getUTCFullYear()).toBe(2);
    const again = await t.ctx.sequelize.transaction((transaction) => issueCredentialsFor(t.ctx, user.id, transaction));
    expect(again).toEqual([]);
  });
});

describe('the certificate PDF', () => {
  it('embeds Lato, holds the number and a name with diacritics, and its QR code opens the verification page', async () => {
    const { credential } = await holder('Zoë Łukasiewicz-Ólafsdóttir');
    const file = path.join(tmp, 'certificate.pdf');
    writeFileSync(file, await renderCertificate(t.ctx, credential));
    const fonts = execFileSync('pdffonts', [file]).toString();
    expect(fonts).toMatch(/Lato/);
    expect(fonts.split('\n').filter((l) => /Lato/.test(l)).every((l) => /\byes\b/.test(l))).toBe(true); // "emb" column
    const text = execFileSync('pdftotext', ['-layout', file, '-']).toString();
    expect(text).toContain(credential.number);
    expect(text).toContain('Zoë Łukasiewicz-Ólafsdóttir');
    expect(text).toContain('does not authorise anyone to operate a real robot');
    execFileSync('pdftoppm', ['-r', '150', '-png', '-singlefile', file, path.join(tmp, 'page')]);
    const qr = execFileSync('zbarimg', ['--raw', '-q', path.join(tmp, 'page.png')]).toString().trim();
    expect(qr).toBe(`http://127.0.0.1:3999/verify/${credential.number}?s=${credential.signature}`);
  });

  it('is made by the job, stored, e-mailed to the holder and downloadable by holder, employer and admin only', async () => {
    const { user, credential } = await holder('Pia Nordlund');
    await makeCertificate(t.ctx, credential.id);
    const mail = await mailContaining(user.email, credential.number);
    expect(mail.subject).toBe(`Your Driftproof credential ${credential.number}`);
    await user.update({ passwordHash: (await User.findOne({ where: { email: 'operator1@demo.driftproof.test' } }))!.passwordHash });
    const own = request.agent(t.app);
    await own.post('/api/auth/sign-in').send({ email: user.email, password: 'drive-safe-demo' }).expect(200);
    const pdf = await own.get(`/api/credentials/${credential.id}/pdf`).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(pdf.body.subarray(0, 5).toString()).toBe('%PDF-');
    await (await signedInAgent(t.app, 'employer')).get(`/api/credentials/${credential.id}/pdf`).expect(200);
    await (await signedInAgent(t.app, 'admin')).get(`/api/credentials/${credential.id}/pdf`).expect(200);
    await (await signedInAgent(t.app, 'operator2')).get(`/api/credentials/${credential.id}/pdf`).expect(404);
    await (await signedInAgent(t.app, 'hr')).get(`/api/credentials/${credential.id}/pdf`).expect(403);
    const list = await (await signedInAgent(t.app, 'hr')).get('/api/credentials').expect(200);
    expect(list.body.items.map((c: { number: string }) => c.number)).toContain(credential.number);
  });
});

describe('verification', () => {
  it('answers each state without sign-in, and "not found" with no hints', async () => {
    await resetRateLimits(t.ctx);
    const { credential } = await holder('Rune Halvorsen');
    const active = await request(t.app).get(`/api/verify/${credential.number.toLowerCase()}`).expect(200);
    expect(active.body.credential).toMatchObject({ found: true, holderName: 'Rune Halvorsen', levelName: 'Aisle operator', status: 'active', signatureValid: true, revokedAt: null });

    const old = await holder('Old Timer', new Date(Date.now() - 3 * 365 * 86_400_000));
    const expired = await request(t.app).get(`/api/verify/${old.credential.number}`).expect(200);
    expect(expired.body.credential).toMatchObject({ status: 'expired', signatureValid: true });

    const unknown = await request(t.app).get('/api/verify/DPC-0000-0000-0').expect(404);
    const malformed = await request(t.app).get('/api/verify/hello').expect(404);
    expect(unknown.body).toEqual(malformed.body);
    expect(unknown.body).toEqual({ error: { code: 'not_found', message: 'No credential has this number.' } });

    const assessor = await signedInAgent(t.app, 'assessor');
    await assessor.post(`/api/credentials/${credential.id}/revoke`).send({ reason: 'short' }).expect(400);
    await (await signedInAgent(t.app, 'employer')).post(`/api/credentials/${credential.id}/revoke`).send({ reason: 'Employers cannot revoke.' }).expect(403);
    await assessor.post(`/api/credentials/${credential.id}/revoke`).send({ reason: 'Exam conditions were not met on re-inspection.' }).expect(200);
    const revoked = await request(t.app).get(`/api/verify/${credential.number}`).expect(200);
    expect(revoked.body.credential.status).toBe('revoked');
    expect(revoked.body.credential.revokedAt).toBeTruthy();
    const notice = await mailContaining('employer@demo.driftproof.test', `${credential.number} of Rune Halvorsen`);
    expect(notice.subject).toBe(`Driftproof credential ${credential.number} revoked`);
    expect(notice.envelopeTo).toContain('@demo.driftproof.test');
  });

  it('detects a tampered signature, a tampered field, and a printed signature that is not on record', async () => {
    await resetRateLimits(t.ctx);
    const { credential } = await holder('Mara Kettle');
    const printed = await request(t.app).get(`/api/verify/${credential.number}`).query({ s: credential.signature }).expect(200);
    expect(printed.body.credential.printedSignatureMatches).toBe(true);
    const forged = credential.signature.slice(0, -4) + (credential.signature.endsWith('AAAA') ? 'BBBB' : 'AAAA');
    expect((await request(t.app).get(`/api/verify/${credential.number}`).query({ s: forged })).body.credential.printedSignatureMatches).toBe(false);
    await t.ctx.sequelize.query('UPDATE credentials SET signature = :forged WHERE id = :id', { replacements: { forged, id: credential.id } });
    expect((await request(t.app).get(`/api/verify/${credential.number}`)).body.credential.signatureValid).toBe(false);
    await t.ctx.sequelize.query('UPDATE credentials SET signature = :real, holder_name = :name WHERE id = :id', { replacements: { real: credential.signature, name: 'Someone Else', id: credential.id } });
    expect((await request(t.app).get(`/api/verify/${credential.number}`)).body.credential.signatureValid).toBe(false);
  });

  it('is rate-limited', async () => {
    await resetRateLimits(t.ctx);
    for (let i = 0; i < 60; i++) await request(t.app).get('/api/verify/DPC-0000-0000-0');
    const limited = await request(t.app).get('/api/verify/DPC-0000-0000-0').expect(429);
    expect(limited.body.error.code).toBe('rate_limited');
    await resetRateLimits(t.ctx);
  });
});

describe('HR bulk verification', () => {
  it('checks a CSV of numbers with names, as JSON and as CSV', async () => {
    await resetRateLimits(t.ctx);
    const { credential } = await holder('Åsa Lindqvist');
    const csv = `number,name\n${credential.number},asa lindqvist\n${credential.number},Someone Else\nDPC-0000-0000-0,\n`;
    const hr = await signedInAgent(t.app, 'hr');
    const res = await hr.post('/api/verify/bulk').attach('numbers', Buffer.from(csv), 'numbers.csv').expect(200);
    expect(res.body.items.map((r: { found: boolean; nameMatches: boolean | null }) => [r.found, r.nameMatches])).toEqual([
      [true, true],
      [true, false],
      [false, null],
    ]);
    const asCsv = await hr.post('/api/verify/bulk').query({ format: 'csv' }).attach('numbers', Buffer.from(csv), 'numbers.csv').expect(200);
    expect(asCsv.text.split('\r\n')[0]).toBe('line,number,name,found,status,holder_name,level,expires_at,name_matches,signature_valid');
    expect(asCsv.text).toContain(`2,${credential.number},asa lindqvist,yes,active,Åsa Lindqvist,Aisle operator`);
    const malformed = await hr.post('/api/verify/bulk').attach('numbers', Buffer.from('number\n"open quote\n'), 'bad.csv').expect(400);
    expect(malformed.body.error.code).toBe('malformed_csv');
    await hr.post('/api/verify/bulk').attach('numbers', Buffer.from('id,who\n1,2\n'), 'bad.csv').expect(400);
    await (await signedInAgent(t.app, 'operator1')).post('/api/verify/bulk').attach('numbers', Buffer.from(csv), 'n.csv').expect(403);
  });
});

describe('renewal reminders', () => {
  it('are queued 60 and 14 days before expiry, each exactly once (controllable clock)', async () => {
    const { credential } = await holder('Remy Clockwork');
    const day = 86_400_000;
    const expires = credential.expiresAt.getTime();
    const reminders = async () =>
      (await t.ctx.sequelize.query<{ days_before: number }>('SELECT days_before FROM credential_reminders WHERE credential_id = :id ORDER BY days_before', { replacements: { id: credential.id }, type: 'SELECT' as never })).map((r) => r.days_before);
    await queueRenewalReminders(t.ctx, new Date(expires - 61 * day));
    expect(await reminders()).toEqual([]);
    await queueRenewalReminders(t.ctx, new Date(expires - 59 * day));
    await queueRenewalReminders(t.ctx, new Date(expires - 58 * day));
    expect(await reminders()).toEqual([60]);
    await queueRenewalReminders(t.ctx, new Date(expires - 13 * day));
    await queueRenewalReminders(t.ctx, new Date(expires - 12 * day));
    expect(await reminders()).toEqual([14, 60]);
    await queueRenewalReminders(t.ctx, new Date(expires + day));
    expect(await reminders()).toEqual([14, 60]);
    const mail = await mailContaining('employer@demo.driftproof.test', `${credential.number} of Remy Clockwork for "Aisle operator" expires`);
    expect(mail.subject).toMatch(/expires on/);
  });
});
