import { z } from 'zod';

/**
 * Text people send us [M5]: every string field of every inbound record (titles, notes, names,
 * pin bodies, file names, snapshot names, op ids…) is declared through `textSchema`, which
 * refuses the characters PostgreSQL cannot store — NUL (U+0000), refused by `text` and `jsonb`
 * alike — and unpaired UTF-16 surrogates (not Unicode at all; a jsonb `\ud800` escape is refused,
 * and a `text` column would silently store U+FFFD instead). They are refused at the edge with the
 * field's name, so the database never answers a 500 and nothing half-written stays behind.
 */

// eslint-disable-next-line no-control-regex
const UNSTORABLE = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Whether `s` holds a NUL character or an unpaired surrogate (it cannot be stored). */
export function hasUnstorableText(s: string): boolean {
  return UNSTORABLE.test(s);
}

/** The message of a refused string (after the field's name). */
export const UNSTORABLE_TEXT_MESSAGE = 'must not contain a NUL character or an unpaired surrogate';

/**
 * A string that can be stored: `z.string()` plus the [M5] check, to chain `.trim()`, `.min()`,
 * `.max()`, `.regex()` on. `error` is the message for a value that is not a string at all.
 */
export function textSchema(params: Parameters<typeof z.string>[0] = { error: 'must be text' }) {
  return z.string(params).refine((s) => !hasUnstorableText(s), UNSTORABLE_TEXT_MESSAGE);
}
