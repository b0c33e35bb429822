import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

/** A fresh secret for the page's address: 32 random bytes (256 bits, common practice for bearer secrets), URL-safe. */
export function newPageToken(): string {
  return randomBytes(32).toString('base64url');
}

/**
 * Whether a presented token is the page's, compared in constant time: both sides are hashed first so that the
 * comparison sees equal lengths whatever was sent (timingSafeEqual needs equal lengths and would leak the length).
 */
export function tokenMatches(presented: string, token: string): boolean {
  const a = createHash('sha256').update(presented).digest();
  const b = createHash('sha256').update(token).digest();
  return timingSafeEqual(a, b);
}
