import { Command } from 'commander';
import { connect } from '../connect.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { printScans } from '../scanOutput.ts';

export const scans = new Command('scans')
  .description('list the scans you can see, newest first, with state and progress')
  .option('--json', 'print the list as a JSON array')
  .addHelpText('after', examples('rollway scans', "rollway scans --json | jq '.[] | select(.state == \"running\") | .id'"))
  .action(async (options: { json?: boolean }) => {
    const { client } = await connect();
    const list = await client.scans.list();
    if (options.json) printJson(list);
    else printScans(list);
  });
