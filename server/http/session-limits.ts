/**
 * Session lifetimes: an idle timeout (the cookie's rolling maxAge, refreshed by each request) and
 * an absolute one counted from sign-in, after which the session ends however busy it was.
 */
import type { RequestHandler } from 'express';

declare module 'express-session' {
  interface SessionData {
    signedInAt?: number;
  }
}

export const IDLE_HOURS = 2;
export const ABSOLUTE_HOURS = 12;

export function absoluteSessionLimit(hours = ABSOLUTE_HOURS): RequestHandler {
  return (req, res, next) => {
    const started = req.session?.signedInAt;
    if (!started || Date.now() - started < hours * 3_600_000) return next();
    // A fresh, empty session replaces the old one, which is removed from the store.
    req.session.regenerate((error) => next(error));
  };
}
