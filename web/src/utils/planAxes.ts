/**
 * The parameter names of a stored plan, read loosely (names only) so that a plan written by an
 * older version still opens: axes first, in plan order, then the fixed parameters. These are the
 * keys of every result row's `params`.
 */
export function planParameterNames(plan: Record<string, unknown>): { axes: string[]; fixed: string[] } {
  const axes = Array.isArray(plan.axes)
    ? plan.axes.flatMap((a: unknown) => (typeof a === 'object' && a !== null && typeof (a as { name?: unknown }).name === 'string' ? [(a as { name: string }).name] : []))
    : [];
  const fixedObject = typeof plan.fixed === 'object' && plan.fixed !== null ? Object.keys(plan.fixed) : [];
  return { axes, fixed: fixedObject.filter((n) => !axes.includes(n)) };
}

/** Whether the scan computed the exact (mode-equation) spectra, so their columns are worth showing. */
export function planIsExact(plan: Record<string, unknown>): boolean {
  const precision = plan.precision;
  return typeof precision === 'object' && precision !== null && (precision as { preset?: unknown }).preset === 'exact';
}
