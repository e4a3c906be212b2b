/**
 * `npm start`: everything on one machine, on loopback. Starts the project-local PostgreSQL
 * (unless DATABASE_URL is set), applies migrations and the demo seed, builds the client when
 * stale, starts the local mail sink (unless SMTP_URL is set) and the web server.
 */
import { loadConfig } from '../config';
import { startMailSink } from '../fakes/mail-sink';
import { startStripeStandin } from '../fakes/stripe-standin';
import { closeOnSignals, startServer } from '../index';
import { buildClientIfStale } from './client-build';
import { resolveDatabaseUrl } from './database';

const config = loadConfig();
const log = (line: string) => console.log(`[driftproof] ${line}`);

const databaseUrl = await resolveDatabaseUrl(config, log);
// `npm run dev` serves the client from Vite instead.
if (!process.env.DRIFTPROOF_DEV) buildClientIfStale(log);

let smtpUrl = config.smtpUrl;
let closeSink = async () => {};
if (!smtpUrl) {
  // The sink stores what it captures through this process's models, which startServer connects.
  const sink = await startMailSink({ port: config.mailSinkPort });
  smtpUrl = `smtp://127.0.0.1:${sink.port}`;
  closeSink = sink.close;
  log(`Mail sink (SMTP) on 127.0.0.1:${sink.port}; captured mail is on the admin's Mail sink page.`);
}

let stripeApiUrl = config.stripe.apiUrl;
let closeStandin = async () => {};
if (!stripeApiUrl && config.stripe.secretKey.startsWith('sk_test_driftproof')) {
  const standin = await startStripeStandin({ port: config.stripe.standinPort, webhookUrl: `${config.appUrl}/api/payments/webhook`, webhookSecret: config.stripe.webhookSecret });
  stripeApiUrl = standin.url;
  closeStandin = standin.close;
  log(`Payment stand-in on ${standin.url} (test cards on its payment page).`);
}

const server = await startServer(config, { databaseUrl, smtpUrl, stripeApiUrl }, { seed: true });
log(`Database: ${config.databaseUrl ? 'DATABASE_URL' : `local PostgreSQL 15 on 127.0.0.1:${config.pgPort}`}`);
log(`Driftproof is running at ${config.appUrl}  (sign in as admin@demo.driftproof.test)`);
closeOnSignals(server.close, closeSink, closeStandin);
