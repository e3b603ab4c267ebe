import type { PlanIssue } from './planError.ts';
import { checkPotential, isRecord, type PotentialFacts } from './potentialChecks.ts';
import { PIVOT_AXIS, PLAN_LIMITS } from './scanPlan.ts';

/**
 * Checks that need several fields at once. They read the raw document defensively (a field of
 * the wrong type is skipped here; scanPlanSchema reports it), so that one pass reports both kinds.
 */

/** N_* as an axis obeys the same bounds as pivot.efolds (pointRequest's pivotSchema). */
const MAX_PIVOT_EFOLDS = 1000;

const withCommas = (n: bigint): string => n.toString().replace(/\B(?=(\d{3})+(?!\d))/g, ',');

/** The number of values an axis has, if its shape is valid enough to tell. */
function axisLength(axis: Record<string, unknown>): number | undefined {
  const spec = isRecord(axis.range) ? axis.range : isRecord(axis.logRange) ? axis.logRange : undefined;
  const n = spec !== undefined ? spec.count : Array.isArray(axis.values) ? axis.values.length : undefined;
  return typeof n === 'number' && Number.isInteger(n) && n >= 1 && n <= PLAN_LIMITS.maxAxisLength ? n : undefined;
}

/** Reports each value of an axis (a list's entries, a range's ends) that `allowed` refuses. */
function checkAxisValues(axis: Record<string, unknown>, at: string, allowed: (v: number) => boolean, message: (v: number) => string, issues: PlanIssue[]): void {
  const bad = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v) && !allowed(v);
  const spec = isRecord(axis.range) ? ['range', axis.range] as const : isRecord(axis.logRange) ? ['logRange', axis.logRange] as const : undefined;
  if (spec !== undefined) {
    for (const end of ['from', 'to']) if (bad(spec[1][end])) issues.push({ path: `${at}.${spec[0]}.${end}`, message: message(spec[1][end]) });
  } else if (Array.isArray(axis.values)) {
    axis.values.forEach((v, j) => bad(v) && issues.push({ path: `${at}.values[${j}]`, message: message(v) }));
  }
}

const checkPivotAxis = (axis: Record<string, unknown>, at: string, issues: PlanIssue[]): void =>
  checkAxisValues(axis, at, (v) => v > 0 && v <= MAX_PIVOT_EFOLDS, (v) => `e-folds N_* must be > 0 and at most ${MAX_PIVOT_EFOLDS}; got ${v}`, issues);

const mustBePositive = (name: string, facts: PotentialFacts) => (v: number) => `${name} must be > 0 for ${facts.label}; got ${v}`;

function checkNames(plan: Record<string, unknown>, facts: PotentialFacts | undefined, axes: readonly unknown[], issues: PlanIssue[]): number | undefined {
  const axisAt = new Map<string, number>();
  let pivotAxis: number | undefined;
  const allowedAxes = facts === undefined ? '' : [...facts.allowed, PIVOT_AXIS].join(', ');
  axes.forEach((axis, i) => {
    if (!isRecord(axis) || typeof axis.name !== 'string') return;
    const name = axis.name;
    const first = axisAt.get(name);
    if (first !== undefined) {
      issues.push({ path: `axes[${i}].name`, message: `"${name}" is already scanned by axes[${first}]; give each name once` });
      return;
    }
    axisAt.set(name, i);
    if (name === PIVOT_AXIS) {
      pivotAxis = i;
      checkPivotAxis(axis, `axes[${i}]`, issues);
    } else if (facts !== undefined && !facts.allowed.includes(name)) {
      issues.push({ path: `axes[${i}].name`, message: `"${name}" is not a parameter of ${facts.label}; allowed: ${allowedAxes}` });
    } else if (facts?.positive.includes(name) && !isRecord(axis.logRange)) {
      // A log range's bounds are > 0 already (scanPlanSchema says so for every axis).
      checkAxisValues(axis, `axes[${i}]`, (v) => v > 0, mustBePositive(name, facts), issues);
    }
  });
  // Own keys of the raw document: zod drops a "__proto__" key, this still sees and reports it.
  const fixed = isRecord(plan.fixed) ? Object.keys(plan.fixed) : [];
  for (const name of fixed) {
    const path = `fixed.${name}`;
    const axis = axisAt.get(name);
    if (name === PIVOT_AXIS) issues.push({ path, message: `N_* is not a parameter; give it as pivot.efolds or scan it with an axis named ${PIVOT_AXIS}` });
    else if (axis !== undefined) issues.push({ path, message: `"${name}" is also scanned by axes[${axis}]; give it in one place` });
    else if (facts !== undefined && !facts.allowed.includes(name)) {
      issues.push({ path, message: `"${name}" is not a parameter of ${facts.label}; allowed: ${facts.allowed.join(', ')}` });
    } else if (facts?.positive.includes(name)) {
      const value = (plan.fixed as Record<string, unknown>)[name];
      if (typeof value === 'number' && Number.isFinite(value) && !(value > 0)) issues.push({ path, message: mustBePositive(name, facts)(value) });
    }
  }
  facts?.required.forEach((name) => {
    if (!axisAt.has(name) && !fixed.includes(name)) {
      // Required names come from potential.parameters, in order, so this is their index there.
      const i = facts.allowed.indexOf(name);
      issues.push({ path: `potential.parameters[${i}]`, message: `"${name}" has no value; give it under fixed or as an axis` });
    }
  });
  return pivotAxis;
}

function checkSize(plan: Record<string, unknown>, axes: readonly unknown[], issues: PlanIssue[]): void {
  const lengths = axes.map((a) => (isRecord(a) ? axisLength(a) : undefined));
  if (lengths.length === 0 || lengths.some((n) => n === undefined)) return;
  const sizes = lengths as number[];
  if (plan.combine === 'zip') {
    if (sizes.every((n) => n === sizes[0])) return;
    const each = axes.map((a, i) => `${isRecord(a) && typeof a.name === 'string' ? a.name : `axes[${i}]`}: ${sizes[i]}`);
    issues.push({ path: 'axes', message: `combine "zip" needs axes of equal length; got ${each.join(', ')}` });
    return;
  }
  // BigInt: six axes of 100000 values overflow the integers a double holds exactly.
  const total = sizes.reduce((p, n) => p * BigInt(n), 1n);
  if (total > BigInt(PLAN_LIMITS.maxPoints)) {
    issues.push({
      path: 'axes',
      message: `the grid has ${withCommas(total)} points (${sizes.join(' × ')}); at most ${withCommas(BigInt(PLAN_LIMITS.maxPoints))} are allowed`,
    });
  }
}

export function checkPlanSemantics(data: unknown): PlanIssue[] {
  const issues: PlanIssue[] = [];
  if (!isRecord(data)) return issues;
  const facts = checkPotential(data.potential, issues);
  const axes = Array.isArray(data.axes) ? data.axes : [];
  const pivotAxis = checkNames(data, facts, axes, issues);
  if (pivotAxis !== undefined && data.pivot !== undefined) {
    issues.push({ path: 'pivot', message: `N_* is already scanned by axes[${pivotAxis}] (${PIVOT_AXIS}); remove pivot or that axis` });
  } else if (pivotAxis === undefined && data.pivot === undefined) {
    issues.push({ path: 'pivot', message: `required: give pivot.efolds or pivot.reheating, or scan N_* with an axis named ${PIVOT_AXIS}` });
  }
  if (facts?.needsEndPhi === true && data.endPhi === undefined) {
    issues.push({ path: 'endPhi', message: `required for ${facts.label}, which never ends inflation by itself: give the field value where inflation ends` });
  }
  checkSize(data, axes, issues);
  return issues;
}
