/**
 * The permission matrix: every API route × every kind of caller → what they get. "ok" means the
 * guard let the request through (whatever the route then answered: 2xx, 400, 404, 409…); 401 and
 * 403 mean the guard stopped it. A route missing from this table fails the suite.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request, { type Agent } from 'supertest';
import { hashPassword } from '../../server/auth/passwords';
import { Organization, User } from '../../server/db/models';
import { createTestApp, resetRateLimits, signedInAgent } from '../support/api';
import { listRoutes } from '../support/routes';

const t = createTestApp();
afterAll(() => t.close());

type Caller = 'anonymous' | 'admin' | 'employer' | 'hr' | 'assessor' | 'operator' | 'otherOrgEmployer';
type Outcome = 'ok' | 401 | 403;
const CALLERS: Caller[] = ['anonymous', 'admin', 'employer', 'hr', 'assessor', 'operator', 'otherOrgEmployer'];

const NO_ATTEMPT = '00000000-0000-4000-8000-000000000000';
const PUBLIC = { anonymous: 'ok', admin: 'ok', employer: 'ok', hr: 'ok', assessor: 'ok', operator: 'ok', otherOrgEmployer: 'ok' } as const;
const SIGNED_IN = { ...PUBLIC, anonymous: 401 } as const;
const only = (...allowed: Caller[]): Record<Caller, Outcome> =>
  Object.fromEntries(CALLERS.map((c) => [c, allowed.includes(c) ? 'ok' : c === 'anonymous' ? 401 : 403])) as Record<Caller, Outcome>;
/** Organization routes on the demo organization (id 1): its employer and admins; another organization's employer is refused. */
const ORG = only('admin', 'employer');

// [route as registered, concrete path to call, expected outcome per caller]
const MATRIX: [string, string, Record<Caller, Outcome>][] = [
  ['GET /api/health', '/api/health', PUBLIC],
  ['POST /api/auth/sign-in', '/api/auth/sign-in', PUBLIC],
  ['GET /api/auth/me', '/api/auth/me', SIGNED_IN],
  ['POST /api/auth/password-reset', '/api/auth/password-reset', PUBLIC],
  ['POST /api/auth/password-reset/confirm', '/api/auth/password-reset/confirm', PUBLIC],
  ['GET /api/users', '/api/users', only('admin')],
  ['POST /api/users', '/api/users', only('admin')],
  ['PATCH /api/users/:id', '/api/users/999999', only('admin')],
  ['GET /api/organizations', '/api/organizations', only('admin')],
  ['GET /api/mail-messages', '/api/mail-messages', only('admin')],
  ['GET /api/mail-messages/:id', '/api/mail-messages/999999', only('admin')],
  ['GET /api/levels', '/api/levels', PUBLIC],
  ['GET /api/trials', '/api/trials', SIGNED_IN],
  ['GET /api/robots', '/api/robots', SIGNED_IN],
  ['GET /api/trials/:id', '/api/trials/long-aisle-run', SIGNED_IN],
  ['POST /api/attempts', '/api/attempts', only('operator')],
  ['GET /api/attempts', '/api/attempts', only('operator', 'employer', 'otherOrgEmployer', 'assessor', 'admin')],
  ['GET /api/attempts/:id', `/api/attempts/${NO_ATTEMPT}`, only('operator', 'employer', 'otherOrgEmployer', 'assessor', 'admin')],
  ['POST /api/attempts/:id/steps', `/api/attempts/${NO_ATTEMPT}/steps`, only('operator')],
  ['POST /api/attempts/:id/calls', `/api/attempts/${NO_ATTEMPT}/calls`, only('operator')],
  ['POST /api/attempts/:id/submit', `/api/attempts/${NO_ATTEMPT}/submit`, only('operator')],
  ['POST /api/attempts/:id/abandon', `/api/attempts/${NO_ATTEMPT}/abandon`, only('operator')],
  ['GET /api/exam-seats', '/api/exam-seats', only('operator')],
  ['GET /api/attempts/:id/report', `/api/attempts/${NO_ATTEMPT}/report`, only('operator', 'employer', 'otherOrgEmployer', 'assessor', 'admin')],
  ['GET /api/reviews', '/api/reviews', only('assessor', 'admin')],
  ['POST /api/reviews/:id/claim', `/api/reviews/${NO_ATTEMPT}/claim`, only('assessor')],
  ['POST /api/reviews/:id/verdict', `/api/reviews/${NO_ATTEMPT}/verdict`, only('assessor')],
  ['GET /api/reviews/:id/audit', `/api/reviews/${NO_ATTEMPT}/audit`, only('assessor', 'admin')],
  ['POST /api/signup', '/api/signup', PUBLIC],
  ['POST /api/signup/confirm', '/api/signup/confirm', PUBLIC],
  ['POST /api/signup/resend-confirmation', '/api/signup/resend-confirmation', only('employer', 'otherOrgEmployer')],
  ['POST /api/payments/webhook', '/api/payments/webhook', PUBLIC],
  ['GET /api/pricing', '/api/pricing', PUBLIC],
  ['PUT /api/pricing', '/api/pricing', only('admin')],
  ['GET /api/orders', '/api/orders', only('admin')],
  ['POST /api/orders/:orderId/refunds', `/api/orders/${NO_ATTEMPT}/refunds`, only('admin')],
  ['GET /api/organizations/:orgId', '/api/organizations/1', ORG],
  ['PATCH /api/organizations/:orgId', '/api/organizations/1', ORG],
  ['GET /api/organizations/:orgId/seats', '/api/organizations/1/seats', ORG],
  ['POST /api/organizations/:orgId/orders', '/api/organizations/1/orders', only('employer')],
  ['GET /api/organizations/:orgId/orders/:orderId', `/api/organizations/1/orders/${NO_ATTEMPT}`, ORG],
  ['POST /api/organizations/:orgId/orders/:orderId/cancel', `/api/organizations/1/orders/${NO_ATTEMPT}/cancel`, only('employer')],
  ['POST /api/organizations/:orgId/seat-grants', '/api/organizations/1/seat-grants', only('admin')],
  ['GET /api/organizations/:orgId/operators', '/api/organizations/1/operators', ORG],
  ['GET /api/organizations/:orgId/operators.csv', '/api/organizations/1/operators.csv', ORG],
  ['POST /api/organizations/:orgId/operators', '/api/organizations/1/operators', ORG],
  ['PUT /api/organizations/:orgId/operators/:userId/levels', '/api/organizations/1/operators/999999/levels', ORG],
  ['POST /api/organizations/:orgId/operators/:userId/invitation', '/api/organizations/1/operators/999999/invitation', ORG],
  ['POST /api/organizations/:orgId/roster/preview', '/api/organizations/1/roster/preview', ORG],
  ['POST /api/organizations/:orgId/roster/import', '/api/organizations/1/roster/import', ORG],
  ['GET /api/credentials', '/api/credentials', SIGNED_IN],
  ['GET /api/credentials/:id/pdf', '/api/credentials/999999/pdf', only('operator', 'employer', 'otherOrgEmployer', 'admin')],
  ['POST /api/credentials/:id/revoke', '/api/credentials/999999/revoke', only('admin', 'assessor')],
  ['GET /api/verify/:number', '/api/verify/DPC-0000-0000-0', PUBLIC],
  ['POST /api/verify/bulk', '/api/verify/bulk', only('hr', 'employer', 'otherOrgEmployer', 'admin')],
  ['POST /api/organizations/:orgId/fleet-calibration/umbmark', '/api/organizations/1/fleet-calibration/umbmark', only('employer')],
  ['POST /api/organizations/:orgId/fleet-calibration/alpha-fit', '/api/organizations/1/fleet-calibration/alpha-fit', only('employer')],
  ['POST /api/organizations/:orgId/fleet-profiles', '/api/organizations/1/fleet-profiles', only('employer')],
  ['GET /api/organizations/:orgId/fleet-profiles', '/api/organizations/1/fleet-profiles', ORG],
  ['GET /api/organizations/:orgId/fleet-profiles/:profileId', `/api/organizations/1/fleet-profiles/${NO_ATTEMPT}`, ORG],
  ['GET /api/organizations/:orgId/fleet-profiles/:profileId/files/:kind', `/api/organizations/1/fleet-profiles/${NO_ATTEMPT}/files/umbmark`, ORG],
  ['PUT /api/organizations/:orgId/fleet-profiles/:profileId/practice-trials', `/api/organizations/1/fleet-profiles/${NO_ATTEMPT}/practice-trials`, only('employer')],
  ['POST /api/organizations/:orgId/fleet-profiles/:profileId/archive', `/api/organizations/1/fleet-profiles/${NO_ATTEMPT}/archive`, only('employer')],
  ['GET /api/fleet-practice', '/api/fleet-practice', only('operator')],
  ['GET /api/fleet-calibration/samples/:kind', '/api/fleet-calibration/samples/umbmark', PUBLIC],
  // Last: it ends the callers' sessions.
  ['POST /api/auth/sign-out', '/api/auth/sign-out', PUBLIC],
];

const agents = {} as Record<Caller, Agent>;
beforeAll(async () => {
  await resetRateLimits(t.ctx);
  agents.anonymous = request.agent(t.app);
  for (const c of ['admin', 'employer', 'hr', 'assessor'] as const) agents[c] = await signedInAgent(t.app, c);
  agents.operator = await signedInAgent(t.app, 'operator1');
  const [other] = await Organization.findOrCreate({ where: { name: 'Matrix Other Org' }, defaults: { name: 'Matrix Other Org' } });
  const email = 'matrix.other@other.example.test';
  await User.findOrCreate({ where: { email }, defaults: { email, name: 'Other Employer', role: 'employer', organizationId: other.id, passwordHash: await hashPassword('other-employer-pw', 4), lastSignInAt: null } });
  agents.otherOrgEmployer = request.agent(t.app);
  await agents.otherOrgEmployer.post('/api/auth/sign-in').send({ email, password: 'other-employer-pw' }).expect(200);
});

describe('permission matrix', () => {
  it('lists every API route the app has, and no route it does not have', () => {
    expect(MATRIX.map(([route]) => route).sort()).toEqual(listRoutes(t.app));
  });

  for (const [route, path, expected] of MATRIX) {
    it(route, async () => {
      const method = route.split(' ')[0].toLowerCase() as 'get' | 'post' | 'put' | 'patch';
      for (const caller of CALLERS) {
        await resetRateLimits(t.ctx);
        const res = await agents[caller][method](path).send({});
        const got: Outcome = res.status === 401 ? 401 : res.status === 403 && ['forbidden', 'unauthenticated'].includes(res.body?.error?.code) ? 403 : 'ok';
        expect(`${caller}: ${got}`, `${route} as ${caller} → ${res.status} ${res.text.slice(0, 120)}`).toBe(`${caller}: ${expected[caller]}`);
        expect(res.status, `${route} as ${caller} must never be a server error`).toBeLessThan(500);
      }
    });
  }
});
