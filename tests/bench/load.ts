/**
 * `npm run load`: a bounded load test on loopback. A real server on its own database of the local
 * cluster (recreated), hammered by autocannon for a few seconds per endpoint; prints figures,
 * never fails on speed.
 */
import autocannon from 'autocannon';
import { loadConfig } from '../../server/config';
import { startMailSink } from '../../server/fakes/mail-sink';
import { startServer } from '../../server/index';
import { freshTestDatabase } from '../../server/scripts/database';
import { testEnv } from '../support/test-env';

const SECONDS = Number(process.env.LOAD_SECONDS ?? 8);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 16);

const config = loadConfig(testEnv());
const databaseUrl = await freshTestDatabase(config, 'driftproof_load');
const sink = await startMailSink({ port: 0 });
const server = await startServer({ ...config, port: 0 }, { databaseUrl, smtpUrl: `smtp://127.0.0.1:${sink.port}` }, { seed: true });

const signIn = await fetch(`${server.url}/api/auth/sign-in`, {
  method: 'POST',
  headers: { 'content-type': 'application/json' },
  body: JSON.stringify({ email: 'admin@demo.driftproof.test', password: config.demoPassword }),
});
const cookie = signIn.headers.get('set-cookie')?.split(';')[0] ?? '';

const scenarios = [
  { title: 'GET /api/health (one database round trip)', path: '/api/health', headers: {} },
  { title: 'GET /api/auth/me (session + user from PostgreSQL)', path: '/api/auth/me', headers: { cookie } },
  { title: 'GET /api/users?pageSize=20 (admin list, count + page)', path: '/api/users?pageSize=20', headers: { cookie } },
];

console.log(`Load on loopback: ${CONNECTIONS} connections, ${SECONDS} s per endpoint\n`);
for (const s of scenarios) {
  const result = await autocannon({ url: server.url + s.path, headers: s.headers, connections: CONNECTIONS, duration: SECONDS });
  const errors = result.errors + result.non2xx;
  console.log(`${s.title}\n  ${Math.round(result.requests.average)} req/s, latency p50 ${result.latency.p50} ms, p99 ${result.latency.p99} ms, errors ${errors}\n`);
}
const memory = process.memoryUsage();
console.log(`Server process memory: rss ${(memory.rss / 2 ** 20).toFixed(0)} MiB, heap used ${(memory.heapUsed / 2 ** 20).toFixed(0)} MiB`);

await server.close();
await sink.close();
