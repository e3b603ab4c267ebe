import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../../../shared/errors.ts';
import { PlanValidationError, type PlanIssue } from '../../../shared/plan/planError.ts';
import { parsePlanText, validatePlan } from '../../../shared/plan/validatePlan.ts';

const EXAMPLES = new URL('../../../examples/', import.meta.url);

// A valid plan; each bad plan below changes one thing in a fresh copy.
const good = () => ({
  title: 'Saltmarsh test plan',
  potential: { family: 'e-model' } as Record<string, unknown>,
  axes: [{ name: 'alpha', logRange: { from: 0.1, to: 10, count: 5 } }] as Array<Record<string, unknown>>,
  pivot: { efolds: 55 } as unknown,
} as Record<string, unknown> & { axes: Array<Record<string, unknown>> });

function issuesOf(data: unknown): readonly PlanIssue[] {
  try {
    validatePlan(data);
  } catch (err) {
    expect(err).toBeInstanceOf(PlanValidationError);
    return (err as PlanValidationError).issues;
  }
  throw new Error('the plan was accepted');
}

type Plan = ReturnType<typeof good>;
const bad: Array<[string, (p: Plan) => void, string, RegExp]> = [
  ['a count of 0', (p) => { p.axes[0] = { name: 'alpha', range: { from: 1, to: 2, count: 0 } }; }, 'axes[0].range.count', /^must be a whole number from 1 to 100000$/],
  ['a fractional count', (p) => { p.axes.push({ name: 'V0', range: { from: 1, to: 2, count: 2.5 } }); }, 'axes[1].range.count', /^must be a whole number from 1 to 100000$/],
  ['a count above the limit', (p) => { p.axes[0] = { name: 'alpha', logRange: { from: 1, to: 2, count: 100_001 } }; }, 'axes[0].logRange.count', /whole number from 1 to 100000/],
  ['a log range through zero', (p) => { p.axes[0] = { name: 'alpha', logRange: { from: -1, to: 10, count: 5 } }; }, 'axes[0].logRange.from', /^must be > 0 \(a log range needs positive bounds\)$/],
  ['a log range ending at 0', (p) => { p.axes[0] = { name: 'alpha', logRange: { from: 1, to: 0, count: 5 } }; }, 'axes[0].logRange.to', /must be > 0/],
  ['an axis with two kinds of values', (p) => { p.axes[0]!.values = [1, 2]; }, 'axes[0]', /^give exactly one of range, logRange, values; got logRange and values$/],
  ['an axis without values', (p) => { p.axes[0] = { name: 'alpha' }; }, 'axes[0]', /^give exactly one of range, logRange, values; none given$/],
  ['an empty value list', (p) => { p.axes[0] = { name: 'alpha', values: [] }; }, 'axes[0].values', /^must list 1 to 100000 values$/],
  ['a value that is not a number', (p) => { p.axes[0] = { name: 'alpha', values: [1, 'two'] }; }, 'axes[0].values[1]', /^must be a finite number; got "two"$/],
  ['an unknown axis field', (p) => { p.axes[0]!.step = 0.1; }, 'axes[0]', /^unknown field "step"; allowed: name, range, logRange, values$/],
  ['an unknown top-level field', (p) => { p.colour = 'teal'; }, '', /^unknown field "colour"; allowed: title, notes, potential, fixed, axes, combine, pivot/],
  ['no axes', (p) => { p.axes = []; }, 'axes', /^must list 1 to 6 axes$/],
  ['seven axes', (p) => { p.axes = Array.from({ length: 7 }, () => ({ name: 'alpha', values: [1] })); }, 'axes', /^must list 1 to 6 axes$/],
  ['an unknown family', (p) => { p.potential = { family: 'e-modle' }; }, 'potential.family', /^unknown family "e-modle"; built-in families: quadratic, monomial, starobinsky, natural, e-model, t-model, hilltop, exponential$/],
  ['two potentials', (p) => { p.potential = { family: 'e-model', expression: 'phi^2' }; }, 'potential', /^give exactly one of family, expression, table; got family and expression$/],
  ['an axis that is not a parameter', (p) => { p.axes[0]!.name = 'beta'; }, 'axes[0].name', /^"beta" is not a parameter of the "e-model" family; allowed: V0, alpha, pivotEfolds$/],
  ['a fixed value that is not a parameter', (p) => { p.fixed = { mu: 3 }; }, 'fixed.mu', /^"mu" is not a parameter of the "e-model" family; allowed: V0, alpha$/],
  ['the same axis twice', (p) => { p.axes.push({ name: 'alpha', values: [1] }); }, 'axes[1].name', /^"alpha" is already scanned by axes\[0\]; give each name once$/],
  ['a name both axis and fixed', (p) => { p.fixed = { alpha: 1 }; }, 'fixed.alpha', /^"alpha" is also scanned by axes\[0\]; give it in one place$/],
  ['N_* under fixed', (p) => { p.fixed = { pivotEfolds: 55 }; }, 'fixed.pivotEfolds', /^N_\* is not a parameter; give it as pivot.efolds or scan it with an axis named pivotEfolds$/],
  ['zip with unequal lengths', (p) => { p.combine = 'zip'; p.axes.push({ name: 'V0', values: [1, 2, 3] }); }, 'axes', /^combine "zip" needs axes of equal length; got alpha: 5, V0: 3$/],
  ['an unknown combine', (p) => { p.combine = 'product'; }, 'combine', /^must be one of "grid", "zip"; got "product"$/],
  ['the pivot twice', (p) => { p.axes.push({ name: 'pivotEfolds', values: [50, 60] }); }, 'pivot', /^N_\* is already scanned by axes\[1\] \(pivotEfolds\); remove pivot or that axis$/],
  ['no pivot at all', (p) => { delete p.pivot; }, 'pivot', /^required: give pivot.efolds or pivot.reheating, or scan N_\* with an axis named pivotEfolds$/],
  ['a negative alpha in a value list', (p) => { p.axes[0] = { name: 'alpha', values: [1, -2] }; }, 'axes[0].values[1]', /^alpha must be > 0 for the "e-model" family; got -2$/],
  ['a linear range of alpha from 0', (p) => { p.axes[0] = { name: 'alpha', range: { from: 0, to: 2, count: 3 } }; }, 'axes[0].range.from', /^alpha must be > 0 for the "e-model" family; got 0$/],
  ['a fixed V0 of 0', (p) => { p.fixed = { V0: 0 }; }, 'fixed.V0', /^V0 must be > 0 for the "e-model" family; got 0$/],
  ['an N_* axis value of 0', (p) => { delete p.pivot; p.axes.push({ name: 'pivotEfolds', values: [55, 0] }); }, 'axes[1].values[1]', /^e-folds N_\* must be > 0 and at most 1000; got 0$/],
  ['both pivot forms', (p) => { p.pivot = { efolds: 55, reheating: { w: 0, tRehGeV: 1e9 } }; }, 'pivot', /^give exactly one of efolds, reheating; got efolds and reheating$/],
  ['a negative pivot', (p) => { p.pivot = { efolds: -3 }; }, 'pivot.efolds', /^must be > 0$/],
  ['reheating w out of range', (p) => { p.pivot = { reheating: { w: 2, tRehGeV: 1e9 } }; }, 'pivot.reheating.w', /^must be in \[-1\/3, 1\]$/],
  ['a misspelt reheating field', (p) => { p.pivot = { reheating: { w: 0, TReh: 1e9 } }; }, 'pivot.reheating', /^unknown field "TReh"; allowed: w, tRehGeV, rhoRehQuarterGeV, gReh, kPivotMpc$/],
  ['exponential without endPhi', (p) => { p.potential = { family: 'exponential' }; p.axes[0]!.name = 'lambda'; }, 'endPhi', /^required for the "exponential" family, which never ends inflation by itself/],
  ['more than 10^7 points', (p) => { p.axes = ['V0', 'alpha'].map((name) => ({ name, range: { from: 1, to: 2, count: 4000 } })); }, 'axes', /^the grid has 16,000,000 points \(4000 × 4000\); at most 10,000,000 are allowed$/],
  ['an expression that does not compile', (p) => { p.potential = { expression: 'm^2 * phi^2 + lam * phi^4', parameters: ['m'] }; p.axes[0]!.name = 'm'; }, 'potential.expression', /^unknown symbol "lam"; allowed are phi, pi, e and the declared parameters \(m, V0\)$/],
  ['an expression with a syntax error', (p) => { p.potential = { expression: 'phi^^2' }; p.axes[0]!.name = 'V0'; }, 'potential.expression', /^syntax error at character/],
  ['a declared parameter without a value', (p) => { p.potential = { expression: 'm^2 * phi^2 + lam * phi^4', parameters: ['m', 'lam'] }; p.axes[0]!.name = 'm'; }, 'potential.parameters[1]', /^"lam" has no value; give it under fixed or as an axis$/],
  ['a reserved parameter name', (p) => { p.potential = { expression: 'phi^2', parameters: ['pi'] }; p.axes[0]!.name = 'V0'; }, 'potential.parameters', /^"pi" is reserved/],
  ['parameters on a family', (p) => { p.potential = { family: 'e-model', parameters: ['x'] }; }, 'potential.parameters', /^only an expression declares parameters$/],
  ['a table that does not parse', (p) => { p.potential = { table: 'phi,V\n0,1\n1,2\n2,oops\n3,4\n' }; p.axes[0]!.name = 'V0'; }, 'potential.table', /^line 4, column 2 \(V\): "oops" is not a number$/],
  ['an unknown precision preset', (p) => { p.precision = { preset: 'slow' }; }, 'precision.preset', /^must be one of "fast", "exact"; got "slow"$/],
  ['a tolerance out of range', (p) => { p.precision = { rtol: 0.1 }; }, 'precision.rtol', /^must be in \[1e-14, 1e-3\]$/],
  ['an unknown bound-set preset', (p) => { p.boundSet = 'cmb-2013'; }, 'boundSet', /^must be the id of a preset \(cmb-2018-bmodes-2021\) or an inline bound set$/],
  ['an inline bound set with sigma < 0', (p) => { p.boundSet = { id: 'b', label: 'B', citation: '', constraints: [{ observable: 'ns', kind: 'gaussian', mean: 0.96, sigma: -1 }] }; }, 'boundSet.constraints[0].sigma', /^must be > 0; got -1$/],
  ['a blank title', (p) => { p.title = '   '; }, 'title', /^must not be blank$/],
  ['no title', (p) => { delete p.title; }, 'title', /^required: a string$/],
  ['notes too long', (p) => { p.notes = 'x'.repeat(20_001); }, 'notes', /^must be a string of at most 20000 characters$/],
  ['a negative target A_s', (p) => { p.targetAs = -2e-9; }, 'targetAs', /^must be > 0; got -2e-9$/],
  ['a field range the wrong way round', (p) => { p.fieldRange = [5, 1]; }, 'fieldRange', /^min must be below max$/],
  ['a __proto__ key under fixed', (p) => { p.fixed = JSON.parse('{"__proto__": 1}') as unknown; }, 'fixed.__proto__', /^"__proto__" is not a parameter/],
];

describe('validatePlan: bad plans', () => {
  it.each(bad)('rejects %s, naming the field', (_name, change, path, message) => {
    const plan = good();
    change(plan);
    const issues = issuesOf(plan);
    expect(issues.find((i) => i.path === path && message.test(i.message)), JSON.stringify(issues)).toBeDefined();
  });

  it('has at least 20 bad plans', () => expect(bad.length).toBeGreaterThanOrEqual(20));

  it('reports every problem at once, one per line of the message', () => {
    const plan = good();
    plan.axes.push({ name: 'beta', range: { from: 1, to: 2, count: 0 } });
    plan.combine = 'zip';
    plan.fixed = { alpha: 2 };
    delete plan.pivot;
    let error: PlanValidationError | undefined;
    try {
      validatePlan(plan);
    } catch (err) {
      error = err as PlanValidationError;
    }
    expect(error).toBeInstanceOf(InvalidInputError);
    expect(error?.code).toBe('invalid_plan');
    expect(error?.status).toBe(400);
    expect(error?.field).toBe('axes[1].range.count');
    expect(error?.message.split('\n')).toEqual([
      'The scan plan has 4 problems:',
      'axes[1].range.count: must be a whole number from 1 to 100000',
      'axes[1].name: "beta" is not a parameter of the "e-model" family; allowed: V0, alpha, pivotEfolds',
      'fixed.alpha: "alpha" is also scanned by axes[0]; give it in one place',
      'pivot: required: give pivot.efolds or pivot.reheating, or scan N_* with an axis named pivotEfolds',
    ]);
    expect(error?.toJSON().issues).toHaveLength(4);
  });

  it('lists at most 50 problems in the message but keeps them all', () => {
    const plan = good();
    plan.axes[0] = { name: 'alpha', values: Array.from({ length: 80 }, () => 'x') };
    const error = (() => { try { validatePlan(plan); } catch (e) { return e as PlanValidationError; } })();
    expect(error?.issues).toHaveLength(80);
    expect(error?.message).toMatch(/… and 30 more problems$/);
  });

  it('rejects a document that is not a mapping', () => {
    for (const data of [null, [], 'title: x', 3]) {
      expect(() => validatePlan(data)).toThrow(/^The scan plan has 1 problem:\nthe plan must be a mapping \(YAML\) or an object \(JSON\)/);
    }
  });

  it('allows values outside a family\'s suggested range', () => {
    const plan = good();
    plan.axes[0] = { name: 'alpha', values: [1e-4, 1e4] };
    expect(validatePlan(plan).axes).toHaveLength(1);
  });
});

describe('parsePlanText', () => {
  it.each(readdirSync(EXAMPLES).filter((f) => f.endsWith('.yaml')))('reads and validates examples/%s', (file) => {
    const plan = parsePlanText(readFileSync(new URL(file, EXAMPLES), 'utf8'));
    expect(plan.title.length).toBeGreaterThan(0);
    expect(plan.axes.length).toBeGreaterThan(0);
  });

  it('reads JSON, detected by its leading brace or named', () => {
    const text = JSON.stringify(good(), null, 2);
    expect(parsePlanText(text).combine).toBe('grid');
    expect(parsePlanText(text, 'json').precision).toEqual({ preset: 'fast' });
  });

  it('accepts an expression with declared parameters and a table', () => {
    const expression = { ...good(), potential: { expression: 'm^2 * phi^2 / 2', parameters: ['m'] }, fixed: { m: 1e-5 }, axes: [{ name: 'V0', values: [1] }] };
    expect(validatePlan(expression).potential.parameters).toEqual(['m']);
    const table = { ...good(), potential: { table: 'phi,V\n0,0\n1,1\n2,4\n3,9\n' }, axes: [{ name: 'V0', values: [1] }] };
    expect(validatePlan(table).potential.table).toMatch(/^phi,V/);
  });

  const syntax: Array<[string, string, 'yaml' | 'json' | undefined, RegExp]> = [
    ['bad YAML indentation', 'title: x\n  axes: 1\n', undefined, /^YAML syntax error at line 1, column 8: Nested mappings are not allowed/m],
    ['a duplicate YAML key', 'title: a\ntitle: b\n', undefined, /^YAML syntax error at line 2, column 1: Map keys must be unique/m],
    ['an unknown YAML tag', 'title: !!js/function "f"\n', undefined, /^YAML syntax error at line 1, column 8: Unresolved tag/m],
    ['an alias without anchor', 'title: *name\n', undefined, /^YAML error: Unresolved alias/m],
    ['a JSON stray brace', '{\n  "title": "x",\n  "axes": }', undefined, /^JSON syntax error at line 3, column 11: Unexpected token '\}'$/m],
    ['a JSON trailing comma', '{"title": "x",}', 'json', /^JSON syntax error at line 1, column 15: Expected double-quoted property name$/m],
    ['JSON cut short', '{"title": "x",\n"axes": [', 'json', /^JSON syntax error at line 2, column 10 \(the end of the text\): Unexpected end of JSON input$/m],
  ];
  it.each(syntax)('reports %s with line and column', (_name, text, format, message) => {
    expect(() => parsePlanText(text, format)).toThrow(PlanValidationError);
    expect(() => parsePlanText(text, format)).toThrow(message);
  });
});
