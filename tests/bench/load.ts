/**
 * `npm run load`: a bounded load test on loopback against a real server on its own database.
 * 1. Drives: LOAD_OPERATORS simulated operators (default 100) each drive a practice attempt,
 *    commanding at 10 Hz and sending a batch of BATCH commands (default 5) every BATCH/10 s, for
 *    LOAD_SECONDS (default 60), while LOAD_VERIFY_RPS public verification look-ups (default 20/s) run.
 * 2. Short autocannon runs on read endpoints.
 * Prints throughput, p50/p95/p99 latency and errors; never fails on speed.
 */
import autocannon from 'autocannon';
import { hashPassword } from '../../server/auth/passwords';
import { loadConfig } from '../../server/config';
import { User } from '../../server/db/models';
import { startMailSink } from '../../server/fakes/mail-sink';
import { startServer } from '../../server/index';
import { freshTestDatabase } from '../../server/scripts/database';
import { testEnv } from '../support/test-env';

const OPERATORS = Number(process.env.LOAD_OPERATORS ?? 100);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);
const BATCH = Number(process.env.BATCH ?? 5);
const VERIFY_RPS = Number(process.env.LOAD_VERIFY_RPS ?? 20);
const TARGET_P95_MS = 50;

const config = loadConfig(testEnv({ JOB_WORKERS: '0' }));
const databaseUrl = await freshTestDatabase(config, 'driftproof_load');
const sink = await startMailSink({ port: 0 });
const server = await startServer({ ...config, port: 0 }, { databaseUrl, smtpUrl: `smtp://127.0.0.1:${sink.port}` }, { seed: true });
const base = server.url;

const percentile = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] : NaN);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function signIn(email: string, password: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  if (res.status !== 200) throw new Error(`sign-in ${email}: ${res.status}`);
  return res.headers.get('set-cookie')!.split(';')[0];
}

// The operators: accounts in the demo organization (practice drives need no seats).
const hash = await hashPassword('load-test-password', 4);
await User.bulkCreate(Array.from({ length: OPERATORS }, (_, i) => ({ email: `load${i}@demo.driftproof.test`, name: `Load Operator ${i}`, role: 'operator' as const, organizationId: 1, passwordHash: hash, lastSignInAt: null })));
const cookies = await Promise.all(Array.from({ length: OPERATORS }, (_, i) => signIn(`load${i}@demo.driftproof.test`, 'load-test-password')));

const latencies: number[] = [];
let errors = 0;
let batches = 0;
let verifyCount = 0;
let verifyErrors = 0;
const verifyLatencies: number[] = [];
const deadline = Date.now() + SECONDS * 1000;

async function operator(cookie: string, index: number) {
  const headers = { 'content-type': 'application/json', cookie };
  const trial = ['long-aisle-run', 'wash-bay-crossing', 'dock-door-three'][index % 3];
  const started = await fetch(`${base}/api/attempts`, { method: 'POST', headers, body: JSON.stringify({ trialId: trial, mode: 'practice' }) });
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
    const res = await fetch(`${base}/api/attempts/${attempt.id}/steps`, { method: 'POST', headers, body: JSON.stringify({ fromSeq: seq, commands }) });
    const body = (await res.json()) as { seq?: number; error?: { code: string } };
    latencies.push(performance.now() - t0);
    batches += 1;
    if (res.status === 200) seq = body.seq!;
    else if (res.status === 409 && (body.error?.code === 'awaiting_call' || body.error?.code === 'time_up')) {
      // The drive reached a call point or its time limit: start another one, as an operator would.
      return operator(cookie, index + 3);
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

console.log(`Drive load on loopback: ${OPERATORS} operators at 10 Hz (batches of ${BATCH}), ${SECONDS} s, ${VERIFY_RPS} verification look-ups/s …`);
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
const memory = process.memoryUsage();
console.log(`  server process memory: rss ${(memory.rss / 2 ** 20).toFixed(0)} MiB, heap ${(memory.heapUsed / 2 ** 20).toFixed(0)} MiB`);
await server.close();
await sink.close();
process.exit(0);
