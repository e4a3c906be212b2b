import type session from 'express-session';
import Stripe from 'stripe';
import type { Sequelize } from 'sequelize';
import { randomBytes } from 'node:crypto';
import type { Config } from './config';
import { loadContent, type Content } from './content/load';
import { createDatabase } from './db';
import { createSessionStore } from './http/session-store';
import { createDriveCache, type DriveCache } from './services/drive-cache';
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

export interface ContextOptions {
  content?: Content;
  newSeed?: () => string;
}

/** Connects to the database and the SMTP server named by the config and the resolved URLs. */
export function createContext(config: Config, urls: { databaseUrl: string; smtpUrl: string; stripeApiUrl?: string }, options: ContextOptions = {}): AppContext {
  const sequelize = createDatabase(urls.databaseUrl);
  const sessionStore = createSessionStore(urls.databaseUrl, { prune: config.env !== 'test' });
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
