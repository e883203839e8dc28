// Runs before `npm start` / `npm test` (npm's prestart / pretest hooks), before any dependency
// exists, so it is plain JavaScript with Node built-ins only: install node_modules with `npm ci`
// when they are missing or do not match package-lock.json.
import { existsSync, lstatSync, readFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const modules = path.join(root, 'node_modules');

/**
 * Why node_modules needs `npm ci`, or null when it matches the lock file. Compared by content
 * (npm's record of what it installed, node_modules/.package-lock.json, against package-lock.json),
 * not by date: a checkout, rebase or clone rewrites the lock file without changing it.
 */
function staleness() {
  const installedFile = path.join(modules, '.package-lock.json');
  if (!existsSync(installedFile)) return 'node_modules is missing';
  const wanted = JSON.parse(readFileSync(path.join(root, 'package-lock.json'), 'utf8')).packages ?? {};
  const installed = JSON.parse(readFileSync(installedFile, 'utf8')).packages ?? {};
  for (const [where, entry] of Object.entries(wanted)) {
    if (where === '' || entry.link) continue;
    const have = installed[where];
    // Optional packages for other platforms (a macOS build of esbuild, say) are never installed.
    if (!have && entry.optional) continue;
    if (!have) return `${where.replace(/^node_modules\//, '')} is not installed`;
    if (have.version !== entry.version) return `${where.replace(/^node_modules\//, '')} is ${have.version}, the lock file says ${entry.version}`;
  }
  for (const where of Object.keys(installed)) {
    if (!(where in wanted)) return `${where.replace(/^node_modules\//, '')} is installed but no longer in the lock file`;
  }
  return null;
}

const why = staleness();
if (why) {
  // `npm ci` deletes node_modules first: through a link it would empty another checkout's.
  if (existsSync(modules) && lstatSync(modules).isSymbolicLink()) {
    console.error(`node_modules is a link to another folder and does not match package-lock.json (${why}); not reinstalling through it. Remove the link, or run \`npm ci\` where it points.`);
    process.exit(1);
  }
  console.log(`Installing dependencies (npm ci: ${why})…`);
  const started = Date.now();
  const result = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error('npm ci failed; see the output above.');
    process.exit(result.status ?? 1);
  }
  console.log(`Dependencies installed in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
}
