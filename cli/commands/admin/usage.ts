import { Command } from 'commander';
import type { Usage } from '../../../shared/api/accounts.ts';
import { InvalidInputError } from '../../../shared/errors.ts';
import { connect } from '../../connect.ts';
import { examples } from '../../help.ts';
import { printJson } from '../../output.ts';
import { printTable, type Column } from '../../table.ts';
import { count } from '../../terminal.ts';

type Row = Usage['users'][number];

export const usage = new Command('usage')
  .description('points and compute time per user in a month (admins only)')
  .option('--month <YYYY-MM>', 'the month (default: this one, UTC)')
  .option('--json', 'print the usage as JSON')
  .addHelpText('after', examples('rollway admin usage', 'rollway admin usage --month 2025-01 --json'))
  .action(async (options: { month?: string; json?: boolean }) => {
    if (options.month !== undefined && !/^\d{4}-(0[1-9]|1[0-2])$/.test(options.month)) {
      throw new InvalidInputError(`--month: "${options.month}" must be a month as YYYY-MM`, '--month');
    }
    const { client } = await connect();
    const report = await client.admin.usage(options.month);
    if (options.json) {
      printJson(report);
      return;
    }
    process.stdout.write(`usage in ${report.month}\n`);
    const columns: Column<Row>[] = [
      { header: 'EMAIL', value: (u) => u.email },
      { header: 'NAME', value: (u) => u.name || '—' },
      { header: 'SCANS', value: (u) => count(u.scans), right: true },
      { header: 'POINTS CHARGED', value: (u) => count(u.pointsCharged), right: true },
      { header: 'POINTS COMPUTED', value: (u) => count(u.pointsComputed), right: true },
      { header: 'COMPUTE', value: (u) => `${(u.computeSeconds / 3600).toFixed(2)} h`, right: true },
    ];
    printTable(columns, report.users, 'Nobody used the service that month.');
  });
