/**
 * The last line of `npm test` counts failures that no test's result shows: a hook that throws,
 * a file that fails to load, an unhandled error after a test. The reports come from running the
 * real vitest (the registry package this project tests with) on small suites written here.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseVitestJson, tallyVitest } from '../../server/lifecycle/vitestTally.ts';

const REPO = path.resolve(import.meta.dirname, '../..');
const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

/** Runs vitest over the given files in a folder of their own; answers its report and exit. */
function runSuites(files: Record<string, string>) {
  const dir = mkdtempSync(path.join(tmpdir(), 'sw-tally-'));
  dirs.push(dir);
  writeFileSync(path.join(dir, 'vitest.config.mjs'), 'export default {};\n');
  for (const [name, text] of Object.entries(files)) writeFileSync(path.join(dir, name), text);
  const out = path.join(dir, 'report.json');
  const res = spawnSync(path.join(REPO, 'node_modules/.bin/vitest'), ['run', '--root', dir, '--reporter=json', `--outputFile.json=${out}`], {
    cwd: dir,
    encoding: 'utf8',
    env: { ...process.env, CI: '1' },
  });
  return { report: parseVitestJson(readFileSync(out, 'utf8'), out), exitedCleanly: res.status === 0 };
}

const passing = "import { it, expect } from 'vitest';\nit('holds', () => { expect(1 + 1).toBe(2); });\n";

describe('npm test counts failures outside the tests', () => {
  it('all green: the tests passed, none failed', () => {
    const { report, exitedCleanly } = runSuites({ 'a.test.ts': passing });
    expect(tallyVitest(report, exitedCleanly)).toEqual({ passed: 1, failed: 0, problems: [] });
  });

  it('an afterAll that throws is one failure, though its test passed', () => {
    const { report, exitedCleanly } = runSuites({
      'a.test.ts': passing,
      'hook.test.ts': "import { afterAll, it } from 'vitest';\nafterAll(() => { throw new Error('teardown broke'); });\nit('runs', () => {});\n",
    });
    expect(report.numFailedTests).toBe(0); // what the old count read
    const tally = tallyVitest(report, exitedCleanly, (f) => path.basename(f));
    expect(tally.passed).toBe(2);
    expect(tally.failed).toBe(1);
    expect(tally.problems).toEqual([expect.stringMatching(/^Suite failed outside its tests \(a hook\): hook\.test\.ts: .*teardown broke/)]);
  });

  it('a file that fails to load is one failure', () => {
    const { report, exitedCleanly } = runSuites({ 'broken.test.ts': "import './missing-module.ts';\n" });
    const tally = tallyVitest(report, exitedCleanly, (f) => path.basename(f));
    expect(tally.failed).toBe(1);
    expect(tally.problems[0]).toMatch(/^Suite failed to run: broken\.test\.ts/);
  });

  it('an unhandled error after a test ended is one failure', () => {
    const { report, exitedCleanly } = runSuites({
      'late.test.ts':
        "import { it } from 'vitest';\nit('leaks', () => { setTimeout(() => { throw new Error('late'); }, 0); });\nit('waits', async () => { await new Promise((r) => setTimeout(r, 50)); });\n",
    });
    expect(report.numFailedTests).toBe(0);
    expect(exitedCleanly).toBe(false);
    const tally = tallyVitest(report, exitedCleanly);
    expect(tally).toMatchObject({ passed: 2, failed: 1 });
    expect(tally.problems[0]).toMatch(/unhandled error/);
  });

  it('a failing test is counted once, even with a failing hook in the same file', () => {
    const { report, exitedCleanly } = runSuites({
      'both.test.ts':
        "import { afterAll, it, expect } from 'vitest';\nafterAll(() => { throw new Error('x'); });\nit('fails', () => { expect(1).toBe(2); });\n",
    });
    expect(tallyVitest(report, exitedCleanly)).toMatchObject({ passed: 0, failed: 1 });
  });

  it('a report vitest did not finish is an error naming the file', () => {
    expect(() => parseVitestJson('{"numPassedTests": 3', '/tmp/r.json')).toThrow(/\/tmp\/r\.json is not JSON/);
    expect(() => parseVitestJson('{"numPassedTests": 3}', '/tmp/r.json')).toThrow(/\/tmp\/r\.json has an unexpected shape/);
  });
});
