import { Command } from 'commander';
import { connect } from '../connect.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { positiveId } from '../planFile.ts';
import { printScanDetail } from '../scanOutput.ts';

export const show = new Command('show')
  .description('show one scan: state, progress, rates, owner, plan hash')
  .argument('<ID>', 'scan id')
  .option('--plan', 'print only the plan text as it was submitted')
  .option('--json', 'print the scan (with its plan) as JSON')
  .addHelpText('after', examples('rollway show 12', 'rollway show 12 --plan > again.yaml', 'rollway show 12 --json | jq .state'))
  .action(async (id: string, options: { plan?: boolean; json?: boolean }) => {
    const scanId = positiveId(id);
    const { client } = await connect();
    const scan = await client.scans.get(scanId);
    if (options.json) printJson(scan);
    else if (options.plan) process.stdout.write(scan.planText.endsWith('\n') ? scan.planText : `${scan.planText}\n`);
    else printScanDetail(scan);
  });
