/**
 * `npm run load`: a bounded load test on loopback against real web processes on their own database.
 * The web processes run as children (`server/index.ts`, as a deployment starts them behind a load
 * balancer; LOAD_PROCESSES of them, default 1), so the load generator does not share their CPU.
 * 1. Drives: LOAD_OPERATORS simulated operators (default 100) each drive a practice attempt,
 *    commanding at 10 Hz and sending a batch of BATCH commands (default 5) every BATCH/10 s, for
 *    LOAD_SECONDS (default 60), while LOAD_VERIFY_RPS public verification look-ups (default 20/s) run.
 *    Operators are spread over the web processes round-robin and stay with theirs, as a balancer
 *    with sticky sessions does; LOAD_BALANCE=round-robin sends each batch to the next process
 *    instead, so most batches land on a process that does not hold the drive and rebuild it.
 * 2. Short autocannon runs on read endpoints.
 * Prints throughput, p50/p95/p99 latency and errors; never fails on speed.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import autocannon from 'autocannon';
import { hashPassword } from '../../server/auth/passwords';
import { loadConfig, PROJECT_ROOT } from '../../server/config';
import { createDatabase } from '../../server/db';
import { migrate, seedDemo } from '../../server/db/migrate';
import { User } from '../../server/db/models';
import { startMailSink } from '../../server/fakes/mail-sink';
import { freshTestDatabase } from '../../server/scripts/database';
import { testEnv } from '../support/test-env';

const OPERATORS = Number(process.env.LOAD_OPERATORS ?? 100);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);
const BATCH = Number(process.env.BATCH ?? 5);
const VERIFY_RPS = Number(process.env.LOAD_VERIFY_RPS ?? 20);
const PROCESSES = Number(process.env.LOAD_PROCESSES ?? 1);
const ROUND_ROBIN = process.env.LOAD_BALANCE === 'round-robin';
const TARGET_P95_MS = 50;

const config = loadConfig(testEnv({ JOB_WORKERS: '0' }));
const databaseUrl = await freshTestDatabase(config, 'driftproof_load');
const sink = await startMailSink({ port: 0 });

// The database: schema, demo accounts and the load operators (practice drives need no seats).
const sequelize = createDatabase(databaseUrl);
await migrate(sequelize);
await seedDemo(sequelize, { password: config.demoPassword, bcryptCost: 4 });
const hash = await hashPassword('load-test-password', 4);
await User.bulkCreate(Array.from({ length: OPERATORS }, (_, i) => ({ email: `load${i}@demo.driftproof.test`, name: `Load Operator ${i}`, role: 'operator' as const, organizationId: 1, passwordHash: hash, lastSignInAt: null })));
await sequelize.close();

// LOAD_CPU_PROFILE=1 writes a V8 CPU profile of each web process to .data/profiles (open it in Chromium's DevTools).
const profileFlags = process.env.LOAD_CPU_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${path.join(PROJECT_ROOT, '.data/profiles')}`] : [];

/** Starts one web process and resolves with its URL once it listens. */
function startWebProcess(): Promise<{ url: string; child: ChildProcess }> {
  const env = testEnv({
    NODE_ENV: 'production',
    JOB_WORKERS: '0',
    PORT: '0',
    DATABASE_URL: databaseUrl,
    SMTP_URL: `smtp://127.0.0.1:${sink.port}`,
    SIGN_IN_LIMIT: String(OPERATORS * 2),
  });
  const child = spawn(process.execPath, [...profileFlags, '--import', 'tsx', path.join(PROJECT_ROOT, 'server/index.ts')], { cwd: PROJECT_ROOT, env, stdio: ['ignore', 'pipe', 'inherit'] });
  return new Promise((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`web process did not start: ${out}`)), 60_000);
    child.stdout!.setEncoding('utf8');
    child.stdout!.on('data', (chunk: string) => {
      out += chunk;
      const found = /listening on (http:\/\/\S+)/.exec(out);
      if (found) {
        clearTimeout(timer);
        resolve({ url: found[1], child });
      }
    });
    child.once('exit', (code) => reject(new Error(`web process exited with ${code}: ${out}`)));
  });
}

const web = await Promise.all(Array.from({ length: PROCESSES }, () => startWebProcess()));
const baseFor = (i: number) => web[i % web.length].url;
const base = baseFor(0);

const percentile = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] : NaN);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function signIn(email: string, password: string, at = base): Promise<string> {
  const res = await fetch(`${at}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  if (res.status !== 200) throw new Error(`sign-in ${email}: ${res.status}`);
  return res.headers.get('set-cookie')!.split(';')[0];
}

const cookies = await Promise.all(Array.from({ length: OPERATORS }, (_, i) => signIn(`load${i}@demo.driftproof.test`, 'load-test-password', baseFor(i))));

const latencies: number[] = [];
let errors = 0;
let batches = 0;
let verifyCount = 0;
let verifyErrors = 0;
const verifyLatencies: number[] = [];
const deadline = Date.now() + SECONDS * 1000;

async function operator(cookie: string, index: number, at: string = baseFor(index)) {
  const headers = { 'content-type': 'application/json', cookie };
  const trial = ['long-aisle-run', 'wash-bay-crossing', 'dock-door-three'][index % 3];
  const started = await fetch(`${at}/api/attempts`, { method: 'POST', headers, body: JSON.stringify({ trialId: trial, mode: 'practice' }) });
  if (started.status !== 201) {
    errors += 1;
    return;
  }
  const { attempt } = (await started.json()) as { attempt: { id: string } };
  let seq = 0;
  let turn = 0.3;
  await sleep(Math.random() * 100 * BATCH); // spread the operators over the batch period
  while (Date.now() < deadline) {
    const period = Date.now();
    turn = -turn; // weave gently so drives last without reaching a call point too soon
    const commands = Array.from({ length: BATCH }, () => ({ v: 0.4, w: turn }));
    const t0 = performance.now();
    const target = ROUND_ROBIN ? baseFor(batches + index) : at;
    const res = await fetch(`${target}/api/attempts/${attempt.id}/steps`, { method: 'POST', headers, body: JSON.stringify({ fromSeq: seq, commands }) });
    const body = (await res.json()) as { seq?: number; error?: { code: string } };
    latencies.push(performance.now() - t0);
    batches += 1;
    if (res.status === 200) seq = body.seq!;
    else if (res.status === 409 && (body.error?.code === 'awaiting_call' || body.error?.code === 'time_up')) {
      // The drive reached a call point or its time limit: start another one, as an operator would.
      return operator(cookie, index + 3, at);
    } else errors += 1;
    await sleep(Math.max(0, BATCH * 100 - (Date.now() - period)));
  }
}

async function verifier() {
  while (Date.now() < deadline) {
    const t0 = performance.now();
    const res = await fetch(`${base}/api/verify/DPC-0000-0000-0`);
    verifyLatencies.push(performance.now() - t0);
    verifyCount += 1;
    if (res.status !== 404 && res.status !== 429) verifyErrors += 1;
    await sleep(1000 / VERIFY_RPS);
  }
}

console.log(`Drive load on loopback: ${PROCESSES} web process(es)${ROUND_ROBIN ? ' without sticky sessions' : ''}, ${OPERATORS} operators at 10 Hz (batches of ${BATCH}), ${SECONDS} s, ${VERIFY_RPS} verification look-ups/s …`);
const wall0 = performance.now();
await Promise.all([...cookies.map((c, i) => operator(c, i)), verifier()]);
const wall = (performance.now() - wall0) / 1000;
latencies.sort((a, b) => a - b);
verifyLatencies.sort((a, b) => a - b);
const p95 = percentile(latencies, 95);
console.log(`  step batches: ${batches} in ${wall.toFixed(1)} s = ${(batches / wall).toFixed(0)} batches/s (${((batches * BATCH) / wall).toFixed(0)} commands/s)`);
console.log(`  latency p50 ${percentile(latencies, 50).toFixed(1)} ms, p95 ${p95.toFixed(1)} ms, p99 ${percentile(latencies, 99).toFixed(1)} ms, max ${latencies[latencies.length - 1]?.toFixed(1)} ms`);
console.log(`  errors ${errors}  (target 0)   p95 target < ${TARGET_P95_MS} ms: ${p95 < TARGET_P95_MS ? 'met' : 'NOT met'}`);
console.log(`  verification look-ups: ${verifyCount}, p95 ${percentile(verifyLatencies, 95).toFixed(1)} ms, unexpected answers ${verifyErrors}`);

// Short read-endpoint runs.
const adminCookie = await signIn('admin@demo.driftproof.test', config.demoPassword);
for (const s of [
  { title: 'GET /api/health', path: '/api/health', headers: {} },
  { title: 'GET /api/auth/me', path: '/api/auth/me', headers: { cookie: adminCookie } },
  { title: 'GET /api/levels', path: '/api/levels', headers: {} },
]) {
  const r = await autocannon({ url: base + s.path, headers: s.headers, connections: 16, duration: 5 });
  console.log(`  ${s.title}: ${Math.round(r.requests.average)} req/s, p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, errors ${r.errors + r.non2xx}`);
}
for (const { child } of web) {
  const rss = /VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${child.pid}/status`, 'utf8'))?.[1];
  console.log(`  web process ${child.pid}: rss ${rss ? (Number(rss) / 1024).toFixed(0) : '?'} MiB`);
}
await Promise.all(web.map(({ child }) => new Promise((resolve) => { child.removeAllListeners('exit'); child.once('exit', resolve); child.kill('SIGTERM'); })));
await sink.close();
process.exit(0);
