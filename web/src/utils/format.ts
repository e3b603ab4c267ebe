/**
 * How numbers, dates and durations read in the app. Observables get 6 significant digits (the
 * default precision gives n_s to ~1e-9, so more digits would be noise to a reader), and quantities
 * that span decades (r, amplitudes, energy scales) always read in exponent form.
 */
const EXPONENT_COLUMNS: ReadonlySet<string> = new Set(['r', 'exactR', 'As', 'exactAs', 'amplitude', 'exactAmplitude', 'energyScaleGeV', 'hubbleGeV', 'eps1']);
const INTEGER_COLUMNS: ReadonlySet<string> = new Set(['pointIndex', 'evaluations']);

/** `1.234e-5` rather than JavaScript's `1.23400e-5`: trailing zeros of the mantissa dropped. */
function exponent(value: number, digits: number): string {
  const [mantissa = '', power = ''] = value.toExponential(digits - 1).split('e');
  const trimmed = mantissa.includes('.') ? mantissa.replace(/\.?0+$/, '') : mantissa;
  return `${trimmed}e${power.replace('+', '')}`;
}

export function formatNumber(value: number | null | undefined, column = '', digits = 6): string {
  if (value === null || value === undefined) return '—';
  if (!Number.isFinite(value)) return String(value);
  if (INTEGER_COLUMNS.has(column)) return String(Math.round(value));
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (EXPONENT_COLUMNS.has(column) || magnitude < 1e-3 || magnitude >= 1e6) return exponent(value, digits);
  return String(Number(value.toPrecision(digits)));
}

export function formatCount(value: number): string {
  return value.toLocaleString('en-US');
}

export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : date.toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
}

/** `2 h 5 min`, `3 min 20 s`, `12 s`: ETAs and compute times at a glance. */
export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return '—';
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${s % 60} s`;
  const h = Math.floor(m / 60);
  if (h < 48) return `${h} h ${m % 60} min`;
  return `${Math.floor(h / 24)} d ${h % 24} h`;
}

export function formatRate(pointsPerSecond: number | null | undefined): string {
  if (pointsPerSecond === null || pointsPerSecond === undefined) return '—';
  if (pointsPerSecond === 0) return '0 points/s';
  return `${pointsPerSecond >= 100 ? Math.round(pointsPerSecond).toLocaleString('en-US') : pointsPerSecond.toPrecision(3)} points/s`;
}
