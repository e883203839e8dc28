/**
 * Batch solver: `npm run --silent solve -- CASE.json` (or `-` to read the case from stdin)
 * prints one JSON result (see shared/solver/types.ts) on stdout.
 *
 * Exit codes: 0 when a result was printed — also when its status is a limit (`detached`,
 * `subsonic`, `vacuum`, `blunt`): that is an answer, not a failure; 2 with a one-line message
 * on stderr for a missing argument, an unreadable file, bad JSON or an input that fails
 * validation (the message names the bad field); 1 only for an unexpected internal error.
 */
import { readFileSync } from 'node:fs';
import { parseSolveInput } from '../../shared/model/solveInput';
import { solveSection } from '../../shared/solver/solveSection';

const USAGE = 'usage: npm run --silent solve -- CASE.json   (use - to read the case from stdin)';

function fail(message: string, code: number): never {
  process.stderr.write(`solve: ${message.replace(/\s*\n\s*/g, ' ')}\n`);
  process.exit(code);
}

function readCase(arg: string): string {
  try {
    return readFileSync(arg === '-' ? 0 : arg, 'utf8');
  } catch (err) {
    const reason = err instanceof Error && 'code' in err ? String((err as NodeJS.ErrnoException).code) : String(err);
    fail(`cannot read ${arg === '-' ? 'stdin' : arg} (${reason})`, 2);
  }
}

function main(argv: readonly string[]): void {
  const args = argv.filter((a) => a !== '--');
  const [arg, ...extra] = args;
  if (arg === undefined || extra.length > 0) fail(USAGE, 2);
  const text = readCase(arg);
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    fail(`${arg === '-' ? 'stdin' : arg} is not valid JSON (${err instanceof Error ? err.message : String(err)})`, 2);
  }
  const parsed = parseSolveInput(raw);
  if (!parsed.ok) fail(`invalid case: ${parsed.issues.map((i) => i.message).join(' ')}`, 2);
  let out: string;
  try {
    out = JSON.stringify(solveSection(parsed.value), null, 2);
  } catch (err) {
    fail(`internal error: ${err instanceof Error ? err.message : String(err)}`, 1);
  }
  process.stdout.write(`${out}\n`);
}

main(process.argv.slice(2));
