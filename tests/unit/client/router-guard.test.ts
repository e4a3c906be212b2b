// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory } from 'vue-router';
import type { PublicUser, Role } from '@shared/schemas';
import { ROLES } from '@shared/schemas';
import {
  createAppRouter,
  decideNavigation,
  destinationAfterSignIn,
  routes,
  safeRedirectPath,
  wrongRoleNotice,
} from '@/router';
import { ROLE_HOMES, navigationFor } from '@/navigation';
import { useSessionStore } from '@/stores/session';

function user(role: Role, id = 1): PublicUser {
  return {
    id,
    email: `${role}@demo.driftproof.test`,
    name: `Demo ${role}`,
    role,
    organizationId: role === 'admin' || role === 'assessor' ? null : 1,
    organizationName: role === 'admin' || role === 'assessor' ? null : 'Demo Logistics',
    active: true,
    lastSignInAt: null,
    emailConfirmed: true,
    createdAt: '2026-01-01T00:00:00.000Z',
  };
}

function jsonResponse(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

const unauthenticated = () => jsonResponse(401, { error: { code: 'unauthenticated', message: 'Sign in first.' } });

describe('decideNavigation (pure)', () => {
  const router = createAppRouter({ history: createMemoryHistory() });
  const resolve = (path: string) => router.resolve(path);

  it('sends a signed-out visitor to sign-in with the wanted path', () => {
    const decision = decideNavigation(resolve('/admin/users?q=ann'), null);
    expect(decision).toEqual({ allow: false, redirect: { name: 'sign-in', query: { redirect: '/admin/users?q=ann' } } });
  });

  it('lets anyone open the public pages', () => {
    for (const path of ['/sign-in', '/forgot-password', '/reset-password?token=abc', '/no/such/page']) {
      expect(decideNavigation(resolve(path), null)).toEqual({ allow: true });
    }
    expect(decideNavigation(resolve('/reset-password?token=abc'), user('operator'))).toEqual({ allow: true });
  });

  it('sends a signed-in user away from sign-in to their role home', () => {
    for (const role of ROLES) {
      expect(decideNavigation(resolve('/sign-in'), user(role))).toEqual({ allow: false, redirect: ROLE_HOMES[role] });
    }
  });

  it('sends / to the role home, or shows the landing page when nobody is signed in', () => {
    expect(decideNavigation(resolve('/'), user('hr'))).toEqual({ allow: false, redirect: '/hr' });
    expect(decideNavigation(resolve('/'), null)).toEqual({ allow: true });
  });

  it('sends a wrong-role user to their own home with a notice', () => {
    expect(decideNavigation(resolve('/admin/users'), user('operator'))).toEqual({
      allow: false,
      redirect: '/operator',
      notice: 'That page is for Administrator accounts.',
    });
    expect(decideNavigation(resolve('/employer'), user('assessor'))).toMatchObject({ redirect: '/assessor' });
  });

  it('lets each role open its own home, and only admin the admin pages', () => {
    for (const role of ROLES) {
      expect(decideNavigation(resolve(ROLE_HOMES[role]), user(role))).toEqual({ allow: true });
      for (const path of ['/admin/users', '/admin/mail']) {
        expect(decideNavigation(resolve(path), user(role)).allow).toBe(role === 'admin');
      }
    }
  });

  it('every page that needs a sign-in names the roles allowed on it', () => {
    for (const route of routes) {
      if (route.meta?.public || route.name === 'root') continue;
      expect(route.meta?.roles?.length, String(route.path)).toBeGreaterThan(0);
    }
  });

  it('navigation links point only at pages the role may open', () => {
    for (const role of ROLES) {
      for (const link of navigationFor(role)) {
        expect(decideNavigation(resolve(link.to), user(role)), `${role} → ${link.to}`).toEqual({ allow: true });
      }
    }
    expect(navigationFor('admin').map((l) => l.label)).toEqual(['Home', 'Users', 'Orders', 'Pricing', 'Credentials', 'Mail sink']);
    expect(navigationFor('employer').map((l) => l.label)).toEqual(['Home', 'Enrol', 'Seats', 'Fleet calibration', 'Credentials', 'Organization']);
    expect(navigationFor('operator').map((l) => l.label)).toEqual(['Home', 'Trials', 'Credentials']);
    expect(navigationFor('hr').map((l) => l.label)).toEqual(['Home', 'Verify', 'Bulk check', 'Credentials']);
  });

  it('words the notice for several roles', () => {
    expect(wrongRoleNotice(['employer', 'hr'])).toBe('That page is for Employer and HR accounts.');
    expect(wrongRoleNotice(['admin', 'employer', 'hr'])).toBe('That page is for Administrator, Employer and HR accounts.');
  });
});

describe('safe redirects after sign-in', () => {
  const router = createAppRouter({ history: createMemoryHistory() });

  it('accepts only paths inside the app', () => {
    expect(safeRedirectPath('/admin/users?page=2')).toBe('/admin/users?page=2');
    expect(safeRedirectPath(['/hr', '/admin'])).toBe('/hr');
    for (const bad of ['https://evil.example/', '//evil.example', '/\\evil.example', 'admin', '', null, undefined, '/sign-in', '/sign-in?redirect=/x']) {
      expect(safeRedirectPath(bad), String(bad)).toBeNull();
    }
  });

  it('goes back to the wanted page when the role may open it, otherwise home', () => {
    expect(destinationAfterSignIn(router, '/admin/mail', user('admin'))).toBe('/admin/mail');
    expect(destinationAfterSignIn(router, '/admin/mail', user('employer'))).toBe('/employer');
    expect(destinationAfterSignIn(router, '//evil.example/x', user('admin'))).toBe('/admin');
    expect(destinationAfterSignIn(router, '/does-not-exist', user('hr'))).toBe('/hr');
    expect(destinationAfterSignIn(router, undefined, user('assessor'))).toBe('/assessor');
  });
});

describe('the installed guard', () => {
  const fetchMock = vi.fn<typeof fetch>();

  beforeEach(() => {
    setActivePinia(createPinia());
    fetchMock.mockReset();
    vi.stubGlobal('fetch', fetchMock);
  });

  afterEach(() => {
    vi.unstubAllGlobals();
  });

  it('asks the server who is signed in once, then sends a visitor to sign-in and back', async () => {
    fetchMock.mockImplementation(async () => unauthenticated());
    const router = createAppRouter({ history: createMemoryHistory() });

    await router.push('/admin/users');
    expect(router.currentRoute.value.name).toBe('sign-in');
    expect(router.currentRoute.value.query.redirect).toBe('/admin/users');

    await router.push('/admin/mail');
    expect(fetchMock).toHaveBeenCalledTimes(1);

    // Sign in as admin: the sign-in page then goes to the wanted page.
    fetchMock.mockImplementation(async () => jsonResponse(200, { user: user('admin') }));
    const session = useSessionStore();
    const signedIn = await session.signIn({ email: 'admin@demo.driftproof.test', password: 'drive-safe-demo' });
    await router.push(destinationAfterSignIn(router, '/admin/users', signedIn));
    expect(router.currentRoute.value.fullPath).toBe('/admin/users');
  });

  it('sends a signed-in user from / and from sign-in to their home', async () => {
    fetchMock.mockImplementation(async () => jsonResponse(200, { user: user('employer') }));
    const router = createAppRouter({ history: createMemoryHistory() });

    await router.push('/');
    expect(router.currentRoute.value.path).toBe('/employer');
    await router.push('/sign-in');
    expect(router.currentRoute.value.path).toBe('/employer');
  });

  it('sends a wrong-role user home and tells them why', async () => {
    fetchMock.mockImplementation(async () => jsonResponse(200, { user: user('operator') }));
    const notify = vi.fn();
    const router = createAppRouter({ history: createMemoryHistory(), notify });

    await router.push('/admin/mail');

    expect(router.currentRoute.value.path).toBe('/operator');
    expect(notify).toHaveBeenCalledWith('That page is for Administrator accounts.');
  });

  it('treats an unreachable server as signed out rather than failing the navigation', async () => {
    fetchMock.mockRejectedValue(new TypeError('Failed to fetch'));
    const router = createAppRouter({ history: createMemoryHistory() });

    await router.push('/hr');

    expect(router.currentRoute.value.name).toBe('sign-in');
    expect(useSessionStore().loaded).toBe(true);
  });

  it('after sign-out, protected pages send to sign-in again', async () => {
    fetchMock.mockImplementation(async () => jsonResponse(200, { user: user('hr') }));
    const router = createAppRouter({ history: createMemoryHistory() });
    await router.push('/hr');
    expect(router.currentRoute.value.path).toBe('/hr');

    fetchMock.mockImplementation(async () => new Response(null, { status: 204 }));
    await useSessionStore().signOut();
    await router.push('/hr?tab=verify');

    expect(router.currentRoute.value.name).toBe('sign-in');
    expect(router.currentRoute.value.query.redirect).toBe('/hr?tab=verify');
  });

  it('sets the page title from the route', async () => {
    fetchMock.mockImplementation(async () => unauthenticated());
    const router = createAppRouter({ history: createMemoryHistory() });
    await router.push('/forgot-password');
    expect(document.title).toBe('Forgotten password · Driftproof');
  });
});
