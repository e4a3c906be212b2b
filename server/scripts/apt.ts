/** Installs a Debian package with apt-get when a file it provides is missing (root only). */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

export function ensureDebianPackage(pkg: string, providedFile: string, log: (line: string) => void = console.log) {
  if (existsSync(providedFile)) return;
  const command = `apt-get update && apt-get install -y ${pkg}`;
  if (process.getuid?.() !== 0) {
    throw new Error(`${providedFile} is missing. Install Debian's ${pkg} package with:\n  sudo sh -c '${command}'`);
  }
  log(`Installing Debian's ${pkg} (apt-get install -y ${pkg}) …`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const install = () => spawnSync('apt-get', ['install', '-y', '--no-install-recommends', pkg], { stdio: 'inherit', env }).status === 0;
  if (!install()) {
    spawnSync('apt-get', ['update'], { stdio: 'inherit', env });
    if (!install()) throw new Error(`Could not install ${pkg}. Try: ${command}`);
  }
  if (!existsSync(providedFile)) throw new Error(`${pkg} is installed but ${providedFile} is still missing.`);
}
