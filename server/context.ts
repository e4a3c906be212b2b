import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { Sequelize } from 'sequelize';
import type { Config } from './config';
import { createDatabase } from './db';
import { createMailer, type Mailer } from './services/mailer';

/** What the web app needs from the outside world; built once per process by server/index.ts or a test. */
export interface AppContext {
  config: Config;
  sequelize: Sequelize;
  mailer: Mailer;
  sessionStore: session.Store;
}

const PgSessionStore = connectPgSimple(session);

/** Connects to the database and the SMTP server named by the config and the resolved URLs. */
export function createContext(config: Config, urls: { databaseUrl: string; smtpUrl: string }): AppContext {
  const sequelize = createDatabase(urls.databaseUrl);
  const sessionStore = new PgSessionStore({
    conString: urls.databaseUrl, // the store owns this pool and ends it on close()
    tableName: 'session',
    createTableIfMissing: false,
    pruneSessionInterval: config.env === 'test' ? false : 15 * 60,
  });
  const mailer = createMailer({ smtpUrl: urls.smtpUrl, from: config.mailFrom });
  return { config, sequelize, mailer, sessionStore };
}

export async function closeContext(ctx: AppContext) {
  ctx.mailer.close();
  const store = ctx.sessionStore as session.Store & { close?: () => Promise<void> };
  await store.close?.();
  await ctx.sequelize.close();
}
