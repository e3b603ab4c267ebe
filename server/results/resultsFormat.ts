import { OBSERVABLE_COLUMNS, PARAM_PREFIX, type Provenance, type ResultRow } from '../../shared/api/results.ts';

/**
 * Turns pages of rows into the text of a download, one chunk per page, so the router can write
 * each page as it arrives. Pure: no I/O, so every format is testable without a server.
 */

export type DownloadFormat = 'csv' | 'json' | 'ndjson';

export const CONTENT_TYPES: Record<DownloadFormat, string> = {
  csv: 'text/csv; charset=utf-8; header=present',
  json: 'application/json; charset=utf-8',
  ndjson: 'application/x-ndjson; charset=utf-8',
};

// RFC 4180 line ends. '#' is quoted too, so a reader told to skip '#' comments never cuts a field.
const EOL = '\r\n';
const NEEDS_QUOTES = /[",\r\n#]/;

/** An RFC 4180 field: quoted when it holds a delimiter, quote, line break or '#'; quotes doubled. */
export const csvText = (s: string | null): string => (s === null ? '' : NEEDS_QUOTES.test(s) ? `"${s.replaceAll('"', '""')}"` : s);
/** Shortest text that reads back to the same double; NULL (not computed) is an empty field. */
const csvNumber = (x: number | null | undefined): string => (x === null || x === undefined ? '' : String(x));

export function csvHeader(paramNames: readonly string[]): string {
  const names = ['pointIndex', ...paramNames.map((n) => PARAM_PREFIX + n), 'status', 'reason', ...OBSERVABLE_COLUMNS, 'region', 'computeMs', 'evaluations'];
  return names.map(csvText).join(',') + EOL;
}

export function csvLine(row: ResultRow, paramNames: readonly string[]): string {
  const fields = [String(row.pointIndex)];
  for (const name of paramNames) fields.push(csvNumber(row.params[name]));
  fields.push(csvText(row.status), csvText(row.reason));
  for (const name of OBSERVABLE_COLUMNS) fields.push(csvNumber(row[name]));
  fields.push(csvText(row.region), csvNumber(row.computeMs), csvNumber(row.evaluations));
  return fields.join(',') + EOL;
}

/** `# key: value` lines; values are flattened to one line so a title cannot end the comment. */
export function csvProvenance(p: Provenance): string {
  return Object.entries(p).map(([key, value]) => `# ${key}: ${String(value).replace(/[\r\n]+/g, ' ')}${EOL}`).join('');
}

/** The whole download as chunks: the header block first, then one chunk per page of rows. */
export async function* downloadChunks(
  format: DownloadFormat,
  provenance: Provenance,
  paramNames: readonly string[],
  pages: AsyncIterable<ResultRow[]>,
): AsyncGenerator<string> {
  if (format === 'csv') {
    yield csvProvenance(provenance) + csvHeader(paramNames);
    for await (const rows of pages) yield rows.map((r) => csvLine(r, paramNames)).join('');
    return;
  }
  if (format === 'ndjson') {
    yield JSON.stringify({ provenance }) + '\n';
    for await (const rows of pages) yield rows.map((r) => JSON.stringify(r) + '\n').join('');
    return;
  }
  // JSON: the opening, rows separated by commas across pages, then the closing.
  yield `{"provenance":${JSON.stringify(provenance)},"rows":[`;
  let first = true;
  for await (const rows of pages) {
    if (rows.length === 0) continue;
    yield (first ? '\n' : ',\n') + rows.map((r) => JSON.stringify(r)).join(',\n');
    first = false;
  }
  yield '\n]}\n';
}
