import { Command } from 'commander';
import { examples } from '../../help.ts';
import { quota } from './quota.ts';
import { usage } from './usage.ts';
import { users } from './users.ts';

export const admin = new Command('admin')
  .description('for admins: users, quotas, usage')
  .addCommand(users)
  .addCommand(quota)
  .addCommand(usage)
  .addHelpText('after', examples('rollway admin users', 'rollway admin quota set ada@example.org 20000000', 'rollway admin usage --month 2025-01'));
