import { FILTER_OPS, NUMBER_COLUMNS, PARAM_PREFIX, RESULTS_PAGE_MAX, type FilterOp } from '../../../shared/api/results.ts';
import type { PointStatus } from '../../../shared/physics/point/types.ts';
import type { Region } from '../../../shared/physics/bounds/score.ts';

/**
 * AG Grid's sort and filter models → the query string of GET /scans/:id/results and /download
 * (`sort`, `order`, `<column>.<op>=value`, `status`, `region`, `limit` with `offset` or `cursor`).
 * Pure, so the mapping is tested apart from the grid. Grid column ids are the API's column names
 * (`ns`, `pointIndex`, `param.alpha`). The API ANDs its filters, so only conditions that AND into
 * `<column>.<op>` bounds are accepted; anything else is refused with a message naming the column
 * rather than dropped, which would show rows the user excluded. The grid offers only these options.
 */

export interface GridSortItem { colId: string; sort: 'asc' | 'desc' }
export interface GridNumberCondition { filterType?: string; type?: string | null; filter?: number | null; filterTo?: number | null }
export interface GridCombinedCondition { filterType?: string; operator: 'AND' | 'OR'; conditions: GridNumberCondition[] }
export type GridFilterModel = Record<string, GridNumberCondition | GridCombinedCondition>;
/** The status and region chips above the grid (AG Grid community has no set filter). */
export interface RowSelection { status?: readonly PointStatus[]; region?: readonly Region[] }

/** The number-filter options the grid offers, each with the API bounds it becomes. */
export const GRID_FILTER_OPTIONS = ['greaterThan', 'greaterThanOrEqual', 'lessThan', 'lessThanOrEqual', 'equals', 'inRange'] as const;
const SINGLE_OP: Record<string, FilterOp> = { greaterThan: 'gt', greaterThanOrEqual: 'gte', lessThan: 'lt', lessThanOrEqual: 'lte', equals: 'eq' };

export class ResultsQueryError extends Error {
  constructor(readonly column: string, message: string) {
    super(`${column}: ${message}`);
  }
}

/** True for a column the API can sort and filter on. */
export function isQueryColumn(colId: string): boolean {
  if (colId.startsWith(PARAM_PREFIX)) return /^[A-Za-z_][A-Za-z0-9_]{0,63}$/.test(colId.slice(PARAM_PREFIX.length));
  return (NUMBER_COLUMNS as readonly string[]).includes(colId);
}

function conditionBounds(column: string, c: GridNumberCondition): Array<[FilterOp, number]> {
  if (c.filterType !== undefined && c.filterType !== 'number') throw new ResultsQueryError(column, `only number filters are supported, not "${c.filterType}"`);
  const op = SINGLE_OP[c.type ?? ''];
  if (op === undefined && c.type !== 'inRange') throw new ResultsQueryError(column, `the filter "${c.type}" is not supported; use ${GRID_FILTER_OPTIONS.join(', ')}`);
  const ends = c.type === 'inRange' ? [c.filter, c.filterTo] : [c.filter];
  if (ends.some((v) => v === null || v === undefined)) return []; // an option chosen but its number not typed yet
  if (!ends.every((v) => Number.isFinite(v))) throw new ResultsQueryError(column, 'the filter value must be a finite number');
  const [from, to] = ends as number[];
  // Inclusive at both ends: the grid's columns set inRangeInclusive to match.
  if (op === undefined) return [['gte', Math.min(from!, to!)], ['lte', Math.max(from!, to!)]];
  return [[op, from!]];
}

/** Two bounds of the same kind on one column AND together: keep the tighter one. */
function tighter(op: FilterOp, a: number, b: number, column: string): number {
  if (op === 'gt' || op === 'gte') return Math.max(a, b);
  if (op === 'lt' || op === 'lte') return Math.min(a, b);
  if (a !== b) throw new ResultsQueryError(column, `cannot equal both ${a} and ${b}`);
  return a;
}

/** `<column>.<op>` → value, in a stable order (columns as given, ops in the API's order). */
export function filterBounds(model: GridFilterModel): Map<string, number> {
  const bounds = new Map<string, number>();
  for (const [column, entry] of Object.entries(model)) {
    if (!isQueryColumn(column)) throw new ResultsQueryError(column, 'this column cannot be filtered');
    let conditions: GridNumberCondition[];
    if ('operator' in entry) {
      if (entry.operator !== 'AND') throw new ResultsQueryError(column, 'conditions can only be combined with AND');
      conditions = entry.conditions;
    } else conditions = [entry];
    const byOp = new Map<FilterOp, number>();
    for (const [op, value] of conditions.flatMap((c) => conditionBounds(column, c))) {
      const seen = byOp.get(op);
      byOp.set(op, seen === undefined ? value : tighter(op, seen, value, column));
    }
    for (const op of FILTER_OPS) {
      const value = byOp.get(op);
      if (value !== undefined) bounds.set(`${column}.${op}`, value);
    }
  }
  return bounds;
}

/** Sort, filters and the status/region selection: the part shared by a page and a download. */
export function rowQuery(sortModel: readonly GridSortItem[], filterModel: GridFilterModel, selection: RowSelection = {}): URLSearchParams {
  const params = new URLSearchParams();
  // The API sorts by one column (with the point index as the tie-break); the grid's first wins.
  const sort = sortModel[0];
  if (sort !== undefined) {
    if (!isQueryColumn(sort.colId)) throw new ResultsQueryError(sort.colId, 'this column cannot be sorted');
    params.set('sort', sort.colId);
    params.set('order', sort.sort);
  }
  for (const [key, value] of filterBounds(filterModel)) params.set(key, String(value));
  if (selection.status?.length) params.set('status', selection.status.join(','));
  if (selection.region?.length) params.set('region', selection.region.join(','));
  return params;
}

/** One block of the grid's infinite row model: rows [startRow, endRow), by cursor when known. */
export function pageQuery(base: URLSearchParams, startRow: number, endRow: number, cursor?: string): URLSearchParams {
  if (!(Number.isInteger(startRow) && startRow >= 0 && endRow > startRow)) throw new RangeError(`bad row block [${startRow}, ${endRow})`);
  const params = new URLSearchParams(base);
  params.set('limit', String(Math.min(endRow - startRow, RESULTS_PAGE_MAX)));
  if (cursor !== undefined) params.set('cursor', cursor);
  else params.set('offset', String(startRow));
  return params;
}
