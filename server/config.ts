/**
 * Configuration from the environment, validated once. Every setting has a default that works on
 * a developer's machine; production sets DATABASE_URL, SESSION_SECRET, APP_URL and SMTP_URL.
 */
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

export const PROJECT_ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  APP_URL: z.url().optional(),
  DATABASE_URL: z.string().optional(),
  DRIFTPROOF_PG_PORT: z.coerce.number().int().min(1024).max(65535).default(54329),
  DRIFTPROOF_DATA_DIR: z.string().default(path.join(PROJECT_ROOT, '.data')),
  SMTP_URL: z.string().optional(),
  MAIL_SINK_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  MAIL_FROM: z.string().default('Driftproof <no-reply@driftproof.test>'),
  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET needs at least 32 characters.').optional(),
  DEMO_PASSWORD: z.string().min(10, 'DEMO_PASSWORD needs at least 10 characters.').default('drive-safe-demo'),
  BCRYPT_COST: z.coerce.number().int().min(4).max(15).default(11),
  TRUST_PROXY: z.string().default('loopback'),
  SIGN_IN_LIMIT: z.coerce.number().int().min(1).default(5),
  JOB_WORKERS: z.enum(['0', '1']).default('1'),
  STRIPE_SECRET_KEY: z.string().min(8).default('sk_test_driftproof_local_standin'),
  STRIPE_WEBHOOK_SECRET: z.string().min(8).default('whsec_driftproof_local_standin'),
  STRIPE_API_URL: z.url().optional(),
  STRIPE_STANDIN_PORT: z.coerce.number().int().min(0).max(65535).default(12111),
  RESET_LIMIT: z.coerce.number().int().min(1).default(5),
});

export type Env = z.infer<typeof envSchema>;

export interface Config {
  env: Env['NODE_ENV'];
  host: string;
  port: number;
  appUrl: string;
  dataDir: string;
  databaseUrl?: string;
  pgPort: number;
  smtpUrl?: string;
  mailSinkPort: number;
  mailFrom: string;
  sessionSecret: string;
  demoPassword: string;
  bcryptCost: number;
  trustProxy: string;
  signInLimit: number;
  resetLimit: number;
  /** Whether this web process also runs the job workers. */
  jobWorkers: boolean;
  stripe: {
    secretKey: string;
    webhookSecret: string;
    /** Where the SDK sends its requests: the local stand-in (default) or, when unset and a live key is given, the real service. */
    apiUrl?: string;
    standinPort: number;
  };
}

/** A session secret kept under .data so that sessions survive restarts on a developer's machine. */
function localSecret(dataDir: string): string {
  const file = path.join(dataDir, 'session-secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(32).toString('base64url');
  writeFileSync(file, secret + '\n', { mode: 0o600 });
  return secret;
}

export function loadConfig(source: NodeJS.ProcessEnv = process.env): Config {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Configuration is not valid:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  if (e.NODE_ENV === 'production' && !e.SESSION_SECRET) throw new Error('Set SESSION_SECRET in production.');
  return {
    env: e.NODE_ENV,
    host: e.HOST,
    port: e.PORT,
    appUrl: (e.APP_URL ?? `http://127.0.0.1:${e.PORT}`).replace(/\/$/, ''),
    dataDir: e.DRIFTPROOF_DATA_DIR,
    databaseUrl: e.DATABASE_URL,
    pgPort: e.DRIFTPROOF_PG_PORT,
    smtpUrl: e.SMTP_URL,
    mailSinkPort: e.MAIL_SINK_PORT,
    mailFrom: e.MAIL_FROM,
    sessionSecret: e.SESSION_SECRET ?? localSecret(e.DRIFTPROOF_DATA_DIR),
    demoPassword: e.DEMO_PASSWORD,
    bcryptCost: e.BCRYPT_COST,
    trustProxy: e.TRUST_PROXY,
    signInLimit: e.SIGN_IN_LIMIT,
    resetLimit: e.RESET_LIMIT,
    jobWorkers: e.JOB_WORKERS === '1',
    stripe: { secretKey: e.STRIPE_SECRET_KEY, webhookSecret: e.STRIPE_WEBHOOK_SECRET, apiUrl: e.STRIPE_API_URL, standinPort: e.STRIPE_STANDIN_PORT },
  };
}
