import type { PGlite } from '@electric-sql/pglite';
import { and, eq, gt, gte, inArray, isNotNull, isNull, lt, lte, or, sql, type SQL, type SQLWrapper } from 'drizzle-orm';
import { PgDialect } from 'drizzle-orm/pg-core';
import {
  NUMBER_COLUMNS, OBSERVABLE_COLUMNS, resultRowSchema, type ColumnRef, type Filter, type NumberColumn, type ObservableColumn, type ResultRow,
} from '../../shared/api/results.ts';
import type { Region } from '../../shared/physics/bounds/score.ts';
import type { PointStatus } from '../../shared/physics/point/types.ts';
import { pgliteOf, type Database } from '../db/client.ts';
import { decodeCopyBinary } from '../db/copyBinary.ts';
import { RESULT_COLUMNS, type ColumnKind } from '../db/resultColumns.ts';
import { pointResults } from '../db/schema/pointResults.ts';

/**
 * Queries over point_results. User text never reaches SQL: column names resolve through the
 * whitelist map below (keys checked by the shared schema), parameter names and values are bound.
 */

const COLUMNS = new Map<NumberColumn, SQLWrapper>(NUMBER_COLUMNS.map((name) => [name, pointResults[name]]));
export const column = (name: NumberColumn): SQLWrapper => COLUMNS.get(name)!;
const OPS = { gt, gte, lt, lte, eq } as const;

/**
 * A whole row as one JSON text built by the database, keys already in the API's camelCase.
 * PGlite decodes a result field by field (measured: 5000 rows of 31 plain columns ~260 ms, the
 * same rows as one JSON text each ~80 ms), and JSON.parse of one text per row is fast. Keys are
 * bound as parameters like every other value. `source` is the table or a subquery over it.
 */
const ROW_KEYS = Object.keys(resultRowSchema.shape) as (keyof ResultRow)[];
// Only the API's fields: internal columns (scanId, pointKey) stay out of responses.
const rowColumns = Object.fromEntries(ROW_KEYS.map((key) => [key, pointResults[key]]));
const rowJson = (source: object) => {
  const from = source as Record<string, SQLWrapper>;
  return sql<string>`json_build_object(${sql.join(ROW_KEYS.map((key) => sql`${key}::text, ${from[key]!}`), sql`, `)})::text`;
};
const parseRow = (text: string): ResultRow => JSON.parse(text) as ResultRow;

/** Which rows: a scan plus optional filters, statuses and regions (all ANDed). */
export interface RowSelection {
  scanId: number;
  filters: Filter[];
  status?: PointStatus[] | undefined;
  region?: Region[] | undefined;
}

export interface Keyset { value: number | null; pointIndex: number }

export interface PageSpec extends RowSelection {
  sort: ColumnRef;
  order: 'asc' | 'desc';
  limit: number;
  offset?: number | undefined;
  after?: Keyset | undefined;
}

export interface PageRow { row: ResultRow; key: Keyset }

/** The value of a column or parameter; a parameter is read from params jsonb as float8. */
export const valueOf = (ref: ColumnRef): SQLWrapper =>
  ref.kind === 'column' ? column(ref.name) : sql<number | null>`(${pointResults.params} ->> ${ref.name})::float8`;

export function selection(q: RowSelection): SQL {
  return and(
    eq(pointResults.scanId, q.scanId),
    ...q.filters.map((f) => OPS[f.op](valueOf(f.ref), f.value)),
    q.status && inArray(pointResults.status, q.status),
    q.region && inArray(pointResults.region, q.region),
  )!;
}

/** ORDER BY value NULLS LAST, pointIndex, both in `dir`, as a comparison of keysets. */
const compareKeys = (dir: 1 | -1) => (a: PageRow, b: PageRow): number => {
  const x = a.key.value;
  const y = b.key.value;
  if (x !== y) return x === null ? 1 : y === null ? -1 : dir * (x - y);
  return dir * (a.key.pointIndex - b.key.pointIndex);
};

/**
 * One page of rows with their keyset. On PGlite as binary COPY (copyRows, below). On a PostgreSQL
 * server it sorts and limits whole rows in a subquery and builds the JSON of only those in the outer
 * query: in one level the planner may build the JSON of every matching row before a top-N sort
 * (measured on 200k rows without statistics: 2.5 s instead of ~0.1 s). The outer level is put back in order here,
 * since SQL does not promise that a subquery's order survives, and an outer ORDER BY would sort
 * the wide JSON texts (it spilled to disk at 5000 rows).
 */
async function fetchRows(db: Database, where: SQL, order: SQL[], limit: number, offset: number, value: SQLWrapper, dir: 1 | -1): Promise<PageRow[]> {
  const pglite = pgliteOf(db);
  if (pglite) {
    const query = db.select({ ...rowColumns, sortValue: sql`${value}::float8` }).from(pointResults).where(where).orderBy(...order).limit(limit).offset(offset);
    return (await copyRows(pglite, query.getSQL())).sort(compareKeys(dir));
  }
  const k = db.select({ ...rowColumns, pointIndex: pointResults.pointIndex, sortValue: sql<number | null>`${value}`.as('sort_value') })
    .from(pointResults).where(where).orderBy(...order).limit(limit).offset(offset).as('k');
  const rows = await db.select({ json: rowJson(k), value: k.sortValue, pointIndex: k.pointIndex }).from(k);
  return rows.map((r) => ({ row: parseRow(r.json), key: { value: r.value, pointIndex: r.pointIndex } })).sort(compareKeys(dir));
}

const dialect = new PgDialect({ casing: 'snake_case' });
const KIND_OF = new Map<string, ColumnKind>(RESULT_COLUMNS.map((c) => [c.key, c.kind]));
const COPY_KINDS: ColumnKind[] = [...ROW_KEYS.map((key) => KIND_OF.get(key)!), 'float8'];

/**
 * The embedded path: the page's rows as one binary COPY (PGlite's /dev/blob), decoded here.
 * Turning doubles into text (for JSON or the text protocol) is most of a page's time in
 * PGlite's WebAssembly: 1000 rows of 31 columns took ~60 ms as JSON texts, ~16 ms as binary
 * COPY. COPY takes no bound parameters, so the values are inlined by drizzle as literals
 * (numbers from validated filters and cursors, strings quoted by the dialect); a parameter
 * left over is refused rather than sent.
 */
async function copyRows(pglite: PGlite, query: SQL): Promise<PageRow[]> {
  const { sql: text, params } = dialect.sqlToQuery(query.inlineParams());
  if (params.length > 0) throw new Error('a page query kept bound parameters, which COPY cannot take');
  const result = await pglite.query(`copy (${text}) to '/dev/blob' with (format binary)`);
  const bytes = new Uint8Array(await result.blob!.arrayBuffer());
  return decodeCopyBinary(bytes, COPY_KINDS).map((values) => {
    const row: Record<string, unknown> = {};
    for (let i = 0; i < ROW_KEYS.length; i++) row[ROW_KEYS[i]!] = values[i];
    return { row: row as ResultRow, key: { value: values[ROW_KEYS.length] as number | null, pointIndex: row.pointIndex as number } };
  });
}

/**
 * A page in ORDER BY value NULLS LAST, pointIndex (both in the sort's direction).
 *
 * Keyset pages run in two sections, the non-null values first and then the NULL ones, because
 * `value IS NOT NULL ORDER BY value DESC` can walk the (scan_id, column) index backwards while
 * `DESC NULLS LAST` cannot (measured on 200k rows: a full sort, ~130 ms, against ~4 ms), and the
 * position test inside a section is a plain range (`value >= v AND (value > v OR index > i)`).
 * OFFSET pages keep the one-statement form: skipping rows costs a scan either way.
 */
export async function selectPage(db: Database, q: PageSpec): Promise<PageRow[]> {
  const value = valueOf(q.sort);
  const index = pointResults.pointIndex;
  const dir = sql.raw(q.order === 'asc' ? 'asc' : 'desc');
  const [beyond, reach] = q.order === 'asc' ? [gt, gte] : [lt, lte];
  const where = selection(q);
  const fetch = (w: SQL, order: SQL[], limit: number, offset = 0) => fetchRows(db, w, order, limit, offset, value, q.order === 'asc' ? 1 : -1);
  if (q.sort.kind === 'column' && q.sort.name === 'pointIndex') {
    return fetch(q.after ? and(where, beyond(index, q.after.pointIndex))! : where, [sql`${index} ${dir}`], q.limit, q.offset ?? 0);
  }
  if (q.offset) return fetch(where, [sql`${value} ${dir} nulls last`, sql`${index} ${dir}`], q.limit, q.offset);
  const at = q.after;
  let rows: PageRow[] = [];
  if (at === undefined || at.value !== null) {
    const position = at === undefined ? undefined : and(reach(value, at.value!), or(beyond(value, at.value!), beyond(index, at.pointIndex)));
    rows = await fetch(and(where, isNotNull(value), position)!, [sql`${value} ${dir}`, sql`${index} ${dir}`], q.limit);
  }
  if (rows.length < q.limit) {
    const position = at?.value === null ? beyond(index, at.pointIndex) : undefined;
    rows = rows.concat(await fetch(and(where, isNull(value), position)!, [sql`${index} ${dir}`], q.limit - rows.length));
  }
  return rows;
}

export async function countRows(db: Database, q: RowSelection): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(pointResults).where(selection(q));
  return row?.n ?? 0;
}

/** Rows per value of a text column (status or region; a NULL region comes back as null). */
export async function countBy(db: Database, scanId: number, column: 'status' | 'region'): Promise<{ key: string | null; n: number }[]> {
  const key = pointResults[column];
  return db.select({ key, n: sql<number>`count(*)::int` }).from(pointResults).where(eq(pointResults.scanId, scanId)).groupBy(key);
}

export type ColumnStats = { min: number | null; max: number | null; mean: number | null; count: number };

/** min, max, mean and count of every observable over ok points, in one pass over the scan. */
export async function observableStats(db: Database, scanId: number): Promise<Record<ObservableColumn, ColumnStats>> {
  const fields: Record<string, SQL> = {};
  for (const name of OBSERVABLE_COLUMNS) {
    const c = pointResults[name];
    fields[`${name}.min`] = sql`min(${c})`;
    fields[`${name}.max`] = sql`max(${c})`;
    fields[`${name}.mean`] = sql`avg(${c})`;
    fields[`${name}.count`] = sql`count(${c})::int`;
  }
  const [row = {}] = await db.select(fields).from(pointResults).where(and(eq(pointResults.scanId, scanId), eq(pointResults.status, 'ok')));
  const get = (key: string) => (row as Record<string, number | null>)[key] ?? null;
  return Object.fromEntries(OBSERVABLE_COLUMNS.map((name) => [name, {
    min: get(`${name}.min`), max: get(`${name}.max`), mean: get(`${name}.mean`), count: get(`${name}.count`) ?? 0,
  }])) as Record<ObservableColumn, ColumnStats>;
}

export async function lowestChi2(db: Database, scanId: number, limit: number): Promise<ResultRow[]> {
  const rows = await db.select({ json: rowJson(rowColumns) }).from(pointResults)
    .where(and(eq(pointResults.scanId, scanId), eq(pointResults.status, 'ok'), isNotNull(pointResults.chi2)))
    .orderBy(pointResults.chi2, pointResults.pointIndex)
    .limit(limit);
  return rows.map((r) => parseRow(r.json));
}
