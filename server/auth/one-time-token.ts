import { createHash, randomBytes } from 'node:crypto';

/** A single-use token for a link: 256 random bits; only its SHA-256 is stored, so a database leak reveals no usable link. */
export function newOneTimeToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashOneTimeToken(token) };
}

export function hashOneTimeToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
