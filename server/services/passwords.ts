import bcrypt from 'bcryptjs';
import { createHash, randomBytes } from 'node:crypto';

/** bcrypt cost 10, the floor we accept: about 0.1 s per check here in pure JavaScript. */
const COST = 10;

export const hashPassword = (password: string) => bcrypt.hash(password, COST);
export const checkPassword = (password: string, hash: string) => bcrypt.compare(password, hash);

// A fixed hash to compare against when the account does not exist, so timing does not reveal it.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', COST);
export const burnPasswordCheck = (password: string) => bcrypt.compare(password, DUMMY_HASH);

/** A random URL-safe token and the SHA-256 hash we store instead of it. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');
