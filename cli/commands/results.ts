import { createWriteStream } from 'node:fs';
import { rename, rm } from 'node:fs/promises';
import { Readable, Transform } from 'node:stream';
import type { ReadableStream as WebReadableStream } from 'node:stream/web';
import { pipeline } from 'node:stream/promises';
import { Command, Option } from 'commander';
import type { DownloadOptions } from '../../shared/api/client.ts';
import { DOWNLOAD_FORMATS, provenanceSchema } from '../../shared/api/results.ts';
import { connect } from '../connect.ts';
import { parseFilter } from '../filters.ts';
import { examples } from '../help.ts';
import { positiveId } from '../planFile.ts';
import { bar, count, liveLine } from '../terminal.ts';

interface ResultsOptions {
  format: DownloadOptions['format'];
  filter: string[];
  sort?: string;
  desc?: boolean;
  status?: string;
  region?: string;
  out?: string;
}

const collect = (value: string, previous: string[]): string[] => [...previous, value];

/** Lines of a download that are not rows: CSV's `# key: value` block and header, NDJSON's provenance, JSON's closing. */
const FRAME_LINES = { csv: Object.keys(provenanceSchema.shape).length + 1, ndjson: 1, json: 2 } as const;

/** Counts rows as they pass (one a line) and redraws the bar now and then. */
function progress(total: number | undefined, format: keyof typeof FRAME_LINES) {
  const line = liveLine(process.stderr);
  let lines = 0;
  let bytes = 0;
  let drawnAt = 0;
  const draw = () => {
    const rows = Math.max(0, lines - FRAME_LINES[format]);
    const of = total === undefined ? '' : `/${count(total)}`;
    const fraction = total ? Math.min(1, rows / total) : undefined;
    line.draw(`${fraction === undefined ? '' : `${bar(fraction)} `}${count(rows)}${of} rows  ${(bytes / 1e6).toFixed(1)} MB`);
  };
  const counter = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      bytes += chunk.length;
      for (let i = chunk.indexOf(10); i >= 0; i = chunk.indexOf(10, i + 1)) lines++;
      if (Date.now() - drawnAt > 100) {
        drawnAt = Date.now();
        draw();
      }
      done(null, chunk);
    },
  });
  return { counter, finish: () => { draw(); line.done(); } };
}

/** Writes to FILE.partial and renames at the end, so a cut download never looks complete. */
async function saveTo(file: string, source: Readable, format: keyof typeof FRAME_LINES, total: () => Promise<number | undefined>): Promise<void> {
  const partial = `${file}.partial`;
  const bar = process.stderr.isTTY ? progress(await total(), format) : undefined;
  try {
    if (bar) await pipeline(source, bar.counter, createWriteStream(partial));
    else await pipeline(source, createWriteStream(partial));
    await rename(partial, file);
  } catch (error) {
    await rm(partial, { force: true });
    throw error;
  } finally {
    bar?.finish();
  }
}

export const results = new Command('results')
  .description("stream a scan's results (every stored point) as CSV, JSON or NDJSON")
  .argument('<ID>', 'scan id')
  .addOption(new Option('--format <format>', 'output format').choices(DOWNLOAD_FORMATS).default('csv'))
  .option('--filter <condition>', "keep rows where it holds: <column><op><number>, op one of > >= < <= =; repeatable (all must hold)", collect, [])
  .option('--sort <column>', 'sort by this column (an observable such as ns, r, chi2, or param.<name>)')
  .option('--desc', 'sort in descending order')
  .option('--status <list>', 'only points with these statuses, e.g. ok or ok,never_ends')
  .option('--region <list>', 'only points in these regions: inside68, inside95, outside')
  .option('--out <file>', 'write to this file (with a progress bar on a terminal) instead of stdout')
  .addHelpText('after', examples(
    'rollway results 12 --out scan-12.csv',
    "rollway results 12 --filter 'ns>0.96' --filter 'r<0.036' --sort r --format ndjson",
    'rollway results 12 --region inside68 --sort chi2 | head',
  ))
  .action(async (id: string, options: ResultsOptions) => {
    const scanId = positiveId(id);
    const query: DownloadOptions = {
      format: options.format, filters: options.filter.map(parseFilter), sort: options.sort,
      order: options.desc ? 'desc' : undefined, status: options.status, region: options.region,
    };
    const { client } = await connect();
    const source = Readable.fromWeb((await client.results.download(scanId, query)) as WebReadableStream);
    if (options.out !== undefined) {
      const selected = query.filters!.length > 0 || query.status !== undefined || query.region !== undefined;
      await saveTo(options.out, source, options.format ?? 'csv', async () => (selected ? undefined : (await client.scans.get(scanId)).pointsDone));
      return;
    }
    try {
      await pipeline(source, process.stdout);
    } catch (error) {
      // The reader went away (`| head`): not a failure of ours.
      if ((error as NodeJS.ErrnoException).code !== 'EPIPE') throw error;
    }
  });
