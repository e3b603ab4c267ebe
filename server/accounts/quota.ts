import type { Quota } from '../../shared/api/accounts.ts';
import { ConflictError } from '../../shared/errors.ts';
import type { Database } from '../db/client.ts';
import type { AccountsConfig } from './accountsConfig.ts';
import { monthOf, nextMonthStart, pointsCharged, runningScans } from './usageRepository.ts';
import type { UserRow } from './usersRepository.ts';

export type QuotaDefaults = Pick<AccountsConfig, 'defaultMonthlyPoints' | 'defaultMaxRunning'>;

export const limitsOf = (user: Pick<UserRow, 'monthlyPointQuota' | 'maxRunningScans'>, defaults: QuotaDefaults) => ({
  monthlyPoints: user.monthlyPointQuota ?? defaults.defaultMonthlyPoints,
  maxRunning: user.maxRunningScans ?? defaults.defaultMaxRunning,
  custom: user.monthlyPointQuota !== null || user.maxRunningScans !== null,
});

export async function quotaOf(db: Database, user: UserRow, defaults: QuotaDefaults, now = new Date()): Promise<Quota> {
  const { monthlyPoints, maxRunning } = limitsOf(user, defaults);
  const used = await pointsCharged(db, user.id, monthOf(now));
  return {
    monthlyPoints, usedPoints: used, remainingPoints: Math.max(0, monthlyPoints - used),
    resetsAt: nextMonthStart(now).toISOString(), maxRunning, running: await runningScans(db, user.id),
  };
}

const n = (x: number) => x.toLocaleString('en-US');

/** Refuses a submission that would pass the monthly quota or the running-scan limit, before anything is stored. */
export function assertWithinQuota(quota: Quota, points: number): void {
  if (points > quota.remainingPoints) {
    throw new ConflictError(
      `this plan has ${n(points)} points but only ${n(quota.remainingPoints)} of your ${n(quota.monthlyPoints)} monthly points are left; ` +
      `the quota resets on ${quota.resetsAt.slice(0, 10)} (ask an admin for more)`, 'quota_exceeded');
  }
  if (quota.running >= quota.maxRunning) {
    throw new ConflictError(`you already have ${quota.running} scans queued or running (the limit is ${quota.maxRunning}); wait for one to finish or cancel one`, 'too_many_running');
  }
}
