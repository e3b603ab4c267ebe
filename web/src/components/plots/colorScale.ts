import { formatNumber } from '../../utils/format.ts';

/**
 * How a colour column maps to the colour bar. Values spread over many decades (log-spaced axes
 * such as alpha, or r itself) would paint all but the top decade one colour on a linear bar, so a
 * positive column spanning at least LOG_SPAN is coloured by its log10.
 */
export const LOG_SPAN = 1e3;

export interface ColorScale {
  /** Whether the bar is in log10 of the values. */
  log: boolean;
  /** Bar ends in bar units (log10 when log); null without any finite value. */
  min: number | null;
  max: number | null;
  /** Bar position of each value (null stays null: drawn in the missing colour). */
  mapped: (number | null)[];
  label: string;
}

export function colorScale(values: readonly (number | null)[], name: string): ColorScale {
  const finite = values.filter((v): v is number => v !== null && Number.isFinite(v));
  if (finite.length === 0) return { log: false, min: null, max: null, mapped: values.map(() => null), label: name };
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of finite) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const log = lo > 0 && hi / lo >= LOG_SPAN;
  if (!log) return { log, min: lo, max: hi, mapped: values.map((v) => (v !== null && Number.isFinite(v) ? v : null)), label: name };
  return {
    log, min: Math.log10(lo), max: Math.log10(hi),
    mapped: values.map((v) => (v !== null && v > 0 && Number.isFinite(v) ? Math.log10(v) : null)),
    label: `log₁₀ ${name}`,
  };
}

/** A bar position back in the column's own units, for the colour bar's labels. */
export const barLabel = (scale: Pick<ColorScale, 'log'>, value: number, column = ''): string =>
  formatNumber(scale.log ? 10 ** value : value, column, 4);
