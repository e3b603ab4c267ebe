import { z } from 'zod';

/**
 * One point as a user asks for it (CLI `rollway point`, the API's quick preview): which
 * potential, which parameter values, where the pivot sits. Scan plans build the same request
 * for every grid point.
 */
const finite = z.number().refine(Number.isFinite, 'must be a finite number');

export const potentialSpecSchema = z
  .object({
    family: z.string().min(1).max(64).optional(),
    expression: z.string().min(1).max(2000).optional(),
    table: z.string().min(1).max(5_000_000).optional(),
  })
  .refine((p) => [p.family, p.expression, p.table].filter((x) => x !== undefined).length === 1, {
    message: 'give exactly one of family, expression or table',
  });

export const reheatingSchema = z
  .object({
    w: z.number().min(-1 / 3, 'must be in [-1/3, 1]').max(1, 'must be in [-1/3, 1]'),
    tRehGeV: z.number().positive().max(1e19).optional(),
    rhoRehQuarterGeV: z.number().positive().max(1e19).optional(),
    gReh: z.number().min(1).max(1000).optional(),
    kPivotMpc: z.number().positive().max(1e3).optional(),
  })
  .refine((r) => (r.tRehGeV === undefined) !== (r.rhoRehQuarterGeV === undefined), {
    message: 'give exactly one of tRehGeV or rhoRehQuarterGeV',
  });

export const pivotSchema = z.union([
  z.object({ efolds: z.number().gt(0, 'must be > 0').max(1000, 'must be at most 1000') }).strict(),
  z.object({ reheating: reheatingSchema }).strict(),
]);

export const precisionSchema = z
  .object({
    rtol: z.number().gte(1e-14, 'must be in [1e-14, 1e-3]').lte(1e-3, 'must be in [1e-14, 1e-3]'),
    efoldMargin: z.number().min(0).max(100),
    maxEfolds: z.number().min(10).max(1e6),
    modeStartRatio: z.number().min(10).max(1e4),
    modeEndRatio: z.number().gt(0).max(0.1),
    spectralStep: z.number().gt(0).max(1),
  })
  .partial()
  .strict();

export const pointRequestSchema = z
  .object({
    potential: potentialSpecSchema,
    params: z.record(z.string(), finite).default({}),
    pivot: pivotSchema,
    endPhi: finite.optional(),
    phi0: finite.optional(),
    fieldRange: z.tuple([finite, finite]).refine(([a, b]) => a < b, 'min must be below max').optional(),
    exact: z.boolean().default(false),
    targetAs: z.number().positive().max(1).optional(),
    precision: precisionSchema.optional(),
  })
  .strict();

export type PotentialSpec = z.infer<typeof potentialSpecSchema>;
export type PointRequest = z.infer<typeof pointRequestSchema>;
export type PointRequestInput = z.input<typeof pointRequestSchema>;
