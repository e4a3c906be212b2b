// @vitest-environment happy-dom
import { describe, expect, it } from 'vitest';
import { createMemoryHistory } from 'vue-router';
import type { PublicUser, Role } from '@shared/schemas';
import { ROLES } from '@shared/schemas';
import { createAppRouter, decideNavigation } from '@/router';

const user = (role: Role): PublicUser => ({
  id: 1,
  email: `${role}@demo.driftproof.test`,
  name: `Demo ${role}`,
  role,
  organizationId: role === 'admin' || role === 'assessor' ? null : 1,
  organizationName: role === 'admin' || role === 'assessor' ? null : 'Demo Logistics',
  active: true,
  lastSignInAt: null,
  emailConfirmed: true,
  createdAt: '2026-01-01T00:00:00.000Z',
});

describe('credential routes', () => {
  const router = createAppRouter({ history: createMemoryHistory() });
  const resolve = (path: string) => router.resolve(path);

  it('the verification page opens for everyone, signed in or not, from a typed number or a QR link', () => {
    for (const path of ['/verify', '/verify/DPC-7K2M-Q9XD-7', '/verify/DPC-7K2M-Q9XD-7?s=abc_-123']) {
      expect(resolve(path).name).toBe('verify');
      expect(decideNavigation(resolve(path), null)).toEqual({ allow: true });
      for (const role of ROLES) expect(decideNavigation(resolve(path), user(role))).toEqual({ allow: true });
    }
    expect(resolve('/verify/DPC-7K2M-Q9XD-7?s=abc').params.number).toBe('DPC-7K2M-Q9XD-7');
  });

  it('the credentials list needs a sign-in; bulk verification is for HR, employers and admins', () => {
    expect(decideNavigation(resolve('/credentials'), null)).toMatchObject({ allow: false, redirect: { name: 'sign-in' } });
    for (const role of ROLES) {
      expect(decideNavigation(resolve('/credentials'), user(role)).allow).toBe(true);
      expect(decideNavigation(resolve('/bulk-verification'), user(role)).allow, role).toBe(['hr', 'employer', 'admin'].includes(role));
    }
  });
});
