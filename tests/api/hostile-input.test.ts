/**
 * Hostile input at every body, query and upload: wrong types, oversize values, unicode edges and
 * injection-shaped strings. Each request carries at least one value its schema must refuse, so
 * every answer is a 4xx with a clear error — never a 500 — and nothing is written.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { Agent } from 'supertest';
import { createTestApp, resetRateLimits, signedInAgent } from '../support/api';
import { startDrive } from '../support/drive-api';

const t = createTestApp();
afterAll(() => t.close());

type Kind = 'string' | 'email' | 'int' | 'number' | 'enum' | 'bool' | 'array' | 'object' | 'token';
type Caller = 'anonymous' | 'admin' | 'employer' | 'operator1' | 'assessor';

/** Values no schema of this kind accepts. */
const invalidFor: Record<Kind, unknown[]> = {
  string: [42, true, null, [], {}, 'x'.repeat(20_000)],
  // (null is left out where some fields are nullable: billingEmail, organizationId)
  email: ['not-an-email', "'; DROP TABLE users;--", 'a@b', 17, `${'a'.repeat(300)}@x.test`],
  int: ['12', 'NaN', 1.5, -1, 1e308, [], {}, true],
  number: ['1', null, [], {}, 'Infinity', true],
  enum: ['nope', "' OR 1=1 --", 0, null, [], '__proto__'],
  bool: ['true', 1, null, [], {}],
  array: ['[]', 7, null, {}, [null], Array.from({ length: 5000 }, () => 'x')],
  object: ['{}', 7, null, [], { x: 'y', __proto__: { admin: true } }],
  token: ['short', '../../etc/passwd', 'x'.repeat(43).replace(/x/g, '!'), 7, null],
};

/** Strings that are valid somewhere but meant to hurt: injection shapes and unicode edges. */
const nasty = fc.constantFrom(
  "'; DROP TABLE users;--",
  '<script>alert(1)</script>',
  '${7*7}{{7*7}}',
  '../../../../etc/passwd',
  '\u0000nul byte',
  '\ud800 lone surrogate',
  'RTL \u202e override',
  'zero\u200bwidth',
  '𝔘𝔫𝔦𝔠𝔬𝔡𝔢 😀👩‍👩‍👧',
  'Ｆｕｌｌｗｉｄｔｈ',
  ' ',
  '',
  '=HYPERLINK("http://x")',
);

interface Target {
  caller: Caller;
  method: 'post' | 'put' | 'patch';
  path: string | (() => string);
  fields: Record<string, Kind>;
}

let attemptId = '';
let fleetProfileId = '';
const TARGETS: Target[] = [
  { caller: 'anonymous', method: 'post', path: '/api/auth/sign-in', fields: { email: 'email', password: 'string' } },
  { caller: 'anonymous', method: 'post', path: '/api/auth/password-reset', fields: { email: 'email' } },
  { caller: 'anonymous', method: 'post', path: '/api/auth/password-reset/confirm', fields: { token: 'token', password: 'string' } },
  { caller: 'anonymous', method: 'post', path: '/api/signup', fields: { organizationName: 'string', name: 'string', email: 'email', password: 'string' } },
  { caller: 'anonymous', method: 'post', path: '/api/signup/confirm', fields: { token: 'token' } },
  { caller: 'admin', method: 'post', path: '/api/users', fields: { email: 'email', name: 'string', role: 'enum', organizationId: 'int' } },
  { caller: 'admin', method: 'patch', path: '/api/users/2', fields: { name: 'string', role: 'enum', organizationId: 'int', active: 'bool' } },
  { caller: 'admin', method: 'put', path: '/api/pricing', fields: { currency: 'enum', unitAmount: 'int', tiers: 'array' } },
  { caller: 'admin', method: 'post', path: '/api/organizations/1/seat-grants', fields: { count: 'int' } },
  { caller: 'admin', method: 'post', path: '/api/orders/00000000-0000-4000-8000-000000000000/refunds', fields: { quantity: 'int' } },
  { caller: 'admin', method: 'post', path: '/api/credentials/1/revoke', fields: { reason: 'string' } },
  { caller: 'employer', method: 'patch', path: '/api/organizations/1', fields: { name: 'string', billingEmail: 'email', address: 'string' } },
  { caller: 'employer', method: 'post', path: '/api/organizations/1/orders', fields: { quantity: 'int' } },
  { caller: 'employer', method: 'post', path: '/api/organizations/1/operators', fields: { email: 'email', name: 'string', levelIds: 'array' } },
  { caller: 'employer', method: 'put', path: '/api/organizations/1/operators/5/levels', fields: { levelIds: 'array' } },
  { caller: 'operator1', method: 'post', path: '/api/attempts', fields: { trialId: 'string', mode: 'enum', fleetProfileId: 'token' } },
  { caller: 'operator1', method: 'post', path: () => `/api/attempts/${attemptId}/steps`, fields: { fromSeq: 'int', commands: 'array' } },
  { caller: 'operator1', method: 'post', path: () => `/api/attempts/${attemptId}/calls`, fields: { callPointId: 'string', call: 'enum', estimate: 'object' } },
  // Multipart routes read their text fields from a JSON body too (and refuse it for want of files).
  { caller: 'employer', method: 'post', path: '/api/organizations/1/fleet-calibration/umbmark', fields: { robotId: 'string', wheelRadius: 'number', wheelbase: 'number', ticksPerRevolution: 'int' } },
  { caller: 'employer', method: 'post', path: '/api/organizations/1/fleet-profiles', fields: { name: 'string', robotId: 'string', wheelRadius: 'number', ticksPerRevolution: 'int' } },
  { caller: 'employer', method: 'put', path: () => `/api/organizations/1/fleet-profiles/${fleetProfileId}/practice-trials`, fields: { trialIds: 'array' } },
  { caller: 'assessor', method: 'post', path: '/api/reviews/00000000-0000-4000-8000-000000000000/verdict', fields: { verdict: 'enum', reason: 'string', amendments: 'array' } },
];

const QUERIES: { caller: Caller; path: string; bad: Record<string, unknown>[] }[] = [
  { caller: 'admin', path: '/api/users', bad: [{ page: -1 }, { pageSize: 1e9 }, { sortField: "email; DROP TABLE users" }, { role: 'root' }, { status: 'maybe' }, { q: 'x'.repeat(500) }, { extra: 1 }] },
  { caller: 'admin', path: '/api/mail-messages', bad: [{ page: 'two' }, { sortOrder: 'sideways' }] },
  { caller: 'operator1', path: '/api/attempts', bad: [{ status: "' OR 1=1" }, { userId: 'me' }, { pageSize: 0 }] },
  { caller: 'assessor', path: '/api/reviews', bad: [{ status: 'all' }, { flagged: 'perhaps' }, { minAgeHours: -3 }, { sortField: 'id' }] },
  { caller: 'employer', path: '/api/organizations/1/operators', bad: [{ page: 0 }, { pageSize: 10_000 }] },
  { caller: 'employer', path: '/api/credentials', bad: [{ expiringWithinDays: 'soon' }, { expiringWithinDays: 9999 }] },
];

const agents = {} as Record<Caller, Agent>;
const TABLES = ['users', 'organizations', 'attempts', 'attempt_log', 'seat_ledger', 'seat_orders', 'credentials', 'level_assignments', 'attempt_reviews', 'settings', 'password_tokens', 'fleet_profiles', 'fleet_profile_files', 'fleet_practice_trials'];
async function counts() {
  const out: Record<string, number> = {};
  for (const table of TABLES) {
    const [rows] = (await t.ctx.sequelize.query(`SELECT count(*)::int AS n FROM ${table}`)) as [{ n: number }[], unknown];
    out[table] = rows[0].n;
  }
  return out;
}

beforeAll(async () => {
  await resetRateLimits(t.ctx);
  agents.anonymous = (await import('supertest')).default.agent(t.app);
  for (const c of ['admin', 'employer', 'operator1', 'assessor'] as const) agents[c] = await signedInAgent(t.app, c);
  attemptId = (await startDrive(agents.operator1, 'long-aisle-run')).attempt.id;
  fleetProfileId = (await agents.employer.get('/api/organizations/1/fleet-profiles').expect(200)).body.items[0].id;
});

describe('hostile input', () => {
  it('every JSON body: 400 with field messages, never 500, nothing written', async () => {
    const before = await counts();
    for (const target of TARGETS) {
      const keys = Object.keys(target.fields);
      await fc.assert(
        fc.asyncProperty(
          fc.constantFrom(...keys),
          fc.nat(),
          fc.dictionary(fc.constantFrom(...keys), fc.oneof(nasty, fc.jsonValue({ maxDepth: 2 }))),
          async (broken, pick, others) => {
            await resetRateLimits(t.ctx);
            const choices = invalidFor[target.fields[broken]];
            const body = { ...others, [broken]: choices[pick % choices.length] };
            const path = typeof target.path === 'function' ? target.path() : target.path;
            const res = await agents[target.caller][target.method](path).set('Content-Type', 'application/json').send(JSON.stringify(body));
            const where = `${target.method.toUpperCase()} ${path} ${JSON.stringify(body).slice(0, 200)} → ${res.status} ${res.text.slice(0, 200)}`;
            expect(res.status, where).toBeGreaterThanOrEqual(400);
            expect(res.status, where).toBeLessThan(500);
            expect(res.body.error?.message, where).toBeTruthy();
            if (res.status === 400) expect(['validation_failed', 'estimate_required']).toContain(res.body.error.code);
          },
        ),
        { numRuns: 20, seed: 20261201 },
      );
    }
    expect(await counts()).toEqual(before);
  }, 180_000);

  it('every query string: 400 with field messages', async () => {
    for (const q of QUERIES) {
      for (const bad of q.bad) {
        const res = await agents[q.caller].get(q.path).query(bad);
        expect(res.status, `${q.path} ${JSON.stringify(bad)} → ${res.status} ${res.text.slice(0, 200)}`).toBe(400);
        expect(Object.keys(res.body.error.fields ?? {}).length).toBeGreaterThan(0);
      }
    }
  });

  it('uploads: wrong type, huge line counts and path-traversal names are refused cleanly; nothing written', async () => {
    const before = await counts();
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex');
    const upload = (path: string, field: string, content: Buffer, name: string) => agents.employer.post(path).attach(field, content, name);
    const preview = '/api/organizations/1/roster/preview';
    for (const [content, name] of [
      [png, 'photo.png'],
      [Buffer.from(`email,name\n${'x@y.test,Name\n'.repeat(3000)}`), 'many.csv'],
      [Buffer.from('email,name\n"../../../etc/passwd",A\n'), '../../../etc/passwd'],
      [Buffer.alloc(0), 'empty.csv'],
    ] as [Buffer, string][]) {
      const res = await upload(preview, 'roster', content, name);
      // Refused outright, or previewed with its row errors shown.
      expect(res.status >= 400 || res.body.errors > 0, `${name} → ${res.status} ${res.text.slice(0, 200)}`).toBe(true);
      expect(res.status).toBeLessThan(500);
      const imported = await upload('/api/organizations/1/roster/import', 'roster', content, name);
      expect(imported.status).toBeGreaterThanOrEqual(400);
      expect(imported.status).toBeLessThan(500);
    }
    // A path-traversal or Windows file name with good content is only a name: the file never touches the disk.
    for (const name of ['../../../etc/passwd', 'C:\\Windows\\system32\\evil.csv']) {
      const res = await upload(preview, 'roster', Buffer.from('email,name\nsafe@b.test,A\n'), name);
      expect(res.status, res.text).toBe(200);
    }
    // A NUL byte in the part header makes the multipart body itself unreadable: a 400, not a 500.
    expect((await upload(preview, 'roster', Buffer.from('email,name\n'), '\u0000.csv')).status).toBe(400);
    const wrongField = await agents.employer.post(preview).attach('file', Buffer.from('email,name\n'), 'r.csv');
    expect(wrongField.status).toBe(400);
    const bulk = await agents.employer.post('/api/verify/bulk').attach('numbers', png, '../x.png');
    expect(bulk.status).toBe(400);

    // Fleet calibration uploads: every bad file is a 4xx (row problems, size, a broken body), never a 500, and nothing is stored.
    const fleet = [
      { path: '/api/organizations/1/fleet-calibration/umbmark', field: 'runs', fields: { robotId: 'aisle-tugger' } },
      { path: '/api/organizations/1/fleet-calibration/alpha-fit', field: 'poses', fields: {} },
      { path: '/api/organizations/1/fleet-profiles', field: 'runs', fields: { name: 'Hostile', robotId: 'aisle-tugger' } },
      { path: '/api/organizations/1/fleet-profiles', field: 'poses', fields: { name: 'Hostile', robotId: 'aisle-tugger' } },
    ];
    const fleetFiles: [Buffer, string][] = [
      [png, 'photo.png'],
      [Buffer.from(`direction,x_error,y_error\n${'cw,0.1,0.1\n'.repeat(20_000)}`), 'many.csv'],
      [Buffer.from(`odom_x,odom_y,odom_theta,ref_x,ref_y,ref_theta\n${'0,0,0,0,0,0\n'.repeat(20_001)}`), 'many-poses.csv'],
      [Buffer.from('direction,x_error,y_error\n"=cmd|\' /C calc\'!A0",1,2\n'), '../../../etc/passwd'],
      [Buffer.from('\ufeff"unclosed,quote\n'), 'C:\\Windows\\evil.csv'],
      [Buffer.alloc(0), 'empty.csv'],
      [Buffer.alloc(5 * 1024 * 1024 + 1, 'a'), 'huge.csv'],
    ];
    for (const target of fleet) {
      for (const [content, name] of fleetFiles) {
        const req = agents.employer.post(target.path);
        for (const [k, v] of Object.entries(target.fields)) req.field(k, v);
        const res = await req.attach(target.field, content, name);
        const where = `${target.path} ${target.field} ${name} → ${res.status} ${res.text.slice(0, 200)}`;
        expect(res.status, where).toBeGreaterThanOrEqual(400);
        expect(res.status, where).toBeLessThan(500);
        expect(res.body.error?.message, where).toBeTruthy();
      }
      expect((await agents.employer.post(target.path).attach(target.field, Buffer.from('a,b\n'), '\u0000.csv')).status).toBe(400);
      expect((await agents.employer.post(target.path).attach('other', Buffer.from('a,b\n'), 'r.csv')).status).toBe(400);
    }
    expect(await counts()).toEqual(before);
  });
});
