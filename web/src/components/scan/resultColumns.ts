import type { ColDef, ICellRendererParams, ValueFormatterParams } from 'ag-grid-community';
import { PARAM_PREFIX, type ResultRow } from '../../../../shared/api/results.ts';
import { GRID_FILTER_OPTIONS } from '../../api/resultsQuery.ts';
import { formatNumber } from '../../utils/format.ts';
import { planIsExact, planParameterNames } from '../../utils/planAxes.ts';

/** Column headers in the trade's notation; the column ids are the API's names (resultsQuery.ts). */
const OBSERVABLES: Array<[keyof ResultRow, string, string]> = [
  ['ns', 'n_s', 'Scalar spectral index'], ['r', 'r', 'Tensor-to-scalar ratio'], ['alphaS', 'α_s', 'Running of n_s'],
  ['nt', 'n_t', 'Tensor spectral index'], ['chi2', 'χ²', 'Chi-square against the bound set'],
  ['nTotal', 'N total', 'E-folds from the start to the end of inflation'], ['nPivot', 'N_*', 'E-folds from the pivot to the end'],
  ['phiPivot', 'φ_*', 'Field at the pivot'], ['phiEnd', 'φ_end', 'Field where ε₁ = 1'], ['phiStart', 'φ_0', 'Initial field'],
  ['deltaPhi', 'Δφ', 'Field excursion from the pivot to the end'],
  ['eps1', 'ε₁', 'First Hubble-flow parameter at the pivot'], ['eps2', 'ε₂', 'Second Hubble-flow parameter'], ['eps3', 'ε₃', 'Third Hubble-flow parameter'],
  ['As', 'A_s (V as given)', 'Scalar amplitude for the potential as written'], ['amplitude', 'V factor', 'Factor on V that gives the target A_s'],
  ['energyScaleGeV', 'V_*^¼ (GeV)', 'Energy scale at the pivot'], ['hubbleGeV', 'H_* (GeV)', 'Hubble rate at the pivot'],
];
const EXACT: Array<[keyof ResultRow, string, string]> = [
  ['exactNs', 'n_s exact', 'From the Mukhanov–Sasaki modes'], ['exactR', 'r exact', 'From the Mukhanov–Sasaki modes'],
  ['exactAlphaS', 'α_s exact', 'From the Mukhanov–Sasaki modes'], ['exactNt', 'n_t exact', 'From the Mukhanov–Sasaki modes'],
  ['exactAs', 'A_s exact', 'From the Mukhanov–Sasaki modes'], ['exactAmplitude', 'V factor exact', 'From the Mukhanov–Sasaki modes'],
];

export const STATUS_LABELS: Record<ResultRow['status'], string> = {
  ok: 'ok', no_inflation: 'no inflation', too_few_efolds: 'too few e-folds', never_ends: 'never ends', negative_potential: 'V < 0', solver_failed: 'solver failed',
};
export const REGION_LABELS: Record<NonNullable<ResultRow['region']>, string> = { inside68: 'within 68%', inside95: 'within 95%', outside: 'outside 95%' };

/** A chip built with textContent, never innerHTML, so no row value is ever read as markup. */
function chip(text: string, kind: string, title?: string): HTMLElement {
  const el = document.createElement('span');
  el.className = `rw-chip rw-chip--${kind}`;
  el.textContent = text;
  if (title) el.title = title;
  return el;
}

const numberColumn = (field: string, headerName: string, headerTooltip?: string, width = 120): ColDef<ResultRow> => ({
  colId: field,
  headerName,
  ...(headerTooltip ? { headerTooltip } : {}),
  width,
  cellClass: 'mono ag-right-aligned-cell',
  headerClass: 'ag-right-aligned-header',
  filter: 'agNumberColumnFilter',
  // The API ANDs one bound per operator; inRange maps to gte + lte, so it must include its ends.
  filterParams: { filterOptions: [...GRID_FILTER_OPTIONS], maxNumConditions: 1, inRangeInclusive: true, buttons: ['apply', 'reset'] },
  valueFormatter: (p: ValueFormatterParams<ResultRow, number | null>) => formatNumber(p.value, field),
});

export function resultColumns(plan: Record<string, unknown>): ColDef<ResultRow>[] {
  const { axes, fixed } = planParameterNames(plan);
  const params = [...axes, ...fixed].map((name): ColDef<ResultRow> => ({
    ...numberColumn(PARAM_PREFIX + name, name, axes.includes(name) ? `Axis ${name}` : `Fixed ${name}`, 110),
    valueGetter: (p) => p.data?.params[name] ?? null,
    headerClass: 'ag-right-aligned-header rw-param-header',
    hide: !axes.includes(name),
  }));
  const observable = ([field, header, tip]: [keyof ResultRow, string, string]) => ({ ...numberColumn(field, header, tip), field });
  return [
    { ...numberColumn('pointIndex', '#', 'Point index in the plan', 90), field: 'pointIndex', pinned: 'left' },
    ...params,
    {
      colId: 'status', field: 'status', headerName: 'Outcome', width: 140, sortable: false,
      cellRenderer: (p: ICellRendererParams<ResultRow>) => (p.data ? chip(STATUS_LABELS[p.data.status], p.data.status === 'ok' ? 'ok' : 'fail', p.data.reason || undefined) : ''),
    },
    {
      colId: 'region', field: 'region', headerName: 'Region', width: 130, sortable: false,
      cellRenderer: (p: ICellRendererParams<ResultRow>) => (p.data ? (p.data.region ? chip(REGION_LABELS[p.data.region], p.data.region) : chip('not scored', 'none')) : ''),
    },
    ...OBSERVABLES.map(observable),
    ...(planIsExact(plan) ? EXACT.map(observable) : []),
    { ...numberColumn('computeMs', 'ms', 'Compute time of the point', 90), field: 'computeMs', hide: true },
    { ...numberColumn('evaluations', 'RHS calls', 'Right-hand-side evaluations', 110), field: 'evaluations', hide: true },
  ];
}
