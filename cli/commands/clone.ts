import { Command } from 'commander';
import { connect } from '../connect.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { positiveId } from '../planFile.ts';
import { count } from '../terminal.ts';

export const clone = new Command('clone')
  .description('queue a new scan with the same plan as an earlier one')
  .argument('<ID>', 'scan id to copy the plan from')
  .option('--json', 'print the new scan as JSON')
  .addHelpText('after', examples('rollway clone 12', 'rollway watch "$(rollway clone 12 --json | jq .id)"'))
  .action(async (id: string, options: { json?: boolean }) => {
    const scanId = positiveId(id);
    const { client } = await connect();
    const scan = await client.scans.clone(scanId);
    if (options.json) printJson(scan);
    else process.stdout.write(`scan ${scan.id} queued as a copy of scan ${scanId}: "${scan.title}", ${count(scan.pointCount)} points\n`);
  });
