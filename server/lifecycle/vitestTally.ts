/**
 * Counts for the last line of `npm test` from vitest's JSON report.
 *
 * vitest's own totals count tests only. Three failures reach no test's result and would read
 * `N passed, 0 failed`: a file that fails to load (no tests at all), a hook that throws
 * (`beforeAll`/`afterAll`: the file is failed, every test in it passed) and an unhandled error
 * after a test ended (every file passed, the run is not a success and vitest exits non-zero).
 * Each counts as one failure here, with a line saying where.
 */
import { z } from 'zod';

const vitestJsonSchema = z.object({
  numPassedTests: z.number().int().nonnegative(),
  numFailedTests: z.number().int().nonnegative(),
  success: z.boolean(),
  testResults: z.array(
    z.object({
      name: z.string(),
      status: z.string(),
      message: z.string().optional(),
      assertionResults: z.array(z.object({ status: z.string() })),
    }),
  ),
});

export type VitestJson = z.infer<typeof vitestJsonSchema>;

export interface Tally {
  passed: number;
  failed: number;
  /** One line per failure that no test's result shows. */
  problems: string[];
}

/** Reads the report text; a report vitest did not finish writing is an error naming the file. */
export function parseVitestJson(text: string, file: string): VitestJson {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    throw new Error(`vitest's report ${file} is not JSON: ${(err as Error).message}`, { cause: err });
  }
  const parsed = vitestJsonSchema.safeParse(raw);
  if (!parsed.success) throw new Error(`vitest's report ${file} has an unexpected shape: ${parsed.error.issues[0]?.message ?? ''}`);
  return parsed.data;
}

/**
 * `exitedCleanly`: vitest's exit code was 0. `relative` shortens a test file's path for the
 * messages.
 */
export function tallyVitest(report: VitestJson, exitedCleanly: boolean, relative: (file: string) => string = (f) => f): Tally {
  let failed = report.numFailedTests;
  const problems: string[] = [];
  for (const file of report.testResults) {
    if (file.status !== 'failed') continue;
    if (file.assertionResults.some((a) => a.status === 'failed')) continue; // already counted
    failed += 1;
    const where = file.assertionResults.length === 0 ? 'failed to run' : 'failed outside its tests (a hook)';
    problems.push(`Suite ${where}: ${relative(file.name)}: ${file.message ?? ''}`.trimEnd());
  }
  if (failed === 0 && (!report.success || !exitedCleanly)) {
    failed += 1;
    problems.push('vitest reported an error outside every test (an unhandled error or rejection): see its output above.');
  }
  return { passed: report.numPassedTests, failed, problems };
}
