import argon2 from 'argon2';

/**
 * argon2id with the library's defaults (64 MiB, 3 passes): OWASP's recommended password hash.
 * Hashing runs on libuv's thread pool, so the event loop keeps serving while it works.
 */
export const hashPassword = (password: string): Promise<string> => argon2.hash(password, { type: argon2.argon2id });

// Verified against when the e-mail is unknown, so a failed sign-in costs the same either way.
let decoy: Promise<string> | undefined;

/** True when the password matches; a missing hash (unknown user, no password yet) is always false, in the same time. */
export async function verifyPassword(hash: string | null | undefined, password: string): Promise<boolean> {
  if (!hash) {
    decoy ??= hashPassword('decoy password that never matches');
    await argon2.verify(await decoy, password).catch(() => false);
    return false;
  }
  return argon2.verify(hash, password).catch(() => false);
}
