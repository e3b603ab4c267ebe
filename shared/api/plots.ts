import { z } from 'zod';
import { InvalidInputError } from '../errors.ts';
import { boundSetSchema } from '../physics/bounds/boundSet.ts';
import type { Region } from '../physics/bounds/score.ts';
import { NUMBER_COLUMNS, PARAM_PREFIX, parseRowQuery, REGIONS, resultRowSchema, type ColumnRef, type NumberColumn } from './results.ts';

/**
 * API types of the plot data: the n_s–r plane of a scan (columnar, downsampled on the server) and
 * one point's detail (its stored row, its trajectory recomputed, and its spectra around the pivot).
 */

export const PLANE_DEFAULT_MAX = 20_000;
export const PLANE_MAX = 100_000;
const PARAM_NAME = /^[A-Za-z_][A-Za-z0-9_]{0,63}$/;

const colorHelp = `one of ${NUMBER_COLUMNS.join(', ')}, or ${PARAM_PREFIX}<name> for a parameter`;
/** What the plane's points can be coloured by: a numeric column or a parameter. */
const colorRef = z.string({ error: 'must be a column name, given once' }).transform((text, ctx): ColumnRef => {
  if (text.startsWith(PARAM_PREFIX) && PARAM_NAME.test(text.slice(PARAM_PREFIX.length))) return { kind: 'param', name: text.slice(PARAM_PREFIX.length) };
  if ((NUMBER_COLUMNS as readonly string[]).includes(text)) return { kind: 'column', name: text as NumberColumn };
  ctx.addIssue({ code: 'custom', message: `unknown column "${text}"; colour by ${colorHelp}` });
  return z.NEVER;
});
const maxError = `must be a whole number from 1 to ${PLANE_MAX}`;
const maxPoints = z.string({ error: `${maxError}, given once` }).regex(/^\d{1,10}$/, { error: maxError }).transform(Number)
  .pipe(z.number().int().min(1, { error: maxError }).max(PLANE_MAX, { error: maxError }));
const regionList = z.string({ error: `must be a comma list of ${REGIONS.join(', ')}, given once` }).transform((text, ctx) => {
  const items = text.split(',').map((s) => s.trim());
  const bad = items.find((i) => !(REGIONS as readonly string[]).includes(i));
  if (bad !== undefined) ctx.addIssue({ code: 'custom', message: `unknown value "${bad}"; use a comma list of ${REGIONS.join(', ')}` });
  return items as Region[];
});

/** GET /scans/:id/plane (besides `<column>.<op>` filters): ok points only, so no status filter. */
export const planeQuerySchema = z.strictObject({
  color: colorRef.optional(),
  max: maxPoints.default(PLANE_DEFAULT_MAX),
  region: regionList.optional(),
});
export type PlaneQuery = ReturnType<typeof parsePlaneQuery>;
export const parsePlaneQuery = (raw: Record<string, unknown>) => parseRowQuery(planeQuerySchema, ['color', 'max', 'region'], raw);

const regionOrNull = z.enum(REGIONS as [Region, ...Region[]]).nullable();
export const planeSchema = z.object({
  scanId: z.number().int(),
  /** The colour column as asked (`ns`, `param.alpha`), or null when none was asked. */
  colorBy: z.string().nullable(),
  /** ok points with both n_s and r under the query, before downsampling. */
  total: z.number().int(),
  /** True when only every `stride`-th of those points (in point order) is in the arrays. */
  downsampled: z.boolean(),
  stride: z.number().int().min(1),
  ns: z.array(z.number()),
  r: z.array(z.number()),
  /** Parallel to ns and r; null where the colour value is missing, or every entry null without `color`. */
  color: z.array(z.number().nullable()),
  pointIndex: z.array(z.number().int()),
  region: z.array(regionOrNull),
  /** The bound set the scan is scored against: the plane's 68% and 95% regions are drawn from it. */
  boundSet: boundSetSchema,
});
export type Plane = z.infer<typeof planeSchema>;

export const POINT_INDEX_MAX = 2 ** 31 - 1;
/** The `:index` of /scans/:id/points/:index: a point of the plan, 0-based. */
export function parsePointIndex(raw: unknown): number {
  const text = String(raw);
  const n = /^\d{1,10}$/.test(text) ? Number(text) : Number.NaN;
  if (!(Number.isInteger(n) && n <= POINT_INDEX_MAX)) throw new InvalidInputError(`index: "${text}" is not a point index (a whole number from 0)`, 'index');
  return n;
}

export const trajectorySchema = z.object({
  /** e-folds from the start (phi0); the pivot leaves the horizon at pivotN. */
  N: z.array(z.number()),
  phi: z.array(z.number()),
  eps1: z.array(z.number()),
  eps2: z.array(z.number()),
  pivotN: z.number().nullable(),
  nEnd: z.number(),
});
export type TrajectorySamples = z.infer<typeof trajectorySchema>;

export const spectrumSampleSchema = z.object({
  /** ln(k / k_*). */
  lnK: z.number(),
  /** P_R(k) and P_t(k) for the potential normalised to the scan's target A_s. */
  scalar: z.number(),
  tensor: z.number(),
});
export const spectraSchema = z.object({ samples: z.array(spectrumSampleSchema), failures: z.array(z.string()) });
export type SpectraSamples = z.infer<typeof spectraSchema>;

export const pointDetailSchema = z.object({
  scanId: z.number().int(),
  row: resultRowSchema,
  /** null with `trajectoryNote` when the point has no background from start to end (a failed point). */
  trajectory: trajectorySchema.nullable(),
  trajectoryNote: z.string(),
  /** Only for scans with the exact preset and an ok point. */
  spectra: spectraSchema.nullable(),
});
export type PointDetail = z.infer<typeof pointDetailSchema>;
