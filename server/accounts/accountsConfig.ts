import { z } from 'zod';

/** Account settings, parsed by server/config.ts (the only reader of process.env). */
export interface AccountsConfig {
  /** First start: an admin with these credentials (else a one-time set-up link is printed). */
  adminEmail?: string;
  adminPassword?: string;
  sessionSecret?: string;
  sessionHours: number;
  defaultMonthlyPoints: number;
  defaultMaxRunning: number;
  /** Sign-in and reset attempts per client address per 15 minutes. */
  loginLimit: number;
}

const count = (min: number, max: number, fallback: number) => z.coerce.number().int().min(min).max(max).default(fallback);

export const accountsEnvShape = {
  ROLLWAY_ADMIN_EMAIL: z.string().trim().toLowerCase().email().optional(),
  ROLLWAY_ADMIN_PASSWORD: z.string().min(10, 'must be at least 10 characters').max(200).optional(),
  ROLLWAY_SESSION_SECRET: z.string().min(32, 'must be at least 32 characters').optional(),
  ROLLWAY_SESSION_HOURS: count(1, 24 * 90, 24 * 7),
  ROLLWAY_DEFAULT_MONTHLY_POINTS: count(0, 1_000_000_000, 5_000_000),
  ROLLWAY_DEFAULT_MAX_RUNNING: count(0, 1000, 3),
  ROLLWAY_LOGIN_LIMIT: count(1, 100_000, 20),
};

const accountsEnvSchema = z.object(accountsEnvShape);
type AccountsEnv = z.infer<typeof accountsEnvSchema>;

export function toAccountsConfig(e: AccountsEnv): AccountsConfig {
  if ((e.ROLLWAY_ADMIN_EMAIL === undefined) !== (e.ROLLWAY_ADMIN_PASSWORD === undefined)) {
    throw new Error('invalid environment: ROLLWAY_ADMIN_EMAIL and ROLLWAY_ADMIN_PASSWORD: set both or neither');
  }
  return {
    ...(e.ROLLWAY_ADMIN_EMAIL === undefined ? {} : { adminEmail: e.ROLLWAY_ADMIN_EMAIL, adminPassword: e.ROLLWAY_ADMIN_PASSWORD! }),
    ...(e.ROLLWAY_SESSION_SECRET === undefined ? {} : { sessionSecret: e.ROLLWAY_SESSION_SECRET }),
    sessionHours: e.ROLLWAY_SESSION_HOURS,
    defaultMonthlyPoints: e.ROLLWAY_DEFAULT_MONTHLY_POINTS,
    defaultMaxRunning: e.ROLLWAY_DEFAULT_MAX_RUNNING,
    loginLimit: e.ROLLWAY_LOGIN_LIMIT,
  };
}
