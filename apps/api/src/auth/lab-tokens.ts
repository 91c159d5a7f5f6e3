import { createHash, randomBytes } from 'node:crypto';

/** Lab API tokens look like `plb_<43 url-safe characters>`; only their SHA-256 is stored. */
export const LAB_TOKEN_PREFIX = 'plb_';

export function newLabToken(): { token: string; prefix: string; tokenHash: string } {
  const token = LAB_TOKEN_PREFIX + randomBytes(32).toString('base64url');
  return { token, prefix: token.slice(0, 10), tokenHash: hashLabToken(token) };
}

export function hashLabToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export const looksLikeLabToken = (token: string) => token.startsWith(LAB_TOKEN_PREFIX);
