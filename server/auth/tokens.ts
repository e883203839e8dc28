import { createHash, randomBytes } from 'node:crypto';

/** A fresh single-use token (256 bits, URL-safe) and the SHA-256 hash that is all we store. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;
export const PASSWORD_RESET_TTL_MS = 60 * 60 * 1000;
export const SIGN_UP_TTL_MS = 24 * 60 * 60 * 1000;
