import { rateLimit, type RateLimitRequestHandler } from 'express-rate-limit';

/**
 * Sign-in and reset attempts per client address per 15 minutes (express-rate-limit, in memory:
 * with several servers behind a proxy each keeps its own count, which only makes it stricter per server).
 */
export function attemptLimit(limit: number): RateLimitRequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res, _next, options) => {
      res.status(options.statusCode).json({ error: { code: 'too_many_attempts', message: 'too many attempts from this address; wait 15 minutes and try again' } });
    },
  });
}
