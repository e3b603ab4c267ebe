import { Router, type CookieOptions, type Response } from 'express';
import { linkRequestSchema, loginRequestSchema, resetRequestSchema, SESSION_COOKIE } from '../../shared/api/accounts.ts';
import { parseRequest } from '../../shared/api/parse.ts';
import { actorOf } from '../auth/actor.ts';
import { attemptLimit } from '../auth/rateLimits.ts';
import type { AuthService } from './authService.ts';

/** /auth: sign-in, sign-out, who am I, single-use links and password reset. */
export function authRouter(service: AuthService, options: { secureCookie: boolean; loginLimit: number }): Router {
  const router = Router();
  const limited = attemptLimit(options.loginLimit);
  const cookie = (expiresAt: string): CookieOptions => ({ httpOnly: true, sameSite: 'lax', secure: options.secureCookie, path: '/', expires: new Date(expiresAt) });
  const signedIn = (res: Response, session: { token: string; expiresAt: string; user: unknown }, returnToken: boolean) => {
    res.cookie(SESSION_COOKIE, session.token, cookie(session.expiresAt));
    res.json(returnToken ? session : { user: session.user, expiresAt: session.expiresAt });
  };

  router.post('/login', limited, async (req, res) => {
    const input = parseRequest(loginRequestSchema, req.body ?? {});
    signedIn(res, await service.login(input.email, input.password), input.returnToken === true);
  });
  router.post('/logout', async (req, res) => {
    await service.logout(actorOf(req));
    res.clearCookie(SESSION_COOKIE, { path: '/' }).status(204).end();
  });
  router.get('/me', async (req, res) => {
    res.json(await service.me(actorOf(req)));
  });
  router.get('/link/:token', async (req, res) => {
    res.json(await service.linkInfo(req.params.token));
  });
  router.post('/link', limited, async (req, res) => {
    signedIn(res, await service.acceptLink(parseRequest(linkRequestSchema, req.body ?? {})), false);
  });
  router.post('/password-reset', limited, async (req, res) => {
    await service.requestReset(parseRequest(resetRequestSchema, req.body ?? {}).email);
    res.status(202).json({ message: 'if an account with this e-mail exists, a reset link is on its way' });
  });
  return router;
}
