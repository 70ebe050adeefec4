import argon2 from 'argon2';
import bcrypt from 'bcryptjs';
import { createHash, randomBytes } from 'node:crypto';

/**
 * argon2id at the OWASP Password Storage Cheat Sheet's first recommended configuration
 * ("Argon2id with a minimum configuration of 19 MiB of memory, an iteration count of 2, and 1
 * degree of parallelism"): about 30 ms per check here. The same everywhere, tests included.
 */
export const ARGON2_OPTIONS = { type: argon2.argon2id, memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

const isBcrypt = (hash: string) => /^\$2[aby]\$/.test(hash);

/** An argon2id hash (PHC string) of a new password. */
export const hashPassword = (password: string) => argon2.hash(password, ARGON2_OPTIONS);

/** True when `password` matches `hash`: argon2id, or an older bcrypt hash (read only, never written). */
export async function checkPassword(password: string, hash: string): Promise<boolean> {
  if (isBcrypt(hash)) return bcrypt.compare(password, hash);
  try {
    return await argon2.verify(hash, password);
  } catch {
    // A stored value that is no hash we know matches nothing.
    return false;
  }
}

/** True when a stored hash should be replaced at the next sign-in: bcrypt, or argon2 with other parameters. */
export const needsRehash = (hash: string) => isBcrypt(hash) || !hash.startsWith('$argon2id$') || argon2.needsRehash(hash, ARGON2_OPTIONS);

// A hash to check against when the account does not exist, so timing does not reveal it; made with
// the same parameters as real hashes, once, on first use.
let dummyHash: Promise<string> | undefined;
export const burnPasswordCheck = async (password: string) => {
  dummyHash ??= hashPassword(randomBytes(16).toString('hex'));
  await checkPassword(password, await dummyHash);
};

/** A random URL-safe token and the SHA-256 hash we store instead of it. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');
