import type { Logger } from 'pino';
import type { Config } from '../config.ts';
import type { Database } from '../db/client.ts';
import { loadSessionKey } from '../auth/sessionKey.ts';
import { createSessions, type Sessions } from '../auth/sessions.ts';
import type { Mailer } from '../mail/mailer.ts';
import { createAdminService, type AdminService } from './adminService.ts';
import { createAuthService, type AuthService } from './authService.ts';
import { ensureAdmin } from './bootstrap.ts';
import { createTokensService, type TokensService } from './tokensService.ts';

export interface Accounts {
  sessions: Sessions;
  auth: AuthService;
  tokens: TokensService;
  admin: AdminService;
  secureCookie: boolean;
  loginLimit: number;
  /** The one-time set-up link when no admin can sign in yet (print it for the operator). */
  setupUrl?: string;
}

/** Sessions, services and the first admin, over an open database and mailer. */
export async function openAccounts(db: Database, config: Config, mailer: Mailer, logger: Logger): Promise<Accounts> {
  const { accounts, mail } = config;
  const key = await loadSessionKey({ ...(accounts.sessionSecret ? { secret: accounts.sessionSecret } : {}), dataDir: config.dataDir, ...(config.databaseUrl ? { databaseUrl: config.databaseUrl } : {}) });
  const sessions = createSessions(db, key, accounts.sessionHours * 3600);
  const quotaDefaults = { defaultMonthlyPoints: accounts.defaultMonthlyPoints, defaultMaxRunning: accounts.defaultMaxRunning };
  const setupUrl = await ensureAdmin(db, accounts, mail.publicUrl, logger);
  return {
    sessions,
    auth: createAuthService({ db, sessions, mailer, publicUrl: mail.publicUrl, quotaDefaults, logger }),
    tokens: createTokensService(db),
    admin: createAdminService({ db, mailer, publicUrl: mail.publicUrl, quotaDefaults }),
    secureCookie: mail.publicUrl.startsWith('https://'),
    loginLimit: accounts.loginLimit,
    ...(setupUrl ? { setupUrl } : {}),
  };
}
