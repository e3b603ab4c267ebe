import { createHash, randomBytes } from 'node:crypto';

/** A random secret of 256 bits, URL-safe, with a readable prefix (`rwt_` for API tokens). */
export const newSecret = (prefix = ''): string => prefix + randomBytes(32).toString('base64url');

/**
 * SHA-256 of a secret, as stored. A fast hash is right here (unlike passwords): the secrets are
 * 256 random bits, so there is nothing to guess, and lookups by hash stay a single index probe.
 */
export const hashSecret = (secret: string): string => createHash('sha256').update(secret).digest('hex');
