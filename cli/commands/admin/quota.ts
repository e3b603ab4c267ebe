import { Command } from 'commander';
import { InvalidInputError } from '../../../shared/errors.ts';
import { connect } from '../../connect.ts';
import { examples } from '../../help.ts';
import { printJson } from '../../output.ts';
import { count } from '../../terminal.ts';

/** A whole number, or "default" (null: the server's default applies). */
function quotaValue(text: string, what: string, max: number): number | null {
  if (text === 'default') return null;
  if (!/^\d{1,10}$/.test(text) || Number(text) > max) throw new InvalidInputError(`${what}: "${text}" must be a whole number from 0 to ${count(max)}, or "default"`, what);
  return Number(text);
}

const set = new Command('set')
  .description("set a user's monthly point quota (and optionally how many scans may run at once)")
  .argument('<USER>', 'user id or e-mail')
  .argument('<POINTS>', 'points a month, or "default"')
  .option('--max-running <n>', 'scans running at once, or "default" (unchanged when left out)')
  .option('--json', 'print the updated user as JSON')
  .addHelpText('after', examples('rollway admin quota set ada@example.org 20000000', 'rollway admin quota set 7 default --max-running 5'))
  .action(async (user: string, points: string, options: { maxRunning?: string; json?: boolean }) => {
    const monthlyPoints = quotaValue(points, 'POINTS', 1_000_000_000);
    const maxRunning = options.maxRunning === undefined ? undefined : quotaValue(options.maxRunning, '--max-running', 1000);
    const { client } = await connect();
    const all = await client.admin.users();
    const target = /^\d+$/.test(user) ? all.find((u) => u.id === Number(user)) : all.find((u) => u.email === user.trim().toLowerCase());
    if (!target) throw new InvalidInputError(`USER: no user with ${/^\d+$/.test(user) ? 'id' : 'e-mail'} "${user}" (see rollway admin users)`, 'USER');
    // The API sets both values; keep a custom max-running the admin did not mention.
    const keepRunning = target.quota.custom ? target.quota.maxRunning : null;
    const updated = await client.admin.setQuota(target.id, { monthlyPoints, maxRunning: maxRunning === undefined ? keepRunning : maxRunning });
    if (options.json) printJson(updated);
    else process.stdout.write(`${updated.email}: ${count(updated.quota.monthlyPoints)} points a month, ${updated.quota.maxRunning} scans at once${updated.quota.custom ? '' : ' (the defaults)'}\n`);
  });

export const quota = new Command('quota')
  .description("users' quotas (admins only)")
  .addCommand(set)
  .addHelpText('after', examples('rollway admin quota set ada@example.org 20000000'));
