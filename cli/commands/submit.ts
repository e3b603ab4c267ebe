import { Command } from 'commander';
import { connect } from '../connect.ts';
import { followAndReport } from '../followScan.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { positiveId, readPlanFile } from '../planFile.ts';
import { count } from '../terminal.ts';

interface SubmitOptions { watch?: boolean; group?: string; basedOn?: string; json?: boolean }

export const submit = new Command('submit')
  .description('send a scan plan to the server, which validates, stores and queues it')
  .argument('<FILE>', 'scan plan (YAML, or JSON when it ends in .json)')
  .option('--watch', 'then follow its progress until it is done (exit 1 unless it completes)')
  .option('--group <id>', 'share the scan with this group (you must belong to it)')
  .option('--based-on <id>', 'copy the points an earlier scan already computed with the same request')
  .option('--json', 'print the new scan as JSON (with --watch: the finished scan)')
  .addHelpText('after', examples(
    'rollway submit examples/quick-check.yaml --watch',
    'rollway submit plan.yaml --group 2 --json | jq .id',
    'rollway submit wider-plan.yaml --based-on 12',
  ))
  .action(async (file: string, options: SubmitOptions) => {
    const plan = await readPlanFile(file);
    const groupId = options.group === undefined ? undefined : positiveId(options.group, '--group');
    const basedOn = options.basedOn === undefined ? undefined : positiveId(options.basedOn, '--based-on');
    const { client } = await connect();
    const scan = await client.scans.submit({ ...plan, ...(groupId ? { groupId } : {}), ...(basedOn ? { basedOn } : {}) });
    if (options.watch) {
      if (!options.json) process.stdout.write(`scan ${scan.id} queued: "${scan.title}", ${count(scan.pointCount)} points\n`);
      await followAndReport(client, scan.id, options.json === true);
      return;
    }
    if (options.json) printJson(scan);
    else process.stdout.write(`scan ${scan.id} queued: "${scan.title}", ${count(scan.pointCount)} points\nfollow it with: rollway watch ${scan.id}\n`);
  });
