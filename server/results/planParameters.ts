import { z } from 'zod';
import type { StoredPlan } from '../db/schema/scans.ts';

/**
 * The parameters of a scan as its stored plan names them: every axis (pivotEfolds included) and
 * every fixed parameter, each with its number of distinct values. These are the keys of a
 * point's params, so they are what `param.<name>`, a heatmap's x and y and the CSV columns may use.
 * Read loosely (only names and counts), so that a plan stored by an older version still opens.
 */
const storedPlanSchema = z.object({
  axes: z.array(z.object({
    name: z.string(),
    values: z.array(z.unknown()).optional(),
    range: z.object({ count: z.number() }).optional(),
    logRange: z.object({ count: z.number() }).optional(),
  })).catch([]),
  fixed: z.record(z.string(), z.unknown()).catch({}),
});

/** Parameter name → how many distinct values it takes (1 for a fixed one), axes first. */
export function planParameters(plan: StoredPlan): Map<string, number> {
  const parsed = storedPlanSchema.safeParse(plan);
  const out = new Map<string, number>();
  if (!parsed.success) return out;
  for (const axis of parsed.data.axes) {
    out.set(axis.name, axis.values?.length ?? axis.range?.count ?? axis.logRange?.count ?? 1);
  }
  for (const name of Object.keys(parsed.data.fixed)) if (!out.has(name)) out.set(name, 1);
  return out;
}
