import type { RequestHandler } from 'express';
import { API_TOKEN_PREFIX, SESSION_COOKIE } from '../../shared/api/accounts.ts';
import type { Database } from '../db/client.ts';
import { groupIdsOf, type UserRow } from '../accounts/usersRepository.ts';
import type { Actor } from './actor.ts';
import { findLiveToken, touchToken } from './credentialsRepository.ts';
import { hashSecret } from './secrets.ts';
import type { Sessions } from './sessions.ts';

declare module 'express-serve-static-core' {
  interface Request {
    /** Set when a credential was sent but is bad, expired or revoked: signed-in routes answer 401 with it. */
    credentialProblem?: string;
  }
}

const bearer = (header: string | undefined): string | undefined => {
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header ?? '');
  return match?.[1];
};

async function toActor(db: Database, user: UserRow, rest: Pick<Actor, 'via' | 'scopes' | 'sessionId' | 'tokenId' | 'expiresAt'>): Promise<Actor> {
  return { userId: user.id, email: user.email, name: user.name, role: user.role, groupIds: await groupIdsOf(db, user.id), ...rest };
}

/**
 * Resolves the caller from `Authorization: Bearer` (an API token `rwt_…` or a session JWT) or the
 * session cookie. It never rejects by itself: public routes work with a stale cookie; `authorize`
 * decides, with `credentialProblem` explaining a 401.
 */
export function authenticate(db: Database, sessions: Sessions): RequestHandler {
  return async (req, _res, next) => {
    req.actor = null;
    const fromHeader = bearer(req.headers.authorization);
    const credential = fromHeader ?? (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
    if (!credential) return next();
    try {
      if (credential.startsWith(API_TOKEN_PREFIX)) {
        const found = await findLiveToken(db, hashSecret(credential));
        if (!found) {
          req.credentialProblem = 'this API token is unknown, revoked or expired; create a new one';
          return next();
        }
        await touchToken(db, found.token.id);
        // A token never grants admin rights: an admin's token acts as a researcher would.
        const user = found.user.role === 'admin' ? { ...found.user, role: 'researcher' as const } : found.user;
        req.actor = await toActor(db, user, { via: 'token', scopes: found.token.scopes, sessionId: null, tokenId: found.token.id, expiresAt: found.token.expiresAt });
        return next();
      }
      const found = await sessions.verify(credential);
      if (!found) {
        req.credentialProblem = 'your session has ended or expired; sign in again';
        return next();
      }
      req.actor = await toActor(db, found.user, { via: 'session', scopes: null, sessionId: found.session.id, tokenId: null, expiresAt: found.session.expiresAt });
      next();
    } catch (error) {
      next(error);
    }
  };
}
