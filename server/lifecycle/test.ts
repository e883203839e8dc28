/**
 * `npm test`: system packages (PostgreSQL, Chromium) → throwaway cluster on a free port →
 * client build → type-check → every vitest suite (unit, client, api, realtime, browser) → stop
 * what was started → last line `N passed, N failed`.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { REPO_ROOT } from '../app.ts';
import { startThrowawayCluster, type ThrowawayCluster } from './throwawayCluster.ts';
import { CHROMIUM_PATH, ensureSystemPackages } from './system.ts';

interface VitestJson {
  numPassedTests: number;
  numFailedTests: number;
  testResults: { name: string; status: string; message?: string; assertionResults: unknown[] }[];
}

const bin = (name: string) => path.join(REPO_ROOT, 'node_modules/.bin', name);

function step(title: string): void {
  console.log(`\n── ${title}`);
}

async function main(): Promise<number> {
  let passed = 0;
  let failed = 0;
  const extraArgs = process.argv.slice(2);

  step('System packages');
  try {
    ensureSystemPackages({ chromium: true });
  } catch (err) {
    // PostgreSQL is checked again below; a missing Chromium fails only the browser suite.
    console.error((err as Error).message);
  }
  if (!existsSync(CHROMIUM_PATH)) console.error(`Chromium not found at ${CHROMIUM_PATH}: the browser suite will fail.`);

  const work = mkdtempSync(path.join(tmpdir(), 'sw-test-run-'));
  let cluster: ThrowawayCluster | null = null;
  try {
    step('Throwaway PostgreSQL cluster');
    cluster = await startThrowawayCluster();
    console.log('Cluster up, template database migrated.');

    step('Client build (for the browser suite)');
    const clientDir = path.join(work, 'client');
    const build = spawnSync(bin('vite'), ['build', '--logLevel', 'warn', '--outDir', clientDir], { cwd: REPO_ROOT, stdio: 'inherit' });
    if (build.status !== 0) {
      console.error('Client build failed.');
      failed += 1;
    } else passed += 1;

    step('Type-check (vue-tsc)');
    const tsc = spawnSync(bin('vue-tsc'), ['--build'], { cwd: REPO_ROOT, stdio: 'inherit' });
    if (tsc.status === 0) {
      console.log('Type-check clean.');
      passed += 1;
    } else failed += 1;

    step('Lint (ESLint, with the layer rules)');
    const lint = spawnSync(bin('eslint'), ['--max-warnings=0', '--cache', '--cache-location', 'node_modules/.cache/eslint/', '.'], { cwd: REPO_ROOT, stdio: 'inherit' });
    if (lint.status === 0) {
      console.log('Lint clean.');
      passed += 1;
    } else failed += 1;

    step('Test suites (vitest)');
    const jsonFile = path.join(work, 'vitest.json');
    spawnSync(bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${jsonFile}`, ...extraArgs], {
      cwd: REPO_ROOT,
      stdio: 'inherit',
      env: {
        ...process.env,
        TEST_PG_ADMIN_URL: cluster.adminUrl,
        TEST_PG_TEMPLATE_DB: cluster.templateDb,
        TEST_CLIENT_DIST: clientDir,
        CHROMIUM_PATH,
      },
    });
    if (existsSync(jsonFile)) {
      const report = JSON.parse(readFileSync(jsonFile, 'utf8')) as VitestJson;
      passed += report.numPassedTests;
      failed += report.numFailedTests;
      // A file that fails to load has no tests to count; it still counts as a failure.
      for (const file of report.testResults) {
        if (file.status === 'failed' && file.assertionResults.length === 0) {
          failed += 1;
          console.error(`Suite failed to run: ${path.relative(REPO_ROOT, file.name)}: ${file.message ?? ''}`);
        }
      }
    } else {
      console.error('vitest produced no report.');
      failed += 1;
    }
  } catch (err) {
    console.error(`Test set-up failed: ${(err as Error).message}`);
    failed += 1;
  } finally {
    cluster?.stop();
    rmSync(work, { recursive: true, force: true });
  }
  console.log(`\n${passed} passed, ${failed} failed`);
  return failed === 0 ? 0 : 1;
}

main().then((code) => process.exit(code));
