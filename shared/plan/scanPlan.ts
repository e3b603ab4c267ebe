import { z } from 'zod';
import { boundSetSchema, DEFAULT_BOUND_SET, type BoundSet } from '../physics/bounds/boundSet.ts';
import { pivotSchema, pointRequestSchema, potentialSpecSchema, precisionSchema, reheatingSchema } from './pointRequest.ts';

/**
 * A scan plan: the YAML or JSON document that defines a scan (DESIGN.md, "Vocabulary"). This file
 * checks the shape of each field; checks that need several fields at once (names against the
 * potential, pivot given once, grid size) live in planChecks.ts, so both report in one pass.
 */

export const PLAN_LIMITS = { maxAxes: 6, maxAxisLength: 100_000, maxPoints: 10_000_000, maxParameters: 32 } as const;
/** The axis name that scans N_* instead of a potential parameter. */
export const PIVOT_AXIS = 'pivotEfolds';
export const PRECISION_PRESETS = ['fast', 'exact'] as const;
/** Bound sets a plan can name by id; an inline bound set covers everything else. */
export const BOUND_SET_PRESETS: readonly BoundSet[] = [DEFAULT_BOUND_SET];

const req = pointRequestSchema.shape;
/** A field's own message, except for a missing field, which planErrorMap reports as "required". */
const unlessMissing = (message: string) => (iss: { input?: unknown }) => (iss.input === undefined ? undefined : message);
const finite = z.number();
const whole = (min: number, max: number) => {
  const error = unlessMissing(`must be a whole number from ${min} to ${max}`);
  return z.number({ error }).int({ error }).min(min, { error }).max(max, { error });
};
const positive = finite.gt(0, { error: 'must be > 0 (a log range needs positive bounds)' });
const text = (max: number) => {
  const error = unlessMissing(`must be a string of at most ${max} characters`);
  // PostgreSQL text and jsonb cannot hold NUL, and no plan needs one.
  return z.string({ error }).max(max, { error }).refine((t) => !t.includes('\u0000'), { error: 'must not contain NUL characters' });
};

/** Exactly one of `keys` present: the union-by-key that zod's union reports only as "invalid input". */
function exactlyOne(keys: readonly string[]) {
  return (value: Record<string, unknown>, ctx: z.RefinementCtx): void => {
    const given = keys.filter((k) => value[k] !== undefined);
    if (given.length === 1) return;
    const found = given.length === 0 ? 'none given' : `got ${given.join(' and ')}`;
    ctx.addIssue({ code: 'custom', message: `give exactly one of ${keys.join(', ')}; ${found}` });
  };
}

const planPotentialSchema = z
  .strictObject({
    ...potentialSpecSchema.shape,
    /** Parameter names an expression uses besides phi (V0, the scale, is always there). */
    parameters: z.array(z.string({ error: unlessMissing('must be a parameter name') }))
      .max(PLAN_LIMITS.maxParameters, { error: `must list at most ${PLAN_LIMITS.maxParameters} names` }).optional(),
  })
  .superRefine(exactlyOne(['family', 'expression', 'table']))
  .superRefine((p, ctx) => {
    if (p.parameters !== undefined && p.expression === undefined) {
      ctx.addIssue({ code: 'custom', path: ['parameters'], message: 'only an expression declares parameters' });
    }
  });

const linearRange = z.strictObject({ from: finite, to: finite, count: whole(1, PLAN_LIMITS.maxAxisLength) })
  .refine((r) => Number.isFinite(r.to - r.from), { error: 'from and to are too far apart to step between' });
const logRange = z.strictObject({ from: positive, to: positive, count: whole(1, PLAN_LIMITS.maxAxisLength) });
const valueList = z.array(finite).min(1, { error: `must list 1 to ${PLAN_LIMITS.maxAxisLength} values` })
  .max(PLAN_LIMITS.maxAxisLength, { error: `must list 1 to ${PLAN_LIMITS.maxAxisLength} values` });

export type LinearAxis = { name: string; range: z.infer<typeof linearRange> };
export type LogAxis = { name: string; logRange: z.infer<typeof logRange> };
export type ListAxis = { name: string; values: number[] };
export type PlanAxis = LinearAxis | LogAxis | ListAxis;

const axisSchema = z
  .strictObject({
    // Checked against the potential's parameters in planChecks.ts, which lists the allowed names.
    name: z.string({ error: unlessMissing(`must be a parameter name or ${PIVOT_AXIS}`) }),
    range: linearRange.optional(),
    logRange: logRange.optional(),
    values: valueList.optional(),
  })
  .superRefine(exactlyOne(['range', 'logRange', 'values']))
  // The refinement above guarantees exactly one of the three, which is what PlanAxis says.
  .transform((axis) => axis as PlanAxis);

/** pivotSchema's two forms, told apart by key so that an error names the field inside the form. */
const planPivotSchema = z
  .strictObject({ efolds: pivotSchema.options[0].shape.efolds.optional(), reheating: reheatingSchema.strict().optional() })
  .superRefine(exactlyOne(['efolds', 'reheating']))
  .transform((p) => p as z.infer<typeof pivotSchema>);

const planPrecisionSchema = z
  .strictObject({ preset: z.enum(PRECISION_PRESETS).default('fast'), ...precisionSchema.shape })
  .prefault({});

const presetIds = BOUND_SET_PRESETS.map((b) => b.id);
const boundSetRef = z.union([
  z.string().refine((id) => presetIds.includes(id), {
    error: `must be the id of a preset (${presetIds.join(', ')}) or an inline bound set`,
  }),
  boundSetSchema,
]);

export const scanPlanSchema = z.strictObject({
  title: text(200).refine((t) => t.trim() !== '', { error: 'must not be blank' }),
  notes: text(20_000).optional(),
  potential: planPotentialSchema,
  fixed: z.record(z.string(), finite).optional(),
  axes: z.array(axisSchema)
    .min(1, { error: `must list 1 to ${PLAN_LIMITS.maxAxes} axes` })
    .max(PLAN_LIMITS.maxAxes, { error: `must list 1 to ${PLAN_LIMITS.maxAxes} axes` }),
  combine: z.enum(['grid', 'zip']).default('grid'),
  pivot: planPivotSchema.optional(),
  endPhi: req.endPhi,
  phi0: req.phi0,
  fieldRange: req.fieldRange,
  precision: planPrecisionSchema,
  targetAs: req.targetAs,
  boundSet: boundSetRef.optional(),
});

export type ScanPlan = z.infer<typeof scanPlanSchema>;
export type ScanPlanInput = z.input<typeof scanPlanSchema>;
export type PlanPotential = ScanPlan['potential'];

/** The bound set a plan is scored against: its inline set, the named preset, or the default. */
export function planBoundSet(plan: Pick<ScanPlan, 'boundSet'>): BoundSet {
  if (plan.boundSet === undefined) return DEFAULT_BOUND_SET;
  if (typeof plan.boundSet !== 'string') return plan.boundSet;
  const id = plan.boundSet;
  return BOUND_SET_PRESETS.find((b) => b.id === id) ?? DEFAULT_BOUND_SET;
}
