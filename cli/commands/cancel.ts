import { Command } from 'commander';
import { connect } from '../connect.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { positiveId } from '../planFile.ts';
import { count } from '../terminal.ts';

export const cancel = new Command('cancel')
  .description('stop a queued or running scan; the points stored so far are kept')
  .argument('<ID>', 'scan id')
  .option('--json', 'print the cancelled scan as JSON')
  .addHelpText('after', examples('rollway cancel 12'))
  .action(async (id: string, options: { json?: boolean }) => {
    const scanId = positiveId(id);
    const { client } = await connect();
    const scan = await client.scans.cancel(scanId);
    if (options.json) printJson(scan);
    else process.stdout.write(`scan ${scan.id} cancelled; ${count(scan.pointsDone)}/${count(scan.pointCount)} points are stored\n`);
  });
