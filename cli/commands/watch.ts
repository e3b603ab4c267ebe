import { Command } from 'commander';
import { connect } from '../connect.ts';
import { followAndReport } from '../followScan.ts';
import { examples } from '../help.ts';
import { positiveId } from '../planFile.ts';

export const watch = new Command('watch')
  .description('follow a scan live (progress bar, points/s, ETA) until it is done, then print a summary; exit 1 unless it completes')
  .argument('<ID>', 'scan id')
  .option('--json', 'print the finished scan as JSON')
  .addHelpText('after', examples('rollway watch 12', 'rollway watch 12 && rollway results 12 --out scan-12.csv'))
  .action(async (id: string, options: { json?: boolean }) => {
    const scanId = positiveId(id);
    const { client } = await connect();
    await followAndReport(client, scanId, options.json === true);
  });
