import { z } from 'zod';

/**
 * Ids carry their kind: `user_…`, `team_…`, `sketch_…`. 20 characters of base-32 randomness
 * (100 bits) from the platform CSPRNG, which both Node ≥ 19 and browsers expose as
 * `globalThis.crypto`.
 */
export const ID_KINDS = ['user', 'team', 'sketch', 'invite', 'reset', 'mail', 'audit', 'op', 'pin', 'reply', 'snap', 'study', 'act', 'signup', 'point', 'outcome', 'slot', 'instance'] as const;
export type IdKind = (typeof ID_KINDS)[number];

const ALPHABET = 'abcdefghijkmnpqrstuvwxyz23456789'; // 32 symbols, no look-alikes (l, o, 0, 1)

export function newId(kind: IdKind): string {
  const bytes = new Uint8Array(20);
  globalThis.crypto.getRandomValues(bytes);
  let out = '';
  for (const b of bytes) out += ALPHABET[b & 31];
  return `${kind}_${out}`;
}

/** True when `id` looks like an id of `kind` (used by zod schemas at the edges). */
export function isIdOf(kind: IdKind, id: string): boolean {
  return new RegExp(`^${kind}_[${ALPHABET}]{20}$`).test(id);
}

/**
 * The schema of an id of `kind` at the edges (route params, bodies, socket messages) [M1]: the
 * kind, an underscore and 20 lower-case letters or digits. One pattern for every router and
 * message; the message names what was expected ("must be a sketch id").
 */
export function idSchema(kind: IdKind, what: string = kind) {
  return z.string().regex(new RegExp(`^${kind}_[a-z0-9]{20}$`), `must be ${/^[aeiou]/.test(what) ? 'an' : 'a'} ${what} id`);
}
