import { Command } from 'commander';
import type { ResultRow } from '../../shared/api/results.ts';
import { connect } from '../connect.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { positiveId } from '../planFile.ts';
import { printTable, type Column } from '../table.ts';
import { count } from '../terminal.ts';

/** Six significant digits without trailing zeros. */
const number = (x: number | null): string => (x === null ? '—' : String(Number(x.toPrecision(6))));

export const best = new Command('best')
  .description("the ten points that fit the scan's bound set best (lowest chi2), with the region counts")
  .argument('<ID>', 'scan id')
  .option('--json', 'print {scanId, total, byRegion, best} as JSON')
  .addHelpText('after', examples('rollway best 12', "rollway best 12 --json | jq '.best[0].params'"))
  .action(async (id: string, options: { json?: boolean }) => {
    const scanId = positiveId(id);
    const { client } = await connect();
    const summary = await client.results.summary(scanId);
    if (options.json) {
      printJson({ scanId: summary.scanId, total: summary.total, byRegion: summary.byRegion, best: summary.best });
      return;
    }
    const regions = summary.byRegion;
    process.stdout.write(`scan ${scanId}: ${count(summary.total)} points stored; inside 68%: ${count(regions.inside68)}, inside 95%: ${count(regions.inside95)}, outside: ${count(regions.outside)}, not scored: ${count(regions.unscored)}\n`);
    const params = Object.keys(summary.best[0]?.params ?? {});
    const columns: Column<ResultRow>[] = [
      { header: 'POINT', value: (r) => String(r.pointIndex), right: true },
      ...params.map((p): Column<ResultRow> => ({ header: p, value: (r) => number(r.params[p] ?? null), right: true })),
      { header: 'n_s', value: (r) => number(r.ns), right: true },
      { header: 'r', value: (r) => number(r.r), right: true },
      { header: 'alpha_s', value: (r) => number(r.alphaS), right: true },
      { header: 'chi2', value: (r) => number(r.chi2), right: true },
      { header: 'REGION', value: (r) => r.region ?? '—' },
    ];
    printTable(columns, summary.best, 'No ok points yet.');
  });
