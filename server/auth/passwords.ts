import { hash, verify } from '@node-rs/argon2';

/**
 * argon2id with the OWASP-recommended minimum (19 MiB, 2 passes, 1 lane). The binary ships
 * inside the npm package, so nothing is downloaded at install.
 */
const OPTIONS = { algorithm: 2 as const /* Algorithm.Argon2id (a const enum) */, memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

/** A hash of a random password, verified against when the e-mail is unknown so that timing does
 * not reveal which addresses have accounts. */
let decoyHash: Promise<string> | undefined;
export function decoyPasswordHash(): Promise<string> {
  decoyHash ??= hashPassword(`decoy-${Math.random()}-${Date.now()}`);
  return decoyHash;
}
