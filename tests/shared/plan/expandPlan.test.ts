import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEFAULT_TARGET_AMPLITUDE } from '../../../shared/physics/bounds/boundSet.ts';
import { preparePoint, preparePotential } from '../../../shared/physics/point/preparePoint.ts';
import { canonicalJson } from '../../../shared/plan/canonicalJson.ts';
import { axisValues, createPointSource, planPointCount } from '../../../shared/plan/expandPlan.ts';
import { planHash } from '../../../shared/plan/planHash.ts';
import { pointRequestSchema } from '../../../shared/plan/pointRequest.ts';
import type { ScanPlanInput } from '../../../shared/plan/scanPlan.ts';
import { parsePlanText, validatePlan } from '../../../shared/plan/validatePlan.ts';

const EXAMPLES = new URL('../../../examples/', import.meta.url);
const examples = readdirSync(EXAMPLES).filter((f) => f.endsWith('.yaml'));

const plan = (axes: ScanPlanInput['axes'], extra: Partial<ScanPlanInput> = {}) =>
  validatePlan({ title: 'expansion test', potential: { family: 'hilltop' }, axes, pivot: { efolds: 55 }, ...extra });

describe('axisValues', () => {
  it('steps a linear range with both ends exact', () => {
    const values = axisValues({ name: 'mu', range: { from: 0.1, to: 0.7, count: 7 } });
    expect(values[0]).toBe(0.1);
    expect(values[6]).toBe(0.7);
    values.forEach((v, i) => expect(v).toBeCloseTo(0.1 + i * 0.1, 14));
    expect(axisValues({ name: 'mu', range: { from: 3, to: 1, count: 3 } })).toEqual([3, 2, 1]);
  });

  it('gives `from` for a count of 1', () => {
    expect(axisValues({ name: 'mu', range: { from: 2, to: 9, count: 1 } })).toEqual([2]);
    expect(axisValues({ name: 'mu', logRange: { from: 2, to: 9, count: 1 } })).toEqual([2]);
  });

  it('steps a log range geometrically with both ends exact', () => {
    const values = axisValues({ name: 'alpha', logRange: { from: 0.01, to: 100, count: 5 } });
    expect(values[0]).toBe(0.01);
    expect(values[4]).toBe(100);
    [0.01, 0.1, 1, 10, 100].forEach((v, i) => expect(values[i]! / v).toBeCloseTo(1, 13));
    // Wide enough that (to/from)^t would overflow.
    const wide = axisValues({ name: 'alpha', logRange: { from: 1e-300, to: 1e300, count: 3 } });
    expect(wide[1]).toBeCloseTo(1, 10);
  });

  it('returns an explicit list as given', () => {
    expect(axisValues({ name: 'q', values: [4, 2, 6] })).toEqual([4, 2, 6]);
  });
});

describe('createPointSource', () => {
  it('counts a grid as the product and a zip as the common length', () => {
    const axes = [{ name: 'mu', range: { from: 5, to: 10, count: 6 } }, { name: 'q', values: [2, 4, 6] }];
    expect(planPointCount(plan(axes))).toBe(18);
    expect(createPointSource(plan(axes)).count).toBe(18);
    const zipped = plan([axes[1]!, { name: 'mu', values: [5, 7, 9] }], { combine: 'zip' });
    expect(planPointCount(zipped)).toBe(3);
  });

  it('varies the last axis fastest in a grid', () => {
    const source = createPointSource(plan([{ name: 'mu', values: [10, 20] }, { name: 'q', values: [2, 4, 6] }]));
    const all = Array.from({ length: source.count }, (_, i) => source.valuesAt(i));
    expect(all).toEqual([
      { mu: 10, q: 2 }, { mu: 10, q: 4 }, { mu: 10, q: 6 },
      { mu: 20, q: 2 }, { mu: 20, q: 4 }, { mu: 20, q: 6 },
    ]);
    expect(Object.keys(source.valuesAt(0))).toEqual(['mu', 'q']);
  });

  it('zips value i of every axis into point i', () => {
    const source = createPointSource(plan([{ name: 'mu', values: [10, 20, 30] }, { name: 'q', values: [2, 4, 6] }], { combine: 'zip' }));
    expect([0, 1, 2].map((i) => source.valuesAt(i))).toEqual([{ mu: 10, q: 2 }, { mu: 20, q: 4 }, { mu: 30, q: 6 }]);
  });

  it('refuses an index outside the plan', () => {
    const source = createPointSource(plan([{ name: 'mu', values: [10, 20] }]));
    expect(() => source.requestAt(2)).toThrow(RangeError);
    expect(() => source.valuesAt(-1)).toThrow(/outside 0\.\.1/);
    expect(() => source.valuesAt(0.5)).toThrow(RangeError);
  });

  it('builds requests of a 10^6-point plan from the index alone', () => {
    const big = plan([
      { name: 'mu', range: { from: 1, to: 100, count: 100 } },
      { name: 'q', range: { from: 2, to: 8, count: 100 } },
      { name: 'V0', logRange: { from: 1e-12, to: 1, count: 100 } },
    ], { fixed: {} });
    const before = process.memoryUsage().heapUsed;
    const start = performance.now();
    const source = createPointSource(big);
    expect(source.count).toBe(1_000_000);
    // Index 123456 has digits 12, 34, 56 (last axis fastest).
    const mu = axisValues(big.axes[0]!);
    const q = axisValues(big.axes[1]!);
    const v0 = axisValues(big.axes[2]!);
    expect(source.requestAt(0).params).toEqual({ mu: 1, q: 2, V0: 1e-12 });
    expect(source.requestAt(123_456).params).toEqual({ mu: mu[12], q: q[34], V0: v0[56] });
    expect(source.requestAt(999_999).params).toEqual({ mu: 100, q: 8, V0: 1 });
    for (let i = 0; i < 10_000; i++) source.requestAt((i * 7919) % source.count);
    // A materialised grid would take ~100 MB and far longer than this.
    expect(performance.now() - start).toBeLessThan(500);
    expect(process.memoryUsage().heapUsed - before).toBeLessThan(30e6);
  });

  it('takes the pivot from a pivotEfolds axis, and everything else from the plan', () => {
    const source = createPointSource(validatePlan({
      title: 'pivot axis', potential: { family: 'exponential' }, endPhi: 30, phi0: -5, fieldRange: [-10, 40],
      fixed: { lambda: 0.3 }, axes: [{ name: 'pivotEfolds', values: [50, 60] }],
      precision: { preset: 'exact', rtol: 1e-10 }, targetAs: 2e-9,
    }));
    expect(source.requestAt(1)).toEqual({
      potential: { family: 'exponential' }, params: { lambda: 0.3 }, pivot: { efolds: 60 },
      endPhi: 30, phi0: -5, fieldRange: [-10, 40], exact: true, targetAs: 2e-9, precision: { rtol: 1e-10 },
    });
    expect(source.valuesAt(0)).toEqual({ pivotEfolds: 50 });
    expect(source.parameterNames).toEqual(['lambda']);
  });

  it('normalises to the default A_s of a single point (2.1e-9) unless targetAs is given', () => {
    const request = createPointSource(plan([{ name: 'mu', values: [10] }])).requestAt(0);
    expect(request.targetAs).toBe(DEFAULT_TARGET_AMPLITUDE);
    expect(request.exact).toBe(false);
    expect(request).not.toHaveProperty('precision');
  });

  it.each(examples)('builds requests for examples/%s that the physics core accepts', (file) => {
    const source = createPointSource(parsePlanText(readFileSync(new URL(file, EXAMPLES), 'utf8')));
    const prepared = preparePotential(source.potential, source.parameterNames);
    for (const index of [0, Math.floor(source.count / 2), source.count - 1]) {
      const request = source.requestAt(index);
      expect(pointRequestSchema.parse(request)).toEqual(request);
      expect(() => preparePoint(request, prepared)).not.toThrow();
      expect(() => preparePoint(request)).not.toThrow();
    }
  });

  it('gives the example plans their documented sizes', () => {
    const count = (file: string) => createPointSource(parsePlanText(readFileSync(new URL(file, EXAMPLES), 'utf8'))).count;
    expect(count('plateau-alpha-survey.yaml')).toBe(600);
    expect(count('hilltop-power-grid.yaml')).toBe(130);
    expect(count('tmodel-reheating.yaml')).toBe(40);
    expect(count('quick-check.yaml')).toBe(3);
  });
});

describe('planHash', () => {
  const data = { title: 'hash', potential: { family: 'hilltop' }, fixed: { V0: 1, mu: 10 }, axes: [{ name: 'q', values: [2, 4] }], pivot: { efolds: 55 } };
  const reordered = { pivot: { efolds: 55 }, axes: [{ values: [2, 4], name: 'q' }], fixed: { mu: 10, V0: 1 }, potential: { family: 'hilltop' }, title: 'hash' };

  it('is the SHA-256 of the sorted-key JSON of the validated plan', async () => {
    const expected = createHash('sha256').update(canonicalJson(validatePlan(data))).digest('hex');
    expect(await planHash(data)).toBe(expected);
    expect(canonicalJson({ b: [1, { d: 2, c: undefined, a: 'x' }], a: null })).toBe('{"a":null,"b":[1,{"a":"x","d":2}]}');
  });

  it('does not change with key order, layout, comments or spelled-out defaults', async () => {
    const hash = await planHash(data);
    expect(await planHash(reordered)).toBe(hash);
    expect(await planHash(JSON.stringify(reordered, null, 4))).toBe(hash);
    const yaml = '# a comment\ntitle: hash\npotential: { family: hilltop }\ncombine: grid\nfixed: { mu: 10, V0: 1 }\naxes:\n  - { name: q, values: [2, 4] }\npivot: { efolds: 55 }\nprecision: { preset: fast }\n';
    expect(await planHash(yaml)).toBe(hash);
  });

  it('changes when any value changes', async () => {
    const hash = await planHash(data);
    expect(await planHash({ ...data, pivot: { efolds: 56 } })).not.toBe(hash);
    expect(await planHash({ ...data, title: 'hash 2' })).not.toBe(hash);
    expect(await planHash(data)).toMatch(/^[0-9a-f]{64}$/);
  });
});
