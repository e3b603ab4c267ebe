import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../../../../shared/errors.ts';
import { FAMILIES, compileFamily, getFamily, type CompiledFamily } from '../../../../shared/physics/potential/families.ts';
import { resolveParameters } from '../../../../shared/physics/potential/parameters.ts';
import { preparePotential } from '../../../../shared/physics/point/preparePoint.ts';

/** The phi0 search interval as the physics core gets it (through the portable form compute threads use). */
const domainOf = (id: string, params: Float64Array) => preparePotential({ family: id }, []).fieldDomain(params);

type Triple = [number, number, number];

function evaluate(c: CompiledFamily, phi: number, given: Record<string, number> = {}): Triple {
  const out = new Float64Array(3);
  c.evaluate(phi, resolveParameters(c.parameterNames, c.defaults, given), out);
  return [out[0] ?? NaN, out[1] ?? NaN, out[2] ?? NaN];
}

function message(fn: () => unknown): string {
  try {
    fn();
  } catch (err) {
    if (err instanceof InvalidInputError) return `${err.field}|${err.message}`;
    throw err;
  }
  throw new Error('expected an InvalidInputError');
}

// Closed forms: the family formulas of DESIGN.md ("Command-line contract"), differentiated by hand.
const closedForms: Record<string, { params: Record<string, number>; phi: number[]; exact: (phi: number) => Triple }> = {
  quadratic: { params: { V0: 3 }, phi: [0.5, 4, 15], exact: (x) => [x * x, 2 * x, 2] },
  monomial: {
    params: { p: 2.5 }, phi: [0.5, 4, 15],
    exact: (x) => [x ** 2.5, 2.5 * x ** 1.5, 2.5 * 1.5 * x ** 0.5],
  },
  starobinsky: {
    params: {}, phi: [0.9, 5.5, 12],
    exact: (x) => {
      const k = Math.sqrt(2 / 3);
      const y = Math.exp(-k * x);
      return [(1 - y) ** 2, 2 * k * y * (1 - y), 2 * k * k * y * (2 * y - 1)];
    },
  },
  'e-model': {
    params: { alpha: 0.3 }, phi: [0.6, 3, 8],
    exact: (x) => {
      const k = Math.sqrt(2 / (3 * 0.3));
      const y = Math.exp(-k * x);
      return [(1 - y) ** 2, 2 * k * y * (1 - y), 2 * k * k * y * (2 * y - 1)];
    },
  },
  't-model': {
    params: { alpha: 2 }, phi: [0.6, 3, 8],
    exact: (x) => {
      const s = Math.sqrt(12);
      const t = Math.tanh(x / s);
      const sech2 = 1 - t * t;
      return [t * t, (2 * t * sech2) / s, (2 * sech2 * (sech2 - 2 * t * t)) / (s * s)];
    },
  },
  natural: {
    params: { f: 5 }, phi: [1, 7, 14],
    exact: (x) => [1 + Math.cos(x / 5), -Math.sin(x / 5) / 5, -Math.cos(x / 5) / 25],
  },
  hilltop: {
    params: { mu: 12, q: 3 }, phi: [1, 6, 11],
    exact: (x) => [1 - (x / 12) ** 3, (-3 * x * x) / 12 ** 3, (-6 * x) / 12 ** 3],
  },
  exponential: {
    params: { lambda: 0.4 }, phi: [-3, 0.5, 10],
    exact: (x) => [Math.exp(-0.4 * x), -0.4 * Math.exp(-0.4 * x), 0.16 * Math.exp(-0.4 * x)],
  },
};

describe('built-in families', () => {
  it('are the ones in DESIGN.md, each with V0 (default 1) first and defaults inside their ranges', () => {
    expect(FAMILIES.map((f) => f.id)).toEqual(
      ['quadratic', 'monomial', 'starobinsky', 'natural', 'e-model', 't-model', 'hilltop', 'exponential']);
    for (const family of FAMILIES) {
      expect(family.parameters[0]).toMatchObject({ name: 'V0', default: 1 });
      for (const p of family.parameters) {
        expect(p.range[0]).toBeLessThanOrEqual(p.default);
        expect(p.default).toBeLessThanOrEqual(p.range[1]);
      }
      expect(family.reference).not.toBe('');
      expect(compileFamily(family.id).parameterNames).toEqual(family.parameters.map((p) => p.name));
    }
    expect(FAMILIES.filter((f) => f.needsEndPhi).map((f) => f.id)).toEqual(['exponential']);
  });

  it.each(Object.entries(closedForms))('%s matches its hand-derived V, V\', V\'\'', (id, { params, phi, exact }) => {
    const c = compileFamily(id);
    for (const x of phi) {
      const V0 = params.V0 ?? 1;
      const want = exact(x).map((v) => V0 * v);
      // Same formula evaluated in a different order: agreement to a few ulps of the largest term.
      evaluate(c, x, params).forEach((value, i) => {
        const expected = want[i] ?? NaN;
        expect(Math.abs(value - expected)).toBeLessThan(1e-13 * (Math.abs(expected) + V0));
      });
    }
  });

  // Central differences (common practice): truncation O(h^2 V''') and rounding O(eps V / h) are
  // both ~1e-10 of V's scale for h = 1e-5 times the field scale; the tolerance 1e-7 leaves margin.
  it.each(Object.entries(closedForms))('%s agrees with central finite differences', (id, { params, phi }) => {
    const c = compileFamily(id);
    for (const x of phi) {
      const h = 1e-5 * Math.max(1, Math.abs(x));
      const [V, dV, d2V] = evaluate(c, x, params);
      const [Vp, dVp] = evaluate(c, x + h, params);
      const [Vm, dVm] = evaluate(c, x - h, params);
      const scale = Math.abs(V) / Math.max(1, Math.abs(x));
      expect(Math.abs((Vp - Vm) / (2 * h) - dV)).toBeLessThan(1e-7 * (Math.abs(dV) + scale));
      expect(Math.abs((dVp - dVm) / (2 * h) - d2V)).toBeLessThan(1e-7 * (Math.abs(d2V) + scale));
    }
  });

  it.each(FAMILIES.map((f) => f.id))('%s: V0 multiplies V, V\' and V\'\' exactly', (id) => {
    const c = compileFamily(id);
    for (const V0 of [2 ** -33, 2.7e-10]) {
      const [x] = closedForms[id]?.phi ?? [1];
      const unit = evaluate(c, x ?? 1);
      expect(evaluate(c, x ?? 1, { V0 })).toEqual(unit.map((v) => V0 * v));
    }
  });

  it('gives search intervals that keep V\' representable over the whole alpha range', () => {
    expect(domainOf('hilltop', Float64Array.from([1, 12, 4]))).toEqual({ min: 0, max: 12 });
    expect(domainOf('natural', Float64Array.from([1, 2])).max).toBeCloseTo(2 * Math.PI, 14);
    for (const id of ['e-model', 't-model']) {
      const c = compileFamily(id);
      for (const alpha of [0.01, 1, 100]) {
        const { min, max } = domainOf(id, Float64Array.from([1, alpha]));
        const [V, dV] = evaluate(c, max, { alpha });
        expect(min).toBe(0);
        expect(dV).toBeGreaterThan(0); // not underflowed: eps1 = (V'/V)^2/2 is still meaningful
        expect(dV / V).toBeLessThan(1e-6); // deep in the slow-roll plateau
      }
    }
  });

  it('compiles each family once', () => {
    expect(compileFamily('starobinsky')).toBe(compileFamily('starobinsky'));
  });

  it('rejects an unknown family and lists the built-in ones', () => {
    expect(message(() => getFamily('quartic'))).toMatch(
      /^family\|family: unknown family "quartic"; built-in families: quadratic, monomial, starobinsky, .*exponential$/);
  });
});

describe('resolveParameters', () => {
  const names = ['V0', 'mu', 'q'];
  it('takes given values over defaults, in parameterNames order', () => {
    expect(Array.from(resolveParameters(names, { V0: 1, mu: 10, q: 4 }, { q: 6 }))).toEqual([1, 10, 6]);
  });

  it('rejects unknown names, non-finite values and missing values, naming the field', () => {
    expect(message(() => resolveParameters(names, {}, { V0: 1, mu: 1, q: 1, alpha: 2 })))
      .toMatch(/^params\.alpha\|.*unknown parameter "alpha"; allowed parameters: V0, mu, q$/);
    expect(message(() => resolveParameters(names, { V0: 1, q: 4 }, { constructor: 1 })))
      .toMatch(/^params\.constructor\|.*unknown parameter/);
    expect(message(() => resolveParameters(names, { V0: 1, q: 4 }, { mu: Number.NaN })))
      .toMatch(/^params\.mu\|.*must be a finite number, got NaN/);
    expect(message(() => resolveParameters(names, { V0: 1 }, {}, 'plan.params')))
      .toMatch(/^plan\.params\.mu\|.*no value given and no default for "mu", "q"/);
  });
});
