/**
 * CSRF protection by a strict same-origin check on every state-changing request: a browser sends
 * Origin (and Sec-Fetch-Site) with every cross-site POST, PUT, PATCH and DELETE, so one that names
 * another origin is refused before it reaches a route. Requests without either header do not come
 * from a browser page (scripts, tests, the payment webhook) and carry no ambient cookie risk.
 */
import type { RequestHandler } from 'express';
import { HttpError } from './errors';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

export function sameOriginOnly(allowedOrigins: string[]): RequestHandler {
  const allowed = new Set(allowedOrigins.map((o) => new URL(o).origin));
  return (req, _res, next) => {
    if (SAFE.has(req.method)) return next();
    const site = req.get('sec-fetch-site');
    const origin = req.get('origin');
    if (site && site !== 'same-origin' && site !== 'none') return next(new HttpError(403, 'cross_site', 'Requests from other sites are refused.'));
    if (origin && origin !== 'null' && !allowed.has(origin)) return next(new HttpError(403, 'cross_site', 'Requests from other sites are refused.'));
    if (origin === 'null') return next(new HttpError(403, 'cross_site', 'Requests from other sites are refused.'));
    next();
  };
}
