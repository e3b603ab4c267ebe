import type { Role, TokenScope } from '../../shared/api/accounts.ts';

/** Who is calling, as every service sees it; resolved once per request by `authenticate`. */
export interface Actor {
  userId: number;
  email: string;
  name: string;
  role: Role;
  groupIds: number[];
  /** session: full rights of the user; token: the owner's rights narrowed to `scopes`. */
  via: 'session' | 'token';
  scopes: TokenScope[] | null;
  sessionId: string | null;
  tokenId: number | null;
  expiresAt: Date;
}

declare module 'express-serve-static-core' {
  interface Request {
    actor?: Actor | null;
  }
}

/** The actor of a request that passed `authorize` on a signed-in route. */
export function actorOf(req: { actor?: Actor | null }): Actor {
  if (!req.actor) throw new Error('route reached without an actor: missing access rule');
  return req.actor;
}
