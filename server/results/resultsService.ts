import {
  POINT_STATUSES, refText,
  type ColumnRef, type DownloadQuery, type Filter, type Heatmap, type HeatmapQuery, type Provenance, type ResultRow, type ResultsPage, type ResultsQuery, type ResultsSummary,
} from '../../shared/api/results.ts';
import { InvalidInputError, NotFoundError } from '../../shared/errors.ts';
import { planBoundSet, type ScanPlan } from '../../shared/plan/scanPlan.ts';
import type { Database } from '../db/client.ts';
import { findScan } from '../scans/scansRepository.ts';
import { CountCache } from './countCache.ts';
import { decodeCursor, encodeCursor } from './cursor.ts';
import { heatmapCells, heatmapSize, REGION_RANK, type HeatmapCell } from './heatmapRepository.ts';
import { planParameters } from './planParameters.ts';
import { CONTENT_TYPES, downloadChunks } from './resultsFormat.ts';
import { countBy, countRows, lowestChi2, observableStats, selectPage, type PageSpec, type RowSelection } from './resultsRepository.ts';

/** Rows per query while downloading: large enough to amortise a query, small enough to stream. */
export const DOWNLOAD_PAGE = 5000;
/** A bigger grid is tens of MB of JSON and more cells than a screen has pixels. */
export const MAX_HEATMAP_CELLS = 250_000;
const BEST_COUNT = 10;

/** The query a download answers, in query-string form, for its provenance block. */
function describe(q: DownloadQuery): string {
  const parts = q.filters.map((f) => `${f.field}=${f.value}`);
  if (q.status) parts.push(`status=${q.status.join(',')}`);
  if (q.region) parts.push(`region=${q.region.join(',')}`);
  return [...parts, `sort=${refText(q.sort)}`, `order=${q.order}`].join('&');
}

/** values[iy][ix] over the sorted distinct x and y; empty cells stay null. */
export function toGrid(cells: HeatmapCell[]): Heatmap {
  const x = [...new Set(cells.map((c) => c[0]))].sort((a, b) => a - b);
  const y = [...new Set(cells.map((c) => c[1]))].sort((a, b) => a - b);
  const ix = new Map(x.map((v, i) => [v, i]));
  const iy = new Map(y.map((v, i) => [v, i]));
  const values = y.map(() => new Array<number | null>(x.length).fill(null));
  const region = y.map(() => new Array<Heatmap['region'][number][number]>(x.length).fill(null));
  for (const [cx, cy, value, rank] of cells) {
    values[iy.get(cy)!]![ix.get(cx)!] = value;
    region[iy.get(cy)!]![ix.get(cx)!] = rank === null ? null : REGION_RANK[rank] ?? null;
  }
  return { x, y, values, region };
}

export type ResultsService = ReturnType<typeof createResultsService>;

export function createResultsService(db: Database, counts = new CountCache()) {
  /**
   * Loads the scan and checks every parameter a query names against its plan, so a typo is a 400
   * naming the query key rather than an empty result.
   */
  const open = async (id: number, filters: Filter[], refs: { ref: ColumnRef; field: string }[] = []) => {
    const scan = await findScan(db, id);
    if (!scan) throw new NotFoundError(`scan ${id} does not exist`);
    const params = planParameters(scan.plan);
    for (const { ref, field } of [...filters, ...refs]) {
      if (ref.kind === 'param' && !params.has(ref.name)) {
        throw new InvalidInputError(`${field}: scan ${id} has no parameter "${ref.name}"; its parameters are ${[...params.keys()].join(', ') || 'none'}`, field);
      }
    }
    return { scan, params };
  };
  const selectionOf = (scanId: number, q: Omit<RowSelection, 'scanId'>): RowSelection => ({ scanId, filters: q.filters, status: q.status, region: q.region });

  /** Keyset pages of a whole selection, one query per page, never more than one page in memory. */
  async function* pages(spec: Omit<PageSpec, 'limit' | 'offset' | 'after'>): AsyncGenerator<ResultRow[]> {
    let after: PageSpec['after'];
    for (;;) {
      const rows = await selectPage(db, { ...spec, limit: DOWNLOAD_PAGE, after });
      if (rows.length > 0) yield rows.map((r) => r.row);
      if (rows.length < DOWNLOAD_PAGE) return;
      after = rows[rows.length - 1]!.key;
    }
  }

  return {
    async page(id: number, q: ResultsQuery): Promise<ResultsPage> {
      const { scan } = await open(id, q.filters, [{ ref: q.sort, field: 'sort' }]);
      const selection = selectionOf(id, q);
      const after = q.cursor === undefined ? undefined : decodeCursor(q.cursor, q.sort, q.order);
      // One row more than asked tells whether there is a next page without a second query.
      const rows = await selectPage(db, { ...selection, sort: q.sort, order: q.order, limit: q.limit + 1, offset: q.offset, after });
      const total = await counts.get(scan, selection, () => countRows(db, selection));
      const page = rows.slice(0, q.limit);
      const last = page[page.length - 1];
      const nextCursor = rows.length > q.limit && last ? encodeCursor(q.sort, q.order, last.key) : null;
      return { rows: page.map((r) => r.row), total, nextCursor };
    },

    async summary(id: number): Promise<ResultsSummary> {
      await open(id, []);
      const byStatus = Object.fromEntries(POINT_STATUSES.map((s) => [s, 0])) as ResultsSummary['byStatus'];
      const byRegion: ResultsSummary['byRegion'] = { inside68: 0, inside95: 0, outside: 0, unscored: 0 };
      let total = 0;
      for (const { key, n } of await countBy(db, id, 'status')) {
        total += n;
        if (key !== null && key in byStatus) byStatus[key as keyof typeof byStatus] = n;
      }
      for (const { key, n } of await countBy(db, id, 'region')) {
        byRegion[key !== null && key in byRegion ? (key as keyof typeof byRegion) : 'unscored'] += n;
      }
      return { scanId: id, total, byStatus, byRegion, observables: await observableStats(db, id), best: await lowestChi2(db, id, BEST_COUNT) };
    },

    async download(id: number, q: DownloadQuery) {
      const { scan, params } = await open(id, q.filters, [{ ref: q.sort, field: 'sort' }]);
      const provenance: Provenance = {
        scanId: scan.id, title: scan.title, state: scan.state, pointCount: scan.pointCount, pointsDone: scan.pointsDone,
        planHash: scan.planHash, physicsVersion: scan.physicsVersion,
        boundSet: planBoundSet(scan.plan as Pick<ScanPlan, 'boundSet'>).id,
        query: describe(q), generatedAt: new Date().toISOString(),
      };
      const rows = pages({ ...selectionOf(id, q), sort: q.sort, order: q.order });
      return { filename: `scan-${id}.${q.format}`, contentType: CONTENT_TYPES[q.format], chunks: downloadChunks(q.format, provenance, [...params.keys()], rows) };
    },

    async heatmap(id: number, q: HeatmapQuery): Promise<Heatmap> {
      const { params } = await open(id, q.filters, [{ ref: { kind: 'param', name: q.x }, field: 'x' }, { ref: { kind: 'param', name: q.y }, field: 'y' }]);
      const spec = { ...selectionOf(id, q), x: q.x, y: q.y, value: q.value, agg: q.agg };
      // The plan bounds the grid without a query; only a grid that may be too large is counted.
      if (params.get(q.x)! * params.get(q.y)! > MAX_HEATMAP_CELLS) {
        const { nx, ny } = await heatmapSize(db, spec);
        if (nx * ny > MAX_HEATMAP_CELLS) {
          throw new InvalidInputError(`x: ${q.x} × ${q.y} is a ${nx} × ${ny} grid, over ${MAX_HEATMAP_CELLS} cells; narrow it with filters such as param.${q.x}.lte=<number>`, 'x');
        }
      }
      return toGrid(await heatmapCells(db, spec));
    },
  };
}
