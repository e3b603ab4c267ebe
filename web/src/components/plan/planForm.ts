import { parseDocument, stringify } from 'yaml';
import { PIVOT_AXIS, type ScanPlanInput } from '../../../../shared/plan/scanPlan.ts';
import type { PlanIssue } from '../../../../shared/plan/planError.ts';

/**
 * The New-scan form as plain data, and its conversion to a plan document and back. Every input
 * is kept as the text the user typed, so nothing is lost while it is invalid: numbers are read
 * only on conversion, and a text that is not a number goes into the plan as that text, so the
 * plan's own schema reports it at the field's path ("axes[1].range.count: must be ...").
 */

export type AxisKind = 'range' | 'logRange' | 'values';
export const AXIS_KINDS: readonly AxisKind[] = ['range', 'logRange', 'values'];

export interface AxisForm {
  name: string;
  kind: AxisKind;
  from: string;
  to: string;
  count: string;
  /** Values of an explicit list, separated by commas or spaces. */
  values: string;
}

export type PotentialKind = 'family' | 'expression' | 'table';
export type ReheatingEnd = 'tRehGeV' | 'rhoRehQuarterGeV';
export const TOLERANCE_FIELDS = ['rtol', 'efoldMargin', 'maxEfolds', 'modeStartRatio', 'modeEndRatio', 'spectralStep'] as const;
export type ToleranceField = (typeof TOLERANCE_FIELDS)[number];
/** '' = the default bound set; 'inline' = the YAML/JSON text in boundSetText; anything else a preset id. */
export const INLINE_BOUND_SET = 'inline';

export interface PlanForm {
  title: string;
  notes: string;
  potentialKind: PotentialKind;
  family: string;
  expression: string;
  /** Declared parameter names of an expression, separated by commas or spaces. */
  parameters: string;
  table: string;
  /** Fixed values by parameter name; empty text means "the family's default" (or unset). */
  fixed: Record<string, string>;
  axes: AxisForm[];
  combine: 'grid' | 'zip';
  pivotKind: 'efolds' | 'reheating';
  efolds: string;
  reheating: { w: string; end: ReheatingEnd; endValue: string; gReh: string; kPivotMpc: string };
  endPhi: string;
  phi0: string;
  fieldMin: string;
  fieldMax: string;
  preset: 'fast' | 'exact';
  tolerances: Record<ToleranceField, string>;
  targetAs: string;
  boundSet: string;
  boundSetText: string;
}

export function emptyAxis(name = ''): AxisForm {
  return { name, kind: 'range', from: '', to: '', count: '', values: '' };
}

export function emptyForm(): PlanForm {
  return {
    title: '', notes: '', potentialKind: 'family', family: 'quadratic', expression: '', parameters: '', table: '',
    fixed: {}, axes: [], combine: 'grid', pivotKind: 'efolds', efolds: '55',
    reheating: { w: '0', end: 'tRehGeV', endValue: '', gReh: '', kPivotMpc: '' },
    endPhi: '', phi0: '', fieldMin: '', fieldMax: '', preset: 'fast',
    tolerances: { rtol: '', efoldMargin: '', maxEfolds: '', modeStartRatio: '', modeEndRatio: '', spectralStep: '' },
    targetAs: '', boundSet: '', boundSetText: '',
  };
}

// Plain decimal literals only (as tabulated.ts reads numbers): "0x10" or "1_0" stay text and are reported.
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** A number when the text is one, else the trimmed text itself (for the schema to report). */
export function readNumber(text: string): number | string {
  const t = text.trim();
  return DECIMAL.test(t) ? Number(t) : t;
}

const given = (text: string): boolean => text.trim() !== '';
/** Items of a list typed with commas, semicolons or spaces. */
export const splitList = (text: string): string[] => text.split(/[\s,;]+/).filter((s) => s !== '');

export function declaredParameters(form: Pick<PlanForm, 'parameters'>): string[] {
  return splitList(form.parameters);
}

function axisToPlan(axis: AxisForm): Record<string, unknown> {
  const name = axis.name.trim();
  if (axis.kind === 'values') return { name, values: splitList(axis.values).map(readNumber) };
  const spec: Record<string, unknown> = {};
  for (const key of ['from', 'to', 'count'] as const) if (given(axis[key])) spec[key] = readNumber(axis[key]);
  return { name, [axis.kind]: spec };
}

function potentialToPlan(form: PlanForm): Record<string, unknown> {
  if (form.potentialKind === 'family') return { family: form.family };
  if (form.potentialKind === 'table') return { table: form.table };
  const parameters = declaredParameters(form);
  return { expression: form.expression, ...(parameters.length > 0 ? { parameters } : {}) };
}

function pivotToPlan(form: PlanForm): Record<string, unknown> {
  if (form.pivotKind === 'efolds') return given(form.efolds) ? { efolds: readNumber(form.efolds) } : {};
  const r = form.reheating;
  const reheating: Record<string, unknown> = {};
  if (given(r.w)) reheating.w = readNumber(r.w);
  if (given(r.endValue)) reheating[r.end] = readNumber(r.endValue);
  if (given(r.gReh)) reheating.gReh = readNumber(r.gReh);
  if (given(r.kPivotMpc)) reheating.kPivotMpc = readNumber(r.kPivotMpc);
  return { reheating };
}

function boundSetToPlan(form: PlanForm, issues: PlanIssue[]): unknown {
  if (form.boundSet !== INLINE_BOUND_SET) return form.boundSet === '' ? undefined : form.boundSet;
  if (!given(form.boundSetText)) {
    issues.push({ path: 'boundSet', message: 'required: the bound set as YAML or JSON (id, label, citation, constraints)' });
    return undefined;
  }
  const doc = parseDocument(form.boundSetText, { uniqueKeys: true });
  const problem = [...doc.errors, ...doc.warnings][0];
  if (problem !== undefined) {
    issues.push({ path: 'boundSet', message: `the bound set is not valid YAML: ${problem.message.split('\n')[0]}` });
    return undefined;
  }
  return doc.toJS({ maxAliasCount: 100 });
}

export interface FormConversion {
  /** The plan document (not yet validated: feed it to validatePlan). */
  plan: ScanPlanInput;
  /** Problems found while reading the form itself (the inline bound set's text). */
  issues: PlanIssue[];
}

/** The plan the form describes, as it would be submitted. */
export function formToPlan(form: PlanForm): FormConversion {
  const issues: PlanIssue[] = [];
  const axes = form.axes.map(axisToPlan);
  const scanned = new Set(axes.map((a) => a.name));
  const fixed: Record<string, unknown> = {};
  for (const [name, value] of Object.entries(form.fixed)) if (given(value) && !scanned.has(name)) fixed[name] = readNumber(value);
  const plan: Record<string, unknown> = { title: form.title };
  if (given(form.notes)) plan.notes = form.notes;
  plan.potential = potentialToPlan(form);
  if (Object.keys(fixed).length > 0) plan.fixed = fixed;
  plan.axes = axes;
  plan.combine = form.combine;
  if (!scanned.has(PIVOT_AXIS)) plan.pivot = pivotToPlan(form);
  if (given(form.endPhi)) plan.endPhi = readNumber(form.endPhi);
  if (given(form.phi0)) plan.phi0 = readNumber(form.phi0);
  if (given(form.fieldMin) || given(form.fieldMax)) plan.fieldRange = [readNumber(form.fieldMin), readNumber(form.fieldMax)];
  const precision: Record<string, unknown> = { preset: form.preset };
  for (const key of Object.keys(form.tolerances) as ToleranceField[]) {
    if (given(form.tolerances[key])) precision[key] = readNumber(form.tolerances[key]);
  }
  plan.precision = precision;
  if (given(form.targetAs)) plan.targetAs = readNumber(form.targetAs);
  const boundSet = boundSetToPlan(form, issues);
  if (boundSet !== undefined) plan.boundSet = boundSet;
  // The schema decides what is valid; the form only arranges the fields.
  return { plan: plan as ScanPlanInput, issues };
}

const isRecord = (x: unknown): x is Record<string, unknown> => typeof x === 'object' && x !== null && !Array.isArray(x);
/** Text of a value read from a plan document: numbers exactly (String round-trips a double), strings as they are. */
const asText = (x: unknown): string => (typeof x === 'number' || typeof x === 'string' ? String(x) : '');
const asList = (x: unknown): string => (Array.isArray(x) ? x.map(asText).join(', ') : '');

function axisFromPlan(raw: unknown): AxisForm {
  const axis = emptyAxis();
  if (!isRecord(raw)) return axis;
  axis.name = asText(raw.name);
  if (raw.values !== undefined) {
    axis.kind = 'values';
    axis.values = asList(raw.values);
    return axis;
  }
  axis.kind = raw.logRange !== undefined ? 'logRange' : 'range';
  const spec = raw[axis.kind];
  if (isRecord(spec)) {
    axis.from = asText(spec.from);
    axis.to = asText(spec.to);
    axis.count = asText(spec.count);
  }
  return axis;
}

/**
 * The form showing a plan document (an uploaded file, or a plan to clone). Reads whatever fits
 * the form and skips the rest; validate the document itself to report what was skipped.
 */
export function planToForm(raw: unknown): PlanForm {
  const form = emptyForm();
  if (!isRecord(raw)) return form;
  form.title = asText(raw.title);
  form.notes = asText(raw.notes);
  const potential = isRecord(raw.potential) ? raw.potential : {};
  if (potential.expression !== undefined) {
    form.potentialKind = 'expression';
    form.expression = asText(potential.expression);
    form.parameters = Array.isArray(potential.parameters) ? potential.parameters.map(asText).join(', ') : '';
  } else if (potential.table !== undefined) {
    form.potentialKind = 'table';
    form.table = asText(potential.table);
  } else {
    form.family = asText(potential.family);
  }
  if (isRecord(raw.fixed)) for (const [name, value] of Object.entries(raw.fixed)) form.fixed[name] = asText(value);
  form.axes = Array.isArray(raw.axes) ? raw.axes.map(axisFromPlan) : [];
  form.combine = raw.combine === 'zip' ? 'zip' : 'grid';
  const pivot = isRecord(raw.pivot) ? raw.pivot : {};
  if (isRecord(pivot.reheating)) {
    const r = pivot.reheating;
    form.pivotKind = 'reheating';
    form.reheating = {
      w: asText(r.w),
      end: r.rhoRehQuarterGeV !== undefined ? 'rhoRehQuarterGeV' : 'tRehGeV',
      endValue: asText(r.rhoRehQuarterGeV ?? r.tRehGeV),
      gReh: asText(r.gReh),
      kPivotMpc: asText(r.kPivotMpc),
    };
  } else if (raw.pivot !== undefined) {
    form.efolds = asText(pivot.efolds);
  }
  form.endPhi = asText(raw.endPhi);
  form.phi0 = asText(raw.phi0);
  if (Array.isArray(raw.fieldRange)) [form.fieldMin, form.fieldMax] = [asText(raw.fieldRange[0]), asText(raw.fieldRange[1])];
  const precision = isRecord(raw.precision) ? raw.precision : {};
  form.preset = precision.preset === 'exact' ? 'exact' : 'fast';
  for (const key of TOLERANCE_FIELDS) form.tolerances[key] = asText(precision[key]);
  form.targetAs = asText(raw.targetAs);
  if (typeof raw.boundSet === 'string') form.boundSet = raw.boundSet;
  else if (raw.boundSet !== undefined) {
    form.boundSet = INLINE_BOUND_SET;
    form.boundSetText = stringify(raw.boundSet);
  }
  return form;
}
