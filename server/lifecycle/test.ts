/**
 * `npm test`: system packages (PostgreSQL, Chromium) → throwaway cluster on a free port →
 * client build → type-check → lint → every vitest suite (unit, tooling, client, api, realtime,
 * browser) → stop what was started → last line `N passed, N failed`.
 *
 * Every exit path cleans up. Each step runs in its own process group; SIGINT, SIGTERM or SIGHUP
 * stops that group, then the cluster and the work folder, and the run ends with the counts so
 * far plus one failure for the interruption (exit code 128 + the signal's number). If this
 * process is killed outright (SIGKILL), the cluster's guardian stops it, and the next run
 * removes whatever is left (server/lifecycle/leftovers.ts).
 */
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { REPO_ROOT } from '../app.ts';
import { markOwned } from './leftovers.ts';
import { checkInterrupted, handleInterruptions, Interrupted, interruption, runStep, signalExitCode } from './runControl.ts';
import { startThrowawayCluster, type ThrowawayCluster } from './throwawayCluster.ts';
import { CHROMIUM_PATH, ensureSystemPackages } from './system.ts';
import { parseVitestJson, tallyVitest } from './vitestTally.ts';

const bin = (name: string) => path.join(REPO_ROOT, 'node_modules/.bin', name);

function step(title: string): void {
  console.log(`\n── ${title}`);
}

async function main(): Promise<number> {
  handleInterruptions();
  let passed = 0;
  let failed = 0;
  const extraArgs = process.argv.slice(2);
  const run = (cmd: string, args: string[], env?: NodeJS.ProcessEnv) => runStep(cmd, args, { cwd: REPO_ROOT, env });

  step('System packages');
  try {
    ensureSystemPackages({ chromium: true });
  } catch (err) {
    // PostgreSQL is checked again below; a missing Chromium fails only the browser suite.
    console.error((err as Error).message);
  }
  if (!existsSync(CHROMIUM_PATH)) console.error(`Chromium not found at ${CHROMIUM_PATH}: the browser suite will fail.`);

  // The run's work folder: client build, vitest's report, and every temp folder the tests make
  // (TMPDIR points inside), so nothing of the run outlives it. Traversable (0711) so the cluster
  // owner can reach clusters that tests start below it.
  const work = mkdtempSync(path.join(tmpdir(), 'sw-test-run-'));
  markOwned(work);
  const testTmp = path.join(work, 'tmp');
  mkdirSync(testTmp);
  chmodSync(work, 0o711);
  chmodSync(testTmp, 0o711);
  let cluster: ThrowawayCluster | null = null;
  try {
    checkInterrupted();
    step('Throwaway PostgreSQL cluster');
    cluster = await startThrowawayCluster();
    checkInterrupted();
    console.log('Cluster up, template database migrated.');

    step('Client build (for the browser suite)');
    const clientDir = path.join(work, 'client');
    if (await run(bin('vite'), ['build', '--logLevel', 'warn', '--outDir', clientDir])) passed += 1;
    else {
      console.error('Client build failed.');
      failed += 1;
    }

    step('Type-check (vue-tsc)');
    if (await run(bin('vue-tsc'), ['--build'])) {
      console.log('Type-check clean.');
      passed += 1;
    } else failed += 1;

    step('Lint (ESLint, with the layer rules)');
    if (await run(bin('eslint'), ['--max-warnings=0', '--cache', '--cache-location', 'node_modules/.cache/eslint/', '.'])) {
      console.log('Lint clean.');
      passed += 1;
    } else failed += 1;

    step('Test suites (vitest)');
    const jsonFile = path.join(work, 'vitest.json');
    const vitestOk = await run(bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${jsonFile}`, ...extraArgs], {
      ...process.env,
      TMPDIR: testTmp,
      TEST_PG_ADMIN_URL: cluster.adminUrl,
      TEST_PG_TEMPLATE_DB: cluster.templateDb,
      TEST_CLIENT_DIST: clientDir,
      CHROMIUM_PATH,
    });
    if (existsSync(jsonFile)) {
      // Hooks, files that fail to load and unhandled errors count too (server/lifecycle/vitestTally.ts).
      const tally = tallyVitest(parseVitestJson(readFileSync(jsonFile, 'utf8'), jsonFile), vitestOk, (f) => path.relative(REPO_ROOT, f));
      passed += tally.passed;
      failed += tally.failed;
      for (const problem of tally.problems) console.error(problem);
    } else {
      console.error('vitest produced no report.');
      failed += 1;
    }
  } catch (err) {
    if (!(err instanceof Interrupted)) {
      console.error(`Test set-up failed: ${(err as Error).message}`);
      failed += 1;
    }
  } finally {
    cluster?.stop();
    rmSync(work, { recursive: true, force: true });
  }
  const signal = interruption();
  if (signal) {
    console.error(`Interrupted by ${signal}: PostgreSQL is stopped and the work folder removed; the counts stop there.`);
    failed += 1;
  }
  console.log(`\n${passed} passed, ${failed} failed`);
  if (signal) return signalExitCode(signal);
  return failed === 0 ? 0 : 1;
}

main().then((code) => process.exit(code));
