import { Command } from 'commander';
import type { AdminUser } from '../../../shared/api/accounts.ts';
import { connect } from '../../connect.ts';
import { examples } from '../../help.ts';
import { printJson } from '../../output.ts';
import { printTable, type Column } from '../../table.ts';
import { count, painter } from '../../terminal.ts';

export const users = new Command('users')
  .description('list every user with role, groups and this month\'s use of their quota (admins only)')
  .option('--json', 'print the list as a JSON array')
  .addHelpText('after', examples('rollway admin users', "rollway admin users --json | jq '.[] | select(.disabled)'"))
  .action(async (options: { json?: boolean }) => {
    const { client } = await connect();
    const list = await client.admin.users();
    if (options.json) {
      printJson(list);
      return;
    }
    const paint = painter();
    const columns: Column<AdminUser>[] = [
      { header: 'ID', value: (u) => String(u.id), right: true },
      { header: 'EMAIL', value: (u) => u.email },
      { header: 'NAME', value: (u) => u.name || '—' },
      { header: 'ROLE', value: (u) => u.role },
      { header: 'STATE', value: (u) => (u.disabled ? paint('red', 'disabled') : 'active') },
      { header: 'GROUPS', value: (u) => u.groups.map((g) => g.name).join(', ') || '—' },
      { header: 'POINTS THIS MONTH', value: (u) => `${count(u.usedPointsThisMonth)}/${count(u.quota.monthlyPoints)}${u.quota.custom ? '' : ' (default)'}`, right: true },
      { header: 'MAX RUNNING', value: (u) => String(u.quota.maxRunning), right: true },
    ];
    printTable(columns, list, 'No users.');
  });
