import { createHash, randomBytes } from 'node:crypto';

/** A random link token (256 bits) and the hash we store; the token itself only travels in the e-mail. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
