/** An app for supertest against the real test database and mail sink of the api project. */
import { inject } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { closeContext, createContext, type AppContext, type ContextOptions } from '../../server/context';
import { DEMO_DOMAIN } from '../../server/db/seeders/0001-demo-organization';
import { Op } from 'sequelize';
import { containsPattern } from '../../server/db/like';
import { MailMessage } from '../../server/db/models';
import type { Role } from '../../shared/schemas';
import { testEnv } from './test-env';

export const demoEmail = (account: Role | 'operator1' | 'operator2') => `${account === 'operator' ? 'operator1' : account}@${DEMO_DOMAIN}`;

export interface TestApp {
  app: ReturnType<typeof createApp>;
  ctx: AppContext;
  close(): Promise<void>;
}

export function createTestApp(env: Record<string, string> = {}, options: ContextOptions = {}): TestApp {
  const config = loadConfig(testEnv(env));
  const ctx = createContext(config, { databaseUrl: inject('databaseUrl'), smtpUrl: inject('smtpUrl') }, options);
  return { app: createApp(ctx), ctx, close: () => closeContext(ctx) };
}

/** A supertest agent (keeps cookies) signed in as a demo account. */
export async function signedInAgent(app: TestApp['app'], account: Parameters<typeof demoEmail>[0]) {
  const agent = request.agent(app);
  await agent.post('/api/auth/sign-in').send({ email: demoEmail(account), password: inject('demoPassword') }).expect(200);
  return agent;
}

/** Clears the rate-limit counters so that one test's failures do not limit the next. */
export async function resetRateLimits(ctx: AppContext) {
  await ctx.sequelize.query('DELETE FROM rate_limit_hits');
}

/** The newest message the sink captured for an address, waiting briefly for delivery. */
export async function latestMailTo(address: string, after = new Date(0), waitMs = 5000): Promise<MailMessage> {
  for (let waited = 0; waited <= waitMs; waited += 100) {
    const found = await MailMessage.findOne({ where: { envelopeTo: address }, order: [['id', 'DESC']] });
    if (found && found.receivedAt > after) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`No mail reached ${address}`);
}

/** A message to an address whose text contains `text`, waiting briefly for delivery (other jobs may mail the same address). */
export async function mailContaining(address: string, text: string, waitMs = 10_000): Promise<MailMessage> {
  for (let waited = 0; waited <= waitMs; waited += 100) {
    const messages = await MailMessage.findAll({ where: { envelopeTo: { [Op.iLike]: containsPattern(address) } }, order: [['id', 'DESC']], limit: 50 });
    const found = messages.find((m) => (m.textBody ?? '').includes(text));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`No mail to ${address} mentions ${text}`);
}

/** The one-time token in a password link of a captured message. */
export function tokenFrom(message: MailMessage): string {
  const match = /reset-password\?token=([A-Za-z0-9_-]{43})/.exec(message.textBody ?? '');
  if (!match) throw new Error('No password link in the message');
  return match[1];
}
