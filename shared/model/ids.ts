/**
 * Ids carry their kind: `user_…`, `team_…`, `sketch_…`. 20 characters of base-32 randomness
 * (100 bits) from the platform CSPRNG, which both Node ≥ 19 and browsers expose as
 * `globalThis.crypto`.
 */
export const ID_KINDS = ['user', 'team', 'sketch', 'invite', 'reset', 'mail', 'audit', 'op', 'pin', 'reply', 'snap', 'study', 'act', 'signup'] as const;
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
