import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import Stripe from 'stripe';
import type { Sequelize } from 'sequelize';
import type { DriveSim } from '../shared/sim';
import { randomBytes } from 'node:crypto';
import type { Config } from './config';
import { loadContent, type Content } from './content/load';
import { createDatabase } from './db';
import { createJobQueue, type JobQueue } from './jobs/queue';
import { createMailer, type Mailer } from './services/mailer';

/** What the web app needs from the outside world; built once per process by server/index.ts or a test. */
export interface AppContext {
  config: Config;
  sequelize: Sequelize;
  mailer: Mailer;
  sessionStore: session.Store;
  /** Robots, surfaces, trials and levels, validated at start-up. */
  content: Content;
  /** Makes the seeds of a new attempt; tests pass a predictable one. */
  newSeed: () => string;
  /** Drives rebuilt from their logs, by attempt id: only a cache, checked against the log length. */
  drives: DriveCache;
  /** Background work (scoring, e-mail) through the PostgreSQL job queue. */
  jobs: JobQueue;
  /** The official SDK, pointed at the local stand-in or the real service. */
  stripe: Stripe;
}

/** The stripe SDK for a base URL (the local stand-in) or, without one, the real service. */
export function createStripeClient(secretKey: string, apiUrl?: string): Stripe {
  if (!apiUrl) return new Stripe(secretKey, { maxNetworkRetries: 2, telemetry: false });
  const url = new URL(apiUrl);
  return new Stripe(secretKey, {
    host: url.hostname,
    port: Number(url.port),
    protocol: url.protocol === 'https:' ? 'https' : 'http',
    maxNetworkRetries: 0,
    telemetry: false,
  });
}

export interface DriveCache {
  get(attemptId: string): { logLength: number; sim: DriveSim } | undefined;
  set(attemptId: string, entry: { logLength: number; sim: DriveSim }): void;
  delete(attemptId: string): void;
}

/** A small least-recently-used map: a web process keeps the drives it served last. */
export function createDriveCache(limit = 500): DriveCache {
  const map = new Map<string, { logLength: number; sim: DriveSim }>();
  return {
    get(id) {
      const entry = map.get(id);
      if (entry) {
        map.delete(id);
        map.set(id, entry);
      }
      return entry;
    },
    set(id, entry) {
      map.delete(id);
      map.set(id, entry);
      if (map.size > limit) map.delete(map.keys().next().value!);
    },
    delete: (id) => void map.delete(id),
  };
}

export interface ContextOptions {
  content?: Content;
  newSeed?: () => string;
}

const PgSessionStore = connectPgSimple(session);

/** Connects to the database and the SMTP server named by the config and the resolved URLs. */
export function createContext(config: Config, urls: { databaseUrl: string; smtpUrl: string; stripeApiUrl?: string }, options: ContextOptions = {}): AppContext {
  const sequelize = createDatabase(urls.databaseUrl);
  const sessionStore = new PgSessionStore({
    conString: urls.databaseUrl, // the store owns this pool and ends it on close()
    tableName: 'session',
    createTableIfMissing: false,
    pruneSessionInterval: config.env === 'test' ? false : 15 * 60,
  });
  const mailer = createMailer({ smtpUrl: urls.smtpUrl, from: config.mailFrom });
  return {
    config,
    sequelize,
    mailer,
    sessionStore,
    content: options.content ?? loadContent(),
    newSeed: options.newSeed ?? (() => randomBytes(16).toString('hex')),
    drives: createDriveCache(),
    stripe: createStripeClient(config.stripe.secretKey, urls.stripeApiUrl ?? config.stripe.apiUrl),
    jobs: createJobQueue(urls.databaseUrl, { pollingSeconds: config.env === 'test' ? 0.5 : 2 }),
  };
}

export async function closeContext(ctx: AppContext) {
  await ctx.jobs.stop();
  ctx.mailer.close();
  const store = ctx.sessionStore as session.Store & { close?: () => Promise<void> };
  await store.close?.();
  await ctx.sequelize.close();
}
