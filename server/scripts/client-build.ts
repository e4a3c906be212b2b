/** Builds the Vue client with Vite when a source is newer than the last build. */
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { PROJECT_ROOT } from '../config';

const SOURCES = ['src', 'shared', 'public', 'index.html', 'vite.config.ts', 'package-lock.json'];

function newestChange(entry: string): number {
  if (!existsSync(entry)) return 0;
  const stat = statSync(entry);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return readdirSync(entry).reduce((newest, name) => Math.max(newest, newestChange(path.join(entry, name))), stat.mtimeMs);
}

export function clientIsStale(root = PROJECT_ROOT): boolean {
  const built = path.join(root, 'dist', 'index.html');
  if (!existsSync(built)) return true;
  const sources = Math.max(...SOURCES.map((s) => newestChange(path.join(root, s))));
  return sources > statSync(built).mtimeMs;
}

export function buildClientIfStale(log: (line: string) => void = console.log, root = PROJECT_ROOT): boolean {
  if (!clientIsStale(root)) return false;
  log('Building the client with Vite …');
  const vite = path.join(root, 'node_modules', 'vite', 'bin', 'vite.js');
  const result = spawnSync(process.execPath, [vite, 'build', '--logLevel', 'warn'], { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) throw new Error('The client build failed (see above).');
  return true;
}
