/**
 * The one guard every route uses: who may call it (roles) and, for organization resources,
 * whose organization it is. Anonymous → 401; wrong role or another organization → 403.
 */
import type { Request, RequestHandler } from 'express';
import type { Role } from '../../shared/schemas';
import { HttpError } from '../http/errors';

export interface GuardOptions {
  /** Where the organization id of the resource comes from; admins pass any organization. */
  organizationId?: (req: Request) => number | null | undefined;
}

export const unauthenticated = () => new HttpError(401, 'unauthenticated', 'Sign in to continue.');
export const forbidden = () => new HttpError(403, 'forbidden', 'Your account may not do this.');

export function guard(roles: readonly Role[] | 'signed-in', options: GuardOptions = {}): RequestHandler {
  return (req, _res, next) => {
    const user = req.user;
    if (!user) return next(unauthenticated());
    if (roles !== 'signed-in' && !roles.includes(user.role)) return next(forbidden());
    if (options.organizationId && user.role !== 'admin') {
      const wanted = options.organizationId(req);
      if (wanted == null || wanted !== user.organizationId) return next(forbidden());
    }
    next();
  };
}

/** The signed-in user of a guarded route. */
export function currentUser(req: Request): Express.User {
  if (!req.user) throw unauthenticated();
  return req.user;
}
