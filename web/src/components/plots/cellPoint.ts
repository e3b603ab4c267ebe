import { axisValues } from '../../../../shared/plan/expandPlan.ts';
import type { PlanAxis } from '../../../../shared/plan/scanPlan.ts';

/**
 * The position of `value` on an axis. The server expanded the axis in Node and the browser expands
 * it again here; their Math.exp and Math.log may differ in the last bit (measured: 3.16227766016838
 * against 3.1622776601683795 for a log range), so the nearest value within 1e-9 counts.
 */
function digitOf(values: readonly number[], value: number): number {
  let best = -1;
  let distance = Infinity;
  values.forEach((v, i) => {
    const d = Math.abs(v - value);
    if (d < distance) [best, distance] = [i, d];
  });
  return distance <= 1e-9 * Math.max(Math.abs(value), Number.MIN_VALUE) ? best : -1;
}

/**
 * The point a heatmap cell stands for, when it stands for exactly one: a grid plan whose axes
 * other than x and y each have a single value. Otherwise a cell aggregates several points and
 * there is no one point to open. The index follows expandPlan.ts: the last axis varies fastest.
 */
export function cellPointIndex(plan: Record<string, unknown>, x: string, y: string, xValue: number, yValue: number): number | null {
  if (plan.combine === 'zip' || !Array.isArray(plan.axes)) return null;
  const axes = plan.axes as PlanAxis[];
  if (!axes.some((a) => a.name === x) || !axes.some((a) => a.name === y)) return null;
  let index = 0;
  for (const axis of axes) {
    const values = axisValues(axis);
    let digit = 0;
    if (axis.name === x || axis.name === y) {
      digit = digitOf(values, axis.name === x ? xValue : yValue);
      if (digit < 0) return null;
    } else if (values.length !== 1) return null;
    index = index * values.length + digit;
  }
  return index;
}
