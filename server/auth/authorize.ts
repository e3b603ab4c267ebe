import type { RequestHandler } from 'express';
import { ForbiddenError, NotFoundError, UnauthorizedError } from '../../shared/errors.ts';
import type { Database } from '../db/client.ts';
import { matchRule, pathKnown, type AccessRule } from './accessRules.ts';
import type { Actor } from './actor.ts';
import { checkScanAccess } from './scanAccess.ts';

function tokenAllows(rule: AccessRule, actor: Actor): boolean {
  if (actor.via === 'session') return true;
  if (rule.token === 'never') return false;
  if (rule.token === 'any') return true;
  return (actor.scopes ?? []).includes(rule.token);
}

/** Applies ACCESS_RULES to every API request (mounted at /api/v1, after `authenticate`). */
export function authorize(db: Database): RequestHandler {
  return async (req, _res, next) => {
    try {
      const match = matchRule(req.method, req.path);
      if (!match) {
        // Unknown paths fall through to the 404 handler; a known path with another method is a 405-like 404 too.
        if (pathKnown(req.path)) throw new NotFoundError(`no route ${req.method} ${req.path}`);
        return next();
      }
      const { rule } = match;
      if (rule.roles === 'public') return next();
      const actor = req.actor;
      if (!actor) throw new UnauthorizedError(req.credentialProblem);
      if (!rule.roles.includes(actor.role)) {
        throw new ForbiddenError(`your role (${actor.role}) cannot ${req.method} ${req.path}; it needs ${rule.roles.join(' or ')}`);
      }
      if (!tokenAllows(rule, actor)) {
        throw new ForbiddenError(rule.token === 'never'
          ? `API tokens cannot ${req.method} ${req.path}; sign in instead`
          : `this API token lacks the "${rule.token}" scope needed for ${req.method} ${req.path}`);
      }
      if (rule.scan && match.id !== undefined && /^\d{1,9}$/.test(match.id)) await checkScanAccess(db, actor, Number(match.id), rule.scan);
      next();
    } catch (error) {
      next(error);
    }
  };
}
