/**
 * `npm run dev`: the API (restarted when server code changes) and Vite with hot reload, which
 * proxies /api to it. Open the Vite URL it prints (http://127.0.0.1:5173).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { PROJECT_ROOT } from '../config';

const children: ChildProcess[] = [
  spawn(process.execPath, ['--watch-path=server', '--watch-path=shared', '--import', 'tsx', 'server/scripts/start.ts'], {
    cwd: PROJECT_ROOT,
    stdio: 'inherit',
    env: { ...process.env, DRIFTPROOF_DEV: '1' },
  }),
  spawn(process.execPath, [path.join(PROJECT_ROOT, 'node_modules/vite/bin/vite.js')], { cwd: PROJECT_ROOT, stdio: 'inherit' }),
];

const stopAll = () => {
  for (const child of children) child.kill('SIGTERM');
};
process.once('SIGINT', stopAll);
process.once('SIGTERM', stopAll);
for (const child of children) child.once('exit', stopAll);
