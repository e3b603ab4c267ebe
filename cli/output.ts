import type { PointResult } from '../shared/physics/point/types.ts';

/** JSON numbers cannot be NaN: failed points print null for what was not computed. */
export function toJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v));
}

const ROWS: Array<[keyof PointResult, string]> = [
  ['nTotal', 'total e-folds'], ['nPivot', 'N_* (pivot to end)'], ['phiStart', 'phi at start'],
  ['phiPivot', 'phi at pivot'], ['phiEnd', 'phi at end'], ['deltaPhi', 'field excursion'],
  ['eps1', 'eps1'], ['eps2', 'eps2'], ['eps3', 'eps3'], ['ns', 'n_s'], ['r', 'r'], ['nt', 'n_t'],
  ['alphaS', 'alpha_s'], ['As', 'A_s (V as given)'], ['amplitude', 'V factor for target A_s'],
  ['energyScaleGeV', 'V_*^(1/4) [GeV]'], ['hubbleGeV', 'H_* [GeV]'],
];

const format = (x: number): string => (Number.isFinite(x) ? x.toPrecision(10) : '—');

export function printPoint(result: PointResult, json: boolean): void {
  if (json) {
    process.stdout.write(`${toJson(result)}\n`);
    return;
  }
  const lines = [`status  ${result.status}${result.reason ? ` — ${result.reason}` : ''}`];
  if (result.status === 'ok') {
    for (const [key, label] of ROWS) lines.push(`${label.padEnd(26)}${format(result[key] as number)}`);
    if (result.exact) {
      lines.push('exact spectra (Mukhanov–Sasaki):');
      for (const [key, value] of Object.entries(result.exact)) lines.push(`  ${key.padEnd(24)}${format(value)}`);
    }
  }
  process.stdout.write(`${lines.join('\n')}\n`);
}

const COLUMNS: Array<[string, (r: PointResult) => number, number]> = [
  ['N_tot', (r) => r.nTotal, 2], ['phi_*', (r) => r.phiPivot, 3], ['n_s', (r) => r.ns, 5], ['r', (r) => r.r, 5],
  ['alpha_s', (r) => r.alphaS, 6], ['n_s exact', (r) => r.exact?.ns ?? Number.NaN, 5], ['V^1/4 [GeV]', (r) => r.energyScaleGeV, 3],
];

/** One line a point, aligned columns; failures show their status instead of numbers. */
export function printPointTable(rows: Array<{ label: string; result: PointResult }>): void {
  const cell = (x: number, digits: number): string =>
    !Number.isFinite(x) ? '—' : Math.abs(x) >= 1e5 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(digits - 1) : x.toFixed(digits);
  const header = ['point'.padEnd(14), ...COLUMNS.map(([name]) => name.padStart(13))].join('');
  const lines = rows.map(({ label, result }) => result.status !== 'ok'
    ? `${label.padEnd(14)}${result.status}: ${result.reason}`
    : [label.padEnd(14), ...COLUMNS.map(([, get, digits]) => cell(get(result), digits).padStart(13))].join(''));
  process.stdout.write(`${[header, ...lines].join('\n')}\n`);
}

/** What --json prints: the data as it is, one document on one line. */
export const printJson = (value: unknown): void => {
  process.stdout.write(`${toJson(value)}\n`);
};
