/**
 * express-rate-limit with its counters in PostgreSQL, so that every web process behind a load
 * balancer shares them. One atomic upsert per hit.
 */
import rateLimit, { ipKeyGenerator, type Options, type Store } from 'express-rate-limit';
import type { Request } from 'express';
import type { Sequelize } from 'sequelize';
import { HttpError } from './errors';

class PostgresRateLimitStore implements Store {
  localKeys = false;
  private windowMs = 60_000;

  constructor(
    private readonly sequelize: Sequelize,
    readonly prefix: string,
  ) {}

  init(options: Options) {
    this.windowMs = options.windowMs;
  }

  async increment(key: string) {
    const [rows] = (await this.sequelize.query(
      `INSERT INTO rate_limit_hits AS r (key, hits, reset_at)
       VALUES (:key, 1, now() + make_interval(secs => :seconds))
       ON CONFLICT (key) DO UPDATE SET
         hits = CASE WHEN r.reset_at <= now() THEN 1 ELSE r.hits + 1 END,
         reset_at = CASE WHEN r.reset_at <= now() THEN now() + make_interval(secs => :seconds) ELSE r.reset_at END
       RETURNING hits, reset_at`,
      { replacements: { key: this.prefix + key, seconds: this.windowMs / 1000 } },
    )) as [{ hits: number; reset_at: Date }[], unknown];
    return { totalHits: rows[0].hits, resetTime: new Date(rows[0].reset_at) };
  }

  async decrement(key: string) {
    await this.sequelize.query('UPDATE rate_limit_hits SET hits = greatest(hits - 1, 0) WHERE key = :key', {
      replacements: { key: this.prefix + key },
    });
  }

  async resetKey(key: string) {
    await this.sequelize.query('DELETE FROM rate_limit_hits WHERE key = :key', { replacements: { key: this.prefix + key } });
  }
}

interface LimiterOptions {
  name: string;
  limit: number;
  windowMinutes: number;
  message: string;
  /** Count only failed requests (status >= 400): a right password does not use up attempts. */
  failuresOnly?: boolean;
  /** Adds the e-mail of the body to the key, so one address can be locked without locking a whole office. */
  byEmail?: boolean;
}

const emailOf = (req: Request) => (typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '');

export function createLimiter(sequelize: Sequelize, o: LimiterOptions) {
  return rateLimit({
    windowMs: o.windowMinutes * 60_000,
    limit: o.limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: o.failuresOnly ?? false,
    store: new PostgresRateLimitStore(sequelize, `${o.name}:`),
    keyGenerator: (req) => {
      const ip = ipKeyGenerator(req.ip ?? 'unknown');
      return o.byEmail ? `${ip}|${emailOf(req)}` : ip;
    },
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', o.message)),
  });
}
