import type { LocationQueryValue, RouteLocationNormalized, RouteLocationRaw, Router } from 'vue-router';
import type { PublicUser, Role } from '@shared/schemas';
import { describeRoles, roleHome } from '@/navigation';

declare module 'vue-router' {
  interface RouteMeta {
    /** Open to anyone, signed in or not. */
    public?: boolean;
    /** A page only for people who are not signed in (sign-in): a signed-in user goes home. */
    guestOnly?: boolean;
    /** Roles that may open the page. Pages without `public` need a signed-in user. */
    roles?: Role[];
    /** Shown in the browser tab, before " · Driftproof". */
    title?: string;
    /** The page uses the full width of the window (the drive console). */
    wide?: boolean;
    /** The page brings its own layout (the public landing page): neither the shell nor the card. */
    standalone?: boolean;
  }
}

export type NavigationDecision =
  | { allow: true }
  | { allow: false; redirect: RouteLocationRaw; notice?: string };

type Target = Pick<RouteLocationNormalized, 'fullPath' | 'meta'> & {
  name?: RouteLocationNormalized['name'] | null;
};

const ALLOW: NavigationDecision = { allow: true };

/**
 * A redirect target taken from the query string, kept only when it is a path inside this app
 * (never another origin: "//evil.example" or "/\evil.example" are refused).
 */
export function safeRedirectPath(raw: LocationQueryValue | LocationQueryValue[] | undefined): string | null {
  const value = Array.isArray(raw) ? raw[0] : raw;
  if (typeof value !== 'string' || value.length === 0 || value.length > 2000) return null;
  if (!value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null;
  if (value === '/sign-in' || value.startsWith('/sign-in?') || value.startsWith('/sign-in#')) return null;
  return value;
}

/** That page is for Administrator accounts. */
export function wrongRoleNotice(roles: readonly Role[]): string {
  return `That page is for ${describeRoles(roles)} accounts.`;
}

/** Pure decision: may this user open this route, and if not, where do they go instead? */
export function decideNavigation(to: Target, user: PublicUser | null): NavigationDecision {
  if (to.name === 'root') {
    // Signed in: `/` is the role's home. Signed out: the public landing page.
    return user ? { allow: false, redirect: roleHome(user.role) } : ALLOW;
  }
  if (to.meta.public) {
    if (to.meta.guestOnly && user) {
      return { allow: false, redirect: roleHome(user.role) };
    }
    return ALLOW;
  }
  if (!user) {
    return { allow: false, redirect: { name: 'sign-in', query: { redirect: to.fullPath } } };
  }
  const roles = to.meta.roles;
  if (roles && !roles.includes(user.role)) {
    return { allow: false, redirect: roleHome(user.role), notice: wrongRoleNotice(roles) };
  }
  return ALLOW;
}

/**
 * Where to go right after signing in: the page the person wanted, when their role may open
 * it, otherwise their role's home.
 */
export function destinationAfterSignIn(
  router: Pick<Router, 'resolve'>,
  redirect: LocationQueryValue | LocationQueryValue[] | undefined,
  user: PublicUser,
): string {
  const wanted = safeRedirectPath(redirect);
  if (wanted) {
    const resolved = router.resolve(wanted);
    if (resolved.matched.length > 0 && resolved.name !== 'not-found' && decideNavigation(resolved, user).allow) {
      return resolved.fullPath;
    }
  }
  return roleHome(user.role);
}

export interface GuardDependencies {
  /** Makes sure we know who is signed in (GET /api/auth/me once). */
  loadSession: () => Promise<void>;
  currentUser: () => PublicUser | null;
  /** Tells the person why they were sent elsewhere (a toast in the app). */
  notify: (message: string) => void;
}

export function installGuards(router: Router, deps: GuardDependencies): void {
  router.beforeEach(async (to) => {
    await deps.loadSession();
    const decision = decideNavigation(to, deps.currentUser());
    if (decision.allow) return true;
    if (decision.notice) deps.notify(decision.notice);
    return decision.redirect;
  });
  router.afterEach((to) => {
    if (typeof document !== 'undefined') {
      document.title = to.meta.title ? `${to.meta.title} · Driftproof` : 'Driftproof';
    }
  });
}
