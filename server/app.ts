import cookieParser from 'cookie-parser';
import express, { type Express, type Router } from 'express';
import type { Logger } from 'pino';
import { pinoHttp } from 'pino-http';
import { accountsRouter } from './accounts/accountsRouter.ts';
import { authRouter } from './accounts/authRouter.ts';
import type { Accounts } from './accounts/openAccounts.ts';
import { authenticate } from './auth/authenticate.ts';
import { authorize } from './auth/authorize.ts';
import type { Database } from './db/client.ts';
import { errorHandler, notFound } from './middleware/errorHandler.ts';
import type { ScanEvents } from './scans/scanEvents.ts';
import { scansRouter } from './scans/scansRouter.ts';
import type { ScansService } from './scans/scansService.ts';
import { healthRouter } from './health/healthRouter.ts';
import { webRouter } from './web/webRouter.ts';

export interface AppDeps {
  db: Database;
  logger: Logger;
  scans: ScansService;
  events: ScanEvents;
  accounts: Accounts;
  /** Routers mounted under /api/v1/scans/:id/… by features that own scan results. */
  scanFeatures?: Router[];
  /** Routers mounted under /api/v1/admin/<path> (e.g. workers). */
  adminFeatures?: { path: string; router: Router }[];
}

/** The HTTP app without listening, so tests can mount it on an ephemeral port. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.use(pinoHttp({ logger: deps.logger, autoLogging: { ignore: (req) => req.url === '/api/v1/health' } }));
  app.use(express.json({ limit: '6mb' }));
  app.use(cookieParser());
  const api = express.Router();
  // Every API request: who is calling, then ACCESS_RULES (server/auth/accessRules.ts) decide.
  api.use(authenticate(deps.db, deps.accounts.sessions), authorize(deps.db));
  api.use(healthRouter(deps.db));
  api.use('/auth', authRouter(deps.accounts.auth, deps.accounts));
  api.use(accountsRouter(deps.accounts.tokens, deps.accounts.admin));
  api.use('/scans', scansRouter(deps.scans, deps.events));
  for (const feature of deps.scanFeatures ?? []) api.use('/scans', feature);
  for (const feature of deps.adminFeatures ?? []) api.use(`/admin/${feature.path}`, feature.router);
  app.use('/api/v1', api);
  app.use('/api', notFound);
  app.use(webRouter());
  app.use(errorHandler);
  return app;
}
