import { describeDatabaseError } from './db/errors.ts';

/**
 * What the server writes to its log never carries credentials or personal data: no SQL
 * parameters, password hashes, session ids, tokens or e-mail addresses. Errors are described
 * by `errorForLog` (the database's SQLSTATE instead of Drizzle's "Failed query … params: …"),
 * and every line passes through `redact` on its way out as a last net.
 */

const RULES: [RegExp, string][] = [
  // Drizzle's failed-query text: the SQL and, worse, its parameters.
  [/Failed query:[\s\S]*?(\n\s+at |$)/g, '[query and parameters withheld]$1'],
  [/params:[^\n]*/g, 'params: [withheld]'],
  [/\$argon2(?:id|i|d)\$[^\s'",)}\]]+/g, '[password hash]'],
  [/\bsw\.sid=[^;\s]+/g, 'sw.sid=[withheld]'],
  [/\bs(?::|%3A)[A-Za-z0-9_-]{20,}\.[A-Za-z0-9%+/=_-]+/g, '[signed session id]'],
  [/([?&](?:token|reset|sid|secret|password|code)=)[^&\s#"']+/gi, '$1[withheld]'],
  [/\b[0-9a-f]{64}\b/g, '[hash]'],
  // newToken(): 32 random bytes in base64url.
  [/(?<![A-Za-z0-9_-])[A-Za-z0-9_-]{43}(?![A-Za-z0-9_-])/g, '[token]'],
  [/[A-Za-z0-9._%+-]+@[A-Za-z0-9.-]+\.[A-Za-z]{2,}/g, '[e-mail]'],
];

/** Removes credentials and personal data from one log line. */
export function redact(line: string): string {
  let out = line;
  for (const [pattern, replacement] of RULES) out = out.replace(pattern, replacement);
  return out;
}

/** A log function that redacts every line before passing it on. */
export function redactingLog(log: (line: string) => void): (line: string) => void {
  return (line) => log(redact(line));
}

/**
 * An error as one safe line plus its stack frames: the database's own code and message for
 * database errors, the message otherwise — never a query's parameters.
 */
export function errorForLog(err: unknown, withStack = true): string {
  const db = describeDatabaseError(err);
  const e = err as { name?: string; message?: string; stack?: string } | null;
  const head = db ?? `${e?.name ?? 'Error'}: ${String(e?.message ?? err).split('\n')[0]}`;
  const frames = withStack && typeof e?.stack === 'string' ? e.stack.split('\n').filter((l) => /^\s+at /.test(l)).slice(0, 8) : [];
  return redact([head, ...frames].join('\n'));
}

/** A request URL for the log: the path, and query values withheld where they could be secrets. */
export function urlForLog(url: string): string {
  return redact(url);
}
