import { createHash, randomBytes } from 'node:crypto';

/**
 * A fresh token for a link sent by e-mail, and the hash to store in its place.
 *
 * @example
 * const { token, hash } = newLinkToken(); // mail the token, keep the hash
 */
export function newLinkToken(): { token: string; hash: string } {
  // 32 random bytes (256 bits): well above the 128 bits OWASP asks of such tokens
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashLinkToken(token) };
}

/** SHA-256 of a token: a stolen database gives no usable link, and a token is long enough not to need salt. */
export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
