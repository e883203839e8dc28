/**
 * Reading database errors without trusting their text. Drizzle wraps a failed query in an error
 * whose message carries the SQL *and its parameters* (password hashes, tokens, e-mail
 * addresses); the driver's own error hangs below it as `cause`. Nothing here imports pg: the
 * facts are read from the error objects.
 */

interface DriverError {
  code?: string;
  message?: string;
  constraint?: string;
  cause?: unknown;
}

/** The error and every `cause` below it, outermost first (at most 5 deep). */
function chain(err: unknown): DriverError[] {
  const out: DriverError[] = [];
  let e: unknown = err;
  while (e && typeof e === 'object' && out.length < 5) {
    out.push(e as DriverError);
    e = (e as DriverError).cause;
  }
  return out;
}

/** SQLSTATEs and socket errors that mean "the database is not there right now". */
const UNAVAILABLE_CODES = new Set([
  '57P01', // admin_shutdown (server stopping, or pg_terminate_backend)
  '57P02', // crash_shutdown
  '57P03', // cannot_connect_now (starting up or shutting down)
  '08000', '08001', '08003', '08004', '08006', // connection exceptions
  '53300', // too_many_connections
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EHOSTUNREACH', 'EAI_AGAIN',
]);
const UNAVAILABLE_MESSAGES = /Connection terminated|timeout exceeded when trying to connect|not queryable|Connection refused|terminating connection due to administrator command/i;

/** True when `err` says the database could not be reached (as opposed to a bad query). */
export function isDatabaseUnavailable(err: unknown): boolean {
  return chain(err).some((e) => (e.code !== undefined && UNAVAILABLE_CODES.has(e.code)) || (typeof e.message === 'string' && UNAVAILABLE_MESSAGES.test(e.message) && !/^Failed query/.test(e.message)));
}

/** The SQLSTATE of the driver's error, if any (`23505` unique violation, `22P05` bad text…). */
export function sqlState(err: unknown): string | null {
  for (const e of chain(err)) if (typeof e.code === 'string' && /^[0-9A-Z]{5}$/.test(e.code)) return e.code;
  return null;
}

/** The constraint a driver error names (unique violations), if any. */
export function violatedConstraint(err: unknown): string | null {
  for (const e of chain(err)) if (typeof e.constraint === 'string') return e.constraint;
  return null;
}

/**
 * A one-line description of a database error that is safe to log: the driver's SQLSTATE and
 * message, never the query text or its parameters. (PostgreSQL's own messages can quote a value
 * in `detail`, which is left out too.)
 */
export function describeDatabaseError(err: unknown): string | null {
  const driver = chain(err).find((e) => typeof e.code === 'string' && (UNAVAILABLE_CODES.has(e.code) || /^[0-9A-Z]{5}$/.test(e.code)));
  if (driver) {
    const first = firstLine(String(driver.message ?? ''));
    // Data exceptions (class 22) quote the offending value after a colon: leave it out.
    return `database error ${driver.code}: ${driver.code?.startsWith('22') ? first.replace(/:.*/, '') : first}`;
  }
  if (isDatabaseUnavailable(err)) return 'database unavailable';
  return null;
}

/** Text up to its first line break. */
function firstLine(text: string): string {
  const end = text.indexOf('\n');
  return end < 0 ? text : text.slice(0, end);
}
