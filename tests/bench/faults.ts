/**
 * `npm run faults`: what happens to a drive, to e-mail and to payments when parts fail. Runs on a
 * PostgreSQL cluster of its own (.data/faults, port 54339) so that stopping it disturbs nothing
 * else. Prints what it saw; exits non-zero if a drive lost or changed a step.
 *   1. PostgreSQL stopped and restarted during a drive: the client resends the same batch until it
 *      is acknowledged; no step lost; the stored drive equals an uninterrupted one.
 *   2. The app process killed mid-drive: a new process resumes the drive by replaying its log.
 *   3. The mail sink down: the e-mail job fails and is retried by the queue; the message arrives.
 *   4. The payment stand-in down: a clear error, and no seat changes.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { loadConfig, PROJECT_ROOT } from '../../server/config';
import { MailMessage } from '../../server/db/models';
import { startMailSink, type MailSink } from '../../server/fakes/mail-sink';
import { startServer } from '../../server/index';
import { ensureLocalCluster, recreateDatabase, stopLocalCluster } from '../../server/scripts/postgres';
import { DriveSim, type Command } from '../../shared/sim';
import { driveSetup } from '../support/content';
import { testEnv } from '../support/test-env';

const DATA = path.join(PROJECT_ROOT, '.data', 'faults');
const PORT = 54339;
const config = loadConfig(testEnv({ DRIFTPROOF_DATA_DIR: DATA, DRIFTPROOF_PG_PORT: String(PORT) }));
const log = (line: string) => console.log(`  ${line}`);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
let failures = 0;
const check = (ok: boolean, what: string) => {
  log(`${ok ? 'ok  ' : 'FAIL'} ${what}`);
  if (!ok) failures += 1;
};

const cluster = await ensureLocalCluster({ dataRoot: DATA, port: PORT, log: () => {} });
await recreateDatabase(cluster, 'driftproof_faults');
const databaseUrl = cluster.urlFor('driftproof_faults');
let sink: MailSink = await startMailSink({ port: 0 });
const smtpUrl = `smtp://127.0.0.1:${sink.port}`;

/** A client that resends a request until the server answers it (as the console does). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- the answers of several routes, read loosely by a script
async function persistent(url: string, init: RequestInit): Promise<{ status: number; body: any; tries: number }> {
  for (let tries = 1; ; tries++) {
    try {
      const res = await fetch(url, init);
      if (res.status < 500) return { status: res.status, body: await res.json(), tries };
    } catch {
      // connection refused or reset: the server is down
    }
    if (tries > 240) throw new Error(`${url} never answered`);
    await sleep(250);
  }
}

async function signIn(base: string, email: string): Promise<string> {
  const res = await persistent(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: config.demoPassword }) });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status}`);
  const again = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: config.demoPassword }) });
  return again.headers.get('set-cookie')!.split(';')[0];
}

const commandsFor = (i: number): Command[] => Array.from({ length: 5 }, (_, k) => ({ v: 0.8, w: (i + k) % 20 < 10 ? 0.05 : -0.05 }));

/** Drives `batches` batches, calling `during(i)` before batch i; returns the commands sent. */
async function drive(baseOf: () => string, cookie: string, attemptId: string, batches: number, during: (i: number) => Promise<void>) {
  const sent: Command[] = [];
  let seq = 0;
  let maxTries = 1;
  for (let i = 0; i < batches; i++) {
    await during(i);
    const commands = commandsFor(i);
    const res = await persistent(`${baseOf()}/api/attempts/${attemptId}/steps`, { method: 'POST', headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify({ fromSeq: seq, commands }) });
    if (res.status !== 200) throw new Error(`batch ${i}: ${res.status} ${JSON.stringify(res.body)}`);
    seq = res.body.seq;
    sent.push(...commands);
    maxTries = Math.max(maxTries, res.tries);
  }
  return { sent, seq, maxTries };
}

/** The stored drive must equal the same commands run uninterrupted by the shared simulation. */
async function compare(base: string, cookie: string, attemptId: string, sent: Command[], seq: number) {
  const view = await persistent(`${base}/api/attempts/${attemptId}/submit`, { method: 'POST', headers: { cookie } });
  const secret = view.body.result.secretSeed as string;
  const sim = new DriveSim(driveSetup('long-aisle-run', secret));
  for (let i = 0; i < sent.length; i += 5) sim.applyBatch(sent.slice(i, i + 5));
  check(seq === sent.length, `every command acknowledged once (seq ${seq} = ${sent.length} commands sent)`);
  check(JSON.stringify(view.body.result.trace) === JSON.stringify(sim.trace), 'stored drive identical to an uninterrupted run (true path included)');
}

console.log('1. PostgreSQL stopped and restarted during a drive');
{
  const server = await startServer({ ...config, port: 0, jobWorkers: false }, { databaseUrl, smtpUrl }, { seed: true });
  const cookie = await signIn(server.url, 'operator1@demo.driftproof.test');
  const start = await persistent(`${server.url}/api/attempts`, { method: 'POST', headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify({ trialId: 'long-aisle-run', mode: 'practice' }) });
  let downFor = 0;
  const result = await drive(() => server.url, cookie, start.body.attempt.id, 40, async (i) => {
    if (i !== 15) return;
    stopLocalCluster(DATA);
    const t0 = Date.now();
    setTimeout(async () => {
      await ensureLocalCluster({ dataRoot: DATA, port: PORT, log: () => {} });
      downFor = Date.now() - t0;
    }, 3000);
  });
  log(`database down for ${(downFor / 1000).toFixed(1)} s; the batch sent meanwhile was tried ${result.maxTries} times`);
  await compare(server.url, cookie, start.body.attempt.id, result.sent, result.seq);
  await server.close();
}

console.log('2. The app process killed mid-drive');
{
  let child: ChildProcess;
  let port = 0;
  const launch = () =>
    new Promise<void>((resolve, reject) => {
      child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
        cwd: PROJECT_ROOT,
        env: { ...testEnv({ DATABASE_URL: databaseUrl, SMTP_URL: smtpUrl, PORT: String(port), JOB_WORKERS: '0' }) },
        stdio: ['ignore', 'pipe', 'inherit'],
      });
      child.stdout!.on('data', (d: Buffer) => {
        const m = /listening on http:\/\/127\.0\.0\.1:(\d+)/.exec(d.toString());
        if (m) {
          port = Number(m[1]);
          resolve();
        }
      });
      child.once('exit', (code) => (port ? undefined : reject(new Error(`server exited ${code}`))));
    });
  await launch();
  const base = () => `http://127.0.0.1:${port}`;
  const cookie = await signIn(base(), 'operator2@demo.driftproof.test');
  const start = await persistent(`${base()}/api/attempts`, { method: 'POST', headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify({ trialId: 'long-aisle-run', mode: 'practice' }) });
  let restartMs = 0;
  const result = await drive(base, cookie, start.body.attempt.id, 40, async (i) => {
    if (i !== 20) return;
    const t0 = Date.now();
    child.kill('SIGKILL');
    await new Promise((r) => child.once('exit', r));
    await launch();
    restartMs = Date.now() - t0;
  });
  log(`killed with SIGKILL after 20 batches; a new process answered after ${(restartMs / 1000).toFixed(1)} s and resumed from the stored log`);
  await compare(base(), cookie, start.body.attempt.id, result.sent, result.seq);
  child!.kill('SIGTERM');
}

console.log('3. The mail sink down');
{
  const server = await startServer({ ...config, port: 0, jobWorkers: true }, { databaseUrl, smtpUrl }, {});
  const port = sink.port;
  await sink.close();
  const t0 = Date.now();
  const res = await fetch(`${server.url}/api/auth/password-reset`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'hr@demo.driftproof.test' }) });
  check(res.status === 202, `reset requested while the mail sink is down → ${res.status}`);
  await sleep(2500);
  sink = await startMailSink({ port });
  let arrived = 0;
  for (let i = 0; i < 120 && !arrived; i++) {
    if (await MailMessage.findOne({ where: { envelopeTo: 'hr@demo.driftproof.test' } })) arrived = Date.now() - t0;
    else await sleep(250);
  }
  check(arrived > 0, `the e-mail arrived after the sink came back (${(arrived / 1000).toFixed(1)} s after the request, retried by the job queue)`);
  await server.close();
}

console.log('4. The payment stand-in down');
{
  const server = await startServer({ ...config, port: 0, jobWorkers: false }, { databaseUrl, smtpUrl, stripeApiUrl: 'http://127.0.0.1:9' }, {});
  const cookie = await signIn(server.url, 'employer@demo.driftproof.test');
  const before = (await (await fetch(`${server.url}/api/organizations/1/seats`, { headers: { cookie } })).json()).balance;
  const res = await fetch(`${server.url}/api/organizations/1/orders`, { method: 'POST', headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify({ quantity: 3 }) });
  const body = await res.json();
  check(res.status === 502 && body.error.code === 'payment_unavailable', `ordering while the payment service is down → ${res.status} "${body.error?.message}"`);
  const after = (await (await fetch(`${server.url}/api/organizations/1/seats`, { headers: { cookie } })).json()).balance;
  check(after === before, `seat balance unchanged (${before} → ${after})`);
  await server.close();
}

await sink.close();
stopLocalCluster(DATA);
console.log(failures ? `\n${failures} check(s) failed` : '\nAll fault checks passed.');
process.exit(failures ? 1 : 0);
