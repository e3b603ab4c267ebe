import { z } from 'zod';
import { InvalidInputError } from '../errors.ts';
import type { Region } from '../physics/bounds/score.ts';
import type { PointStatus } from '../physics/point/types.ts';

/**
 * API types of a scan's results (table, summary, downloads, heatmap), shared by the server, the
 * CLI and the web app. Column names are the API's camelCase names; the server maps them to SQL
 * through its own whitelist, so nothing here is ever spliced into a query.
 */

const observable = z.number().nullable();
/** Every observable column, in download order. One object so the list and the row type agree. */
const observableShape = {
  nTotal: observable, nPivot: observable, phiStart: observable, phiEnd: observable, phiPivot: observable,
  deltaPhi: observable, eps1: observable, eps2: observable, eps3: observable, ns: observable, r: observable,
  nt: observable, alphaS: observable, As: observable, amplitude: observable, energyScaleGeV: observable,
  hubbleGeV: observable, exactNs: observable, exactR: observable, exactNt: observable, exactAlphaS: observable,
  exactAs: observable, exactAmplitude: observable, chi2: observable,
};
export type ObservableColumn = keyof typeof observableShape;
export const OBSERVABLE_COLUMNS = Object.keys(observableShape) as ObservableColumn[];
/** Numeric columns that can be sorted and filtered: the observables plus the bookkeeping ones. */
export const NUMBER_COLUMNS = ['pointIndex', ...OBSERVABLE_COLUMNS, 'computeMs', 'evaluations'] as const;
export type NumberColumn = (typeof NUMBER_COLUMNS)[number];
/** Integer in the database: a fractional bound would be a type error in SQL, so it is a 400 here. */
export const INTEGER_COLUMNS: ReadonlySet<NumberColumn> = new Set(['pointIndex', 'evaluations']);
/** What a heatmap cell can aggregate: anything numeric but the point's own index. */
export type HeatmapValue = Exclude<NumberColumn, 'pointIndex'>;
export const HEATMAP_VALUES = NUMBER_COLUMNS.filter((c) => c !== 'pointIndex') as HeatmapValue[];

// Records rather than arrays, so the compiler fails when the physics core adds a status or region.
const statusSet: Record<PointStatus, true> = { ok: true, no_inflation: true, too_few_efolds: true, never_ends: true, negative_potential: true, solver_failed: true };
const regionSet: Record<Region, true> = { inside68: true, inside95: true, outside: true };
export const POINT_STATUSES = Object.keys(statusSet) as PointStatus[];
export const REGIONS = Object.keys(regionSet) as Region[];
export const FILTER_OPS = ['gt', 'gte', 'lt', 'lte', 'eq'] as const;
export type FilterOp = (typeof FILTER_OPS)[number];
export const DOWNLOAD_FORMATS = ['csv', 'json', 'ndjson'] as const;
export const HEATMAP_AGGREGATES = ['mean', 'min', 'max', 'count'] as const;
export const PARAM_PREFIX = 'param.';
const PARAM_NAME = /^[A-Za-z_][A-Za-z0-9_]{0,63}$/;

/** A sortable, filterable column: a real one, or a parameter inside the params object. */
export type ColumnRef = { kind: 'column'; name: NumberColumn } | { kind: 'param'; name: string };
export interface Filter { ref: ColumnRef; op: FilterOp; value: number; /** the query key, for errors */ field: string }

export const refText = (ref: ColumnRef): string => (ref.kind === 'param' ? PARAM_PREFIX + ref.name : ref.name);
const columnHelp = `one of ${NUMBER_COLUMNS.join(', ')}, or ${PARAM_PREFIX}<name> for a parameter`;

function toColumnRef(text: string): ColumnRef | undefined {
  if (text.startsWith(PARAM_PREFIX)) {
    const name = text.slice(PARAM_PREFIX.length);
    return PARAM_NAME.test(name) ? { kind: 'param', name } : undefined;
  }
  return (NUMBER_COLUMNS as readonly string[]).includes(text) ? { kind: 'column', name: text as NumberColumn } : undefined;
}

// Stricter than Number(): no hex, no "Infinity", no empty string read as 0.
const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** `<column>.<op>=value`; the field of every error is the query key as the caller wrote it. */
function parseFilter(key: string, raw: unknown): Filter {
  const dot = key.lastIndexOf('.');
  const op = key.slice(dot + 1);
  const ref = toColumnRef(key.slice(0, dot));
  if (!(FILTER_OPS as readonly string[]).includes(op)) {
    throw new InvalidInputError(`${key}: unknown operator "${op}"; use one of ${FILTER_OPS.join(', ')}`, key);
  }
  if (ref === undefined) throw new InvalidInputError(`${key}: unknown column "${key.slice(0, dot)}"; filter on ${columnHelp}`, key);
  const integer = ref.kind === 'column' && INTEGER_COLUMNS.has(ref.name);
  const value = typeof raw === 'string' && NUMBER_TEXT.test(raw.trim()) ? Number(raw) : Number.NaN;
  if (!Number.isFinite(value) || (integer && !(Number.isInteger(value) && Math.abs(value) < 2 ** 31))) {
    const what = integer ? 'a whole number' : 'a finite number';
    throw new InvalidInputError(`${key}: must be ${what}, given once; got ${JSON.stringify(raw)}`, key);
  }
  return { ref, op: op as FilterOp, value, field: key };
}

const once = (what: string) => z.string({ error: `must be ${what}, given once` });
const queryInt = (min: number, max: number) => {
  const what = `a whole number from ${min} to ${max}`;
  const error = `must be ${what}`;
  return once(what).regex(/^\d{1,10}$/, { error }).transform(Number).pipe(z.number().int().min(min, { error }).max(max, { error }));
};
const oneOf = <T extends string>(values: readonly [T, ...T[]]) => z.enum(values, { error: `must be one of ${values.join(', ')}` });
/** A comma list such as `status=ok,never_ends`; every item must be allowed. */
const listOf = <T extends string>(allowed: readonly T[]) =>
  once(`a comma list of ${allowed.join(', ')}`).transform((text, ctx) => {
    const items = text.split(',').map((s) => s.trim());
    const bad = items.find((i) => !(allowed as readonly string[]).includes(i));
    if (bad !== undefined) ctx.addIssue({ code: 'custom', message: `unknown value "${bad}"; use a comma list of ${allowed.join(', ')}` });
    return items as T[];
  });
const columnRef = once('a column name').transform((text, ctx): ColumnRef => {
  const ref = toColumnRef(text);
  if (ref === undefined) ctx.addIssue({ code: 'custom', message: `unknown column "${text}"; sort by ${columnHelp}` });
  return ref ?? { kind: 'column', name: 'pointIndex' };
});
const paramName = once('a parameter name').regex(PARAM_NAME, { error: 'must be a parameter name' });

const rowSelection = { status: listOf(POINT_STATUSES).optional(), region: listOf(REGIONS).optional() };
const sorting = { sort: columnRef.prefault('pointIndex'), order: oneOf(['asc', 'desc']).default('asc') };

export const RESULTS_PAGE_MAX = 5000;
/** GET /scans/:id/results (besides the `<column>.<op>` filters). */
export const resultsQuerySchema = z
  .strictObject({
    ...rowSelection, ...sorting,
    limit: queryInt(1, RESULTS_PAGE_MAX).default(100),
    offset: queryInt(0, 1_000_000_000).optional(),
    cursor: once('the nextCursor of a previous page').max(2000).optional(),
  })
  .refine((q) => q.offset === undefined || q.cursor === undefined, { path: ['cursor'], error: 'give offset or cursor, not both' });
/** GET /scans/:id/download */
export const downloadQuerySchema = z.strictObject({ ...rowSelection, ...sorting, format: oneOf(DOWNLOAD_FORMATS).default('csv') });
/** GET /scans/:id/heatmap; `value` may be left out only for agg=count (then it counts ok points). */
export const heatmapQuerySchema = z
  .strictObject({ ...rowSelection, x: paramName, y: paramName, value: oneOf(HEATMAP_VALUES as [string, ...string[]]).optional(), agg: oneOf(HEATMAP_AGGREGATES).default('mean') })
  .refine((q) => q.x !== q.y, { path: ['y'], error: 'must differ from x' })
  .refine((q) => q.value !== undefined || q.agg === 'count', { path: ['value'], error: `required unless agg=count; one of ${HEATMAP_VALUES.join(', ')}` })
  .transform((q) => ({ ...q, value: q.value as HeatmapValue | undefined }));

type WithFilters<S extends z.ZodType> = z.infer<S> & { filters: Filter[] };
export type ResultsQuery = WithFilters<typeof resultsQuerySchema>;
export type DownloadQuery = WithFilters<typeof downloadQuerySchema>;
export type HeatmapQuery = WithFilters<typeof heatmapQuerySchema>;

/**
 * Splits a query string into the schema's own keys and `<column>.<op>` filters. Any other key is a
 * 400 naming it, so a typo such as `sotr=ns` is reported rather than silently ignored.
 */
export function parseRowQuery<S extends z.ZodType>(schema: S, keys: readonly string[], raw: Record<string, unknown>): WithFilters<S> {
  const own: Record<string, unknown> = {};
  const filters: Filter[] = [];
  for (const [key, value] of Object.entries(raw)) {
    if (keys.includes(key)) own[key] = value;
    else if (key.includes('.')) filters.push(parseFilter(key, value));
    else throw new InvalidInputError(`unknown query parameter "${key}"; use ${keys.join(', ')} or a filter <column>.<op>=<number> (op: ${FILTER_OPS.join(', ')})`, key);
  }
  const parsed = schema.safeParse(own);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const field = String(issue.path[0] ?? '');
    throw new InvalidInputError(`${field}: ${issue.message}`, field);
  }
  return Object.assign(parsed.data as object, { filters }) as WithFilters<S>;
}

const keysOf = (s: { shape: object }) => Object.keys(s.shape);
export const parseResultsQuery = (raw: Record<string, unknown>): ResultsQuery => parseRowQuery(resultsQuerySchema, keysOf(resultsQuerySchema), raw);
export const parseDownloadQuery = (raw: Record<string, unknown>): DownloadQuery => parseRowQuery(downloadQuerySchema, keysOf(downloadQuerySchema), raw);
export const parseHeatmapQuery = (raw: Record<string, unknown>): HeatmapQuery => parseRowQuery(heatmapQuerySchema, ['x', 'y', 'value', 'agg', 'status', 'region'], raw);

// Responses.
export const resultRowSchema = z.object({
  pointIndex: z.number().int(),
  params: z.record(z.string(), z.number()),
  status: z.enum(POINT_STATUSES as [PointStatus, ...PointStatus[]]),
  reason: z.string(),
  ...observableShape,
  region: z.enum(REGIONS as [Region, ...Region[]]).nullable(),
  computeMs: z.number(),
  evaluations: z.number().int().nullable(),
});
export type ResultRow = z.infer<typeof resultRowSchema>;

export const resultsPageSchema = z.object({ rows: z.array(resultRowSchema), total: z.number().int(), nextCursor: z.string().nullable() });
export type ResultsPage = z.infer<typeof resultsPageSchema>;

const count = z.number().int();
const statsSchema = z.object({ min: z.number().nullable(), max: z.number().nullable(), mean: z.number().nullable(), count });
export const resultsSummarySchema = z.object({
  scanId: z.number().int(),
  total: count,
  byStatus: z.record(z.enum(POINT_STATUSES as [PointStatus, ...PointStatus[]]), count),
  /** `unscored`: points without a region (failed points are not scored). */
  byRegion: z.object({ inside68: count, inside95: count, outside: count, unscored: count }),
  /** Over ok points only; nulls (not computed, e.g. exact* in a fast scan) are left out. */
  observables: z.record(z.enum(OBSERVABLE_COLUMNS as [ObservableColumn, ...ObservableColumn[]]), statsSchema),
  /** The ten ok points with the lowest chi2. */
  best: z.array(resultRowSchema),
});
export type ResultsSummary = z.infer<typeof resultsSummarySchema>;

export const heatmapSchema = z.object({
  x: z.array(z.number()),
  y: z.array(z.number()),
  /** values[iy][ix]; null where the cell has no ok point with a value. */
  values: z.array(z.array(z.number().nullable())),
  region: z.array(z.array(z.enum(REGIONS as [Region, ...Region[]]).nullable())),
});
export type Heatmap = z.infer<typeof heatmapSchema>;

/** What a download says about where it came from (CSV: `# key: value` lines). */
export const provenanceSchema = z.object({
  scanId: z.number().int(), title: z.string(), state: z.string(), pointCount: count, pointsDone: count,
  planHash: z.string(), physicsVersion: z.string(), boundSet: z.string(), query: z.string(), generatedAt: z.string(),
});
export type Provenance = z.infer<typeof provenanceSchema>;
