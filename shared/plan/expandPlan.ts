import { DEFAULT_TARGET_AMPLITUDE } from '../physics/bounds/boundSet.ts';
import type { PointRequest, PotentialSpec } from './pointRequest.ts';
import { PIVOT_AXIS, type PlanAxis, type ScanPlan } from './scanPlan.ts';

/**
 * Lazy expansion of a validated plan: point `index` is computed from the index alone (its
 * mixed-radix digits), so a 10^6-point plan never sits in memory — only the axes' own values do
 * (at most 6 × 100000 numbers).
 */

/** The values of one axis, in order. Both ends of a range are exactly `from` and `to`. */
export function axisValues(axis: PlanAxis): number[] {
  if ('values' in axis) return [...axis.values];
  const { from, to, count } = 'range' in axis ? axis.range : axis.logRange;
  if (count === 1) return [from];
  const out = new Array<number>(count);
  if ('range' in axis) {
    const step = (to - from) / (count - 1);
    for (let i = 0; i < count; i++) out[i] = from + i * step;
  } else {
    // Geometric steps through the logarithms: (to/from)^t could overflow for very wide ranges.
    const lf = Math.log(from);
    const span = Math.log(to) - lf;
    for (let i = 0; i < count; i++) out[i] = Math.exp(lf + (i / (count - 1)) * span);
    out[0] = from;
  }
  // from + (count-1)*step and exp(log(to)) can miss `to` by an ulp; a plan's bounds are exact.
  out[count - 1] = to;
  return out;
}

export function axisLength(axis: PlanAxis): number {
  return 'values' in axis ? axis.values.length : 'range' in axis ? axis.range.count : axis.logRange.count;
}

/** Grid: the product of the axis lengths; zip: their common length. */
export function planPointCount(plan: Pick<ScanPlan, 'axes' | 'combine'>): number {
  const lengths = plan.axes.map(axisLength);
  return plan.combine === 'zip' ? (lengths[0] ?? 0) : lengths.reduce((p, n) => p * n, 1);
}

/** The potential as a point request names it (a plan's declared parameters are not part of it). */
export function requestPotential(potential: ScanPlan['potential']): PotentialSpec {
  if (potential.family !== undefined) return { family: potential.family };
  if (potential.expression !== undefined) return { expression: potential.expression };
  return { table: potential.table };
}

export interface PointSource {
  readonly count: number;
  /** Axis names in plan order: the keys of `valuesAt`. */
  readonly axisNames: readonly string[];
  /** For `preparePotential(potential, parameterNames)` once per batch, not once per point. */
  readonly potential: PotentialSpec;
  readonly parameterNames: readonly string[];
  /** The point request of point `index` (0 ≤ index < count). */
  requestAt(index: number): PointRequest;
  /** The axis values of point `index`, by axis name (pivotEfolds included when it is an axis). */
  valuesAt(index: number): Record<string, number>;
}

/** Expects a plan from validatePlan; builds each point on demand. */
export function createPointSource(plan: ScanPlan): PointSource {
  const names = plan.axes.map((a) => a.name);
  const values = plan.axes.map((a) => Float64Array.from(axisValues(a)));
  const lengths = values.map((v) => v.length);
  const count = planPointCount(plan);
  const zip = plan.combine === 'zip';
  const potential = requestPotential(plan.potential);
  const fixed = plan.fixed ?? {};
  const { preset, ...tolerances } = plan.precision;
  const hasTolerances = Object.keys(tolerances).length > 0;
  // The same default as a single point (DESIGN.md: 2.1e-9), so a scan and `rollway point` agree.
  const targetAs = plan.targetAs ?? DEFAULT_TARGET_AMPLITUDE;
  const parameterNames = [...new Set([...Object.keys(fixed), ...names.filter((n) => n !== PIVOT_AXIS)])];

  const valuesAt = (index: number): Record<string, number> => {
    if (!Number.isInteger(index) || index < 0 || index >= count) {
      throw new RangeError(`point index ${index} is outside 0..${count - 1}`);
    }
    // Grid: the last axis varies fastest, so digits come off the index from the last axis back.
    const digits = new Array<number>(names.length);
    let rest = index;
    for (let a = names.length - 1; a >= 0; a--) {
      const n = lengths[a]!;
      digits[a] = zip ? index : rest % n;
      rest = Math.floor(rest / n);
    }
    const out: Record<string, number> = {};
    names.forEach((name, a) => {
      out[name] = values[a]![digits[a]!]!;
    });
    return out;
  };

  const requestAt = (index: number): PointRequest => {
    const axisPoint = valuesAt(index);
    const params: Record<string, number> = { ...fixed };
    let efolds: number | undefined;
    for (const name of names) {
      if (name === PIVOT_AXIS) efolds = axisPoint[name];
      else params[name] = axisPoint[name]!;
    }
    const pivot = efolds !== undefined ? { efolds } : plan.pivot!;
    return {
      potential,
      params,
      pivot,
      ...(plan.endPhi === undefined ? {} : { endPhi: plan.endPhi }),
      ...(plan.phi0 === undefined ? {} : { phi0: plan.phi0 }),
      ...(plan.fieldRange === undefined ? {} : { fieldRange: plan.fieldRange }),
      exact: preset === 'exact',
      targetAs,
      ...(hasTolerances ? { precision: { ...tolerances } } : {}),
    };
  };

  return { count, axisNames: names, potential, parameterNames, requestAt, valuesAt };
}
