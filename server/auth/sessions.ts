import { randomUUID } from 'node:crypto';
import { jwtVerify, SignJWT } from 'jose';
import type { Database } from '../db/client.ts';
import { findLiveSession, insertSession, revokeSession } from './credentialsRepository.ts';

const ISSUER = 'rollway';

export type Sessions = ReturnType<typeof createSessions>;

/**
 * Sessions are HS256 JWTs (jose) naming a row of the sessions table: the signature spares a lookup
 * of forged or stale tokens, the row lets sign-out, password changes and disabling a user end a
 * session before its expiry.
 */
export function createSessions(db: Database, key: Uint8Array, ttlSeconds: number) {
  return {
    ttlSeconds,
    async create(userId: number): Promise<{ token: string; expiresAt: Date; id: string }> {
      const id = randomUUID();
      const expiresAt = new Date(Date.now() + ttlSeconds * 1000);
      await insertSession(db, { id, userId, expiresAt });
      const token = await new SignJWT({ sid: id }).setProtectedHeader({ alg: 'HS256' }).setIssuer(ISSUER)
        .setSubject(String(userId)).setIssuedAt().setExpirationTime(Math.floor(expiresAt.getTime() / 1000)).sign(key);
      return { token, expiresAt, id };
    },
    /** The live session and its user, or undefined for a bad signature, expiry, revocation or disabled user. */
    async verify(token: string) {
      const claims = await jwtVerify(token, key, { issuer: ISSUER, algorithms: ['HS256'] }).then((r) => r.payload, () => undefined);
      if (!claims || typeof claims.sid !== 'string') return undefined;
      const found = await findLiveSession(db, claims.sid);
      return found && String(found.user.id) === claims.sub ? found : undefined;
    },
    revoke: (id: string) => revokeSession(db, id),
  };
}
