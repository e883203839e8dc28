// Runs before `npm start` / `npm test` (npm's prestart / pretest hooks), before any dependency
// exists, so it is plain JavaScript with Node built-ins only: install node_modules with `npm ci`
// when they are missing or older than package-lock.json.
import { existsSync, statSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const lock = path.join(root, 'package-lock.json');
const installed = path.join(root, 'node_modules', '.package-lock.json');

const stale = !existsSync(installed) || statSync(installed).mtimeMs < statSync(lock).mtimeMs;
if (stale) {
  console.log('Installing dependencies (npm ci)…');
  const started = Date.now();
  const result = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error('npm ci failed; see the output above.');
    process.exit(result.status ?? 1);
  }
  console.log(`Dependencies installed in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
}
