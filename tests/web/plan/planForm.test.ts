import { describe, expect, it } from 'vitest';
import { parsePlanText, validatePlan } from '../../../shared/plan/validatePlan.ts';
import { emptyAxis, emptyForm, formToPlan, INLINE_BOUND_SET, planToForm, readNumber, type PlanForm } from '../../../web/src/components/plan/planForm.ts';
import { validateForm } from '../../../web/src/composables/usePlanForm.ts';
import { relocateIssues } from '../../../web/src/components/plan/fieldIssues.ts';

const examples = import.meta.glob<string>('../../../examples/*.yaml', { query: '?raw', import: 'default', eager: true });
const exampleFiles = Object.keys(examples).map((path) => path.split('/').pop()!);
const example = (file: string) => examples[`../../../examples/${file}`]!;

function form(patch: Partial<PlanForm>): PlanForm {
  return { ...emptyForm(), title: 'A scan', ...patch };
}

describe('plan → form → plan', () => {
  it.each(exampleFiles)('gives back the same validated plan for examples/%s', (file) => {
    const plan = parsePlanText(example(file));
    const back = formToPlan(planToForm(plan));
    expect(back.issues).toEqual([]);
    expect(validatePlan(back.plan)).toEqual(plan);
  });

  it('covers the examples the form must round-trip: every axis kind, grid and zip, reheating, an inline bound set', () => {
    const plans = exampleFiles.map((f) => parsePlanText(example(f)));
    const kinds = new Set(plans.flatMap((p) => p.axes.map((a) => ('values' in a ? 'values' : 'range' in a ? 'range' : 'logRange'))));
    expect([...kinds].sort()).toEqual(['logRange', 'range', 'values']);
    expect(new Set(plans.map((p) => p.combine))).toEqual(new Set(['grid', 'zip']));
    expect(plans.some((p) => p.pivot !== undefined && 'reheating' in p.pivot)).toBe(true);
    expect(plans.some((p) => typeof p.boundSet === 'object')).toBe(true);
  });

  it('round-trips an expression with declared parameters, a density-ended reheating, field range and tolerances', () => {
    const plan = validatePlan({
      title: 'Custom', notes: 'n', potential: { expression: 'V0 * phi^p / (1 + phi^2/m^2)', parameters: ['p', 'm'] },
      fixed: { p: 2 }, axes: [{ name: 'm', logRange: { from: 0.5, to: 50, count: 7 } }],
      pivot: { reheating: { w: 0.25, rhoRehQuarterGeV: 1e10, gReh: 100, kPivotMpc: 0.002 } },
      phi0: 30, fieldRange: [0, 40], precision: { preset: 'exact', rtol: 1e-9, efoldMargin: 5 }, targetAs: 2.2e-9,
    });
    const f = planToForm(plan);
    expect(f).toMatchObject({ potentialKind: 'expression', parameters: 'p, m', pivotKind: 'reheating', fieldMin: '0', fieldMax: '40' });
    expect(f.reheating).toEqual({ w: '0.25', end: 'rhoRehQuarterGeV', endValue: '10000000000', gReh: '100', kPivotMpc: '0.002' });
    expect(validatePlan(formToPlan(f).plan)).toEqual(plan);
  });

  it('round-trips a tabulated potential', () => {
    const table = 'phi,V\n0,0\n1,1\n2,4\n3,9\n4,16\n';
    const plan = validatePlan({ title: 'T', potential: { table }, axes: [{ name: 'pivotEfolds', values: [50, 60] }] });
    const f = planToForm(plan);
    expect(f.potentialKind).toBe('table');
    expect(validatePlan(formToPlan(f).plan)).toEqual(plan);
  });

  it('keeps exact doubles through the text of the form', () => {
    const plan = validatePlan({ title: 'x', potential: { family: 'e-model' }, axes: [{ name: 'alpha', values: [0.1 + 0.2, 1 / 3, 1e-300] }], pivot: { efolds: 55 } });
    expect(validatePlan(formToPlan(planToForm(plan)).plan)).toEqual(plan);
  });
});

describe('form → plan', () => {
  it('builds a grid over a log range and an explicit list with a fixed N_*', () => {
    const { plan } = formToPlan(form({
      family: 'e-model',
      axes: [{ ...emptyAxis('alpha'), kind: 'logRange', from: '0.1', to: '10', count: '5' }, { ...emptyAxis('V0'), kind: 'values', values: '1, 2; 3  4' }],
      efolds: '60',
    }));
    expect(plan).toEqual({
      title: 'A scan', potential: { family: 'e-model' }, combine: 'grid', pivot: { efolds: 60 }, precision: { preset: 'fast' },
      axes: [{ name: 'alpha', logRange: { from: 0.1, to: 10, count: 5 } }, { name: 'V0', values: [1, 2, 3, 4] }],
    });
    expect(validateForm(form({ family: 'e-model', axes: [{ ...emptyAxis('alpha'), from: '1', to: '2', count: '5' }, { ...emptyAxis('pivotEfolds'), from: '50', to: '60', count: '3' }] })).pointCount).toBe(15);
  });

  it('zips axes and drops the pivot when N_* is an axis', () => {
    const f = form({
      family: 'e-model', combine: 'zip', efolds: '55',
      axes: [{ ...emptyAxis('alpha'), kind: 'values', values: '0.5 1 5' }, { ...emptyAxis('pivotEfolds'), from: '50', to: '60', count: '3' }],
    });
    const { plan } = formToPlan(f);
    expect(plan.pivot).toBeUndefined();
    expect(plan.combine).toBe('zip');
    const v = validateForm(f);
    expect(v.issues).toEqual([]);
    expect(v.pointCount).toBe(3);
  });

  it('writes a reheating pivot with only the fields given', () => {
    const { plan } = formToPlan(form({
      axes: [{ ...emptyAxis('V0'), values: '1', kind: 'values' }], pivotKind: 'reheating',
      reheating: { w: '0', end: 'tRehGeV', endValue: '1e9', gReh: '', kPivotMpc: '' },
    }));
    expect(plan.pivot).toEqual({ reheating: { w: 0, tRehGeV: 1e9 } });
  });

  it('leaves out fixed values of scanned parameters and blank ones, and reads numbers only from plain decimals', () => {
    const { plan } = formToPlan(form({ family: 'hilltop', fixed: { mu: '10', q: '', V0: '2' }, axes: [{ ...emptyAxis('mu'), from: '5', to: '6', count: '2' }] }));
    expect(plan.fixed).toEqual({ V0: 2 });
    expect(readNumber(' 1.5e3 ')).toBe(1500);
    expect(readNumber('0x10')).toBe('0x10');
    expect(readNumber('')).toBe('');
  });

  it('reports typed mistakes at the path of their input, the way the server would', () => {
    const v = validateForm(form({
      title: ' ', family: 'e-model',
      axes: [{ ...emptyAxis('alpha'), from: '1', to: 'ten', count: '2.5' }, { ...emptyAxis('beta'), kind: 'values', values: '1, x' }],
    }));
    const paths = v.issues.map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['title', 'axes[0].range.to', 'axes[0].range.count', 'axes[1].values[1]', 'axes[1].name']));
    expect(v.issues.find((i) => i.path === 'axes[0].range.to')?.message).toMatch(/finite number; got "ten"/);
    expect(v.plan).toBeNull();
    expect(v.pointCount).toBeNull();
  });

  it('reports an inline bound set that is not YAML at boundSet, and one with wrong fields at their paths', () => {
    const base = { axes: [{ ...emptyAxis('V0'), kind: 'values' as const, values: '1' }], boundSet: INLINE_BOUND_SET };
    const broken = formToPlan(form({ ...base, boundSetText: 'id: [unclosed' }));
    expect(broken.issues.map((i) => i.path)).toEqual(['boundSet']);
    const wrong = validateForm(form({ ...base, boundSetText: 'id: x\nlabel: y\ncitation: ""\nconstraints: []\n' }));
    expect(wrong.issues.map((i) => i.path)).toContain('boundSet.constraints');
  });

  it('moves "has no value" of a declared parameter to that parameter\'s value input', () => {
    const f = form({ potentialKind: 'expression', expression: 'V0 * (1 - (phi/mu)^q)', parameters: 'q, mu', fixed: { q: '4' }, axes: [{ ...emptyAxis('V0'), kind: 'values', values: '1' }] });
    const { issues } = validateForm(f);
    expect(issues.map((i) => i.path)).toEqual(['potential.parameters[1]']);
    expect(relocateIssues(issues, ['q', 'mu'])).toEqual([{ path: 'fixed.mu', message: issues[0]!.message }]);
  });
});
