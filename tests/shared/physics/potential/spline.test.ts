import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { createNaturalSpline, type NaturalSpline } from '../../../../shared/physics/potential/spline.ts';

// Debian's python3-scipy; the reference implementation the spline is checked against.
const PYTHON = '/usr/bin/python3';
const SCIPY_SPLINE = `
import json, sys
from scipy.interpolate import CubicSpline
d = json.load(sys.stdin)
s = CubicSpline(d["x"], d["y"], bc_type="natural")
print(json.dumps({"v": s(d["q"]).tolist(), "d1": s(d["q"], 1).tolist(), "d2": s(d["q"], 2).tolist()}))
`;

function scipySpline(x: number[], y: number[], q: number[]): { v: number[]; d1: number[]; d2: number[] } {
  const output = execFileSync(PYTHON, ['-c', SCIPY_SPLINE], { input: JSON.stringify({ x, y, q }), encoding: 'utf8' });
  return JSON.parse(output) as { v: number[]; d1: number[]; d2: number[] };
}

const starobinsky = (phi: number): number => (1 - Math.exp(-Math.sqrt(2 / 3) * phi)) ** 2;

/** 40 unevenly spaced samples of the Starobinsky potential (denser near the steep end). */
function starobinskyTable(): { x: number[]; y: number[] } {
  const x = Array.from({ length: 40 }, (_, i) => 0.3 + 7.7 * (i / 39) ** 1.6 + 0.01 * Math.sin(3 * i));
  return { x, y: x.map(starobinsky) };
}

function evaluateAll(spline: NaturalSpline, q: number[]): { v: number[]; d1: number[]; d2: number[] } {
  const out = new Float64Array(3);
  const v: number[] = [];
  const d1: number[] = [];
  const d2: number[] = [];
  for (const p of q) {
    spline.evaluate(p, out);
    v.push(out[0]!);
    d1.push(out[1]!);
    d2.push(out[2]!);
  }
  return { v, d1, d2 };
}

/**
 * Largest deviation relative to the largest magnitude of the reference: pointwise relative error
 * is meaningless where the reference crosses zero (V'' of Starobinsky vanishes at its inflection
 * point, and natural end conditions set S'' = 0 at both ends).
 */
function relativeDeviation(actual: number[], expected: number[]): number {
  const scale = Math.max(...expected.map(Math.abs));
  return Math.max(...actual.map((a, i) => Math.abs(a - expected[i]!))) / scale;
}

describe('createNaturalSpline', () => {
  it('matches scipy.interpolate.CubicSpline(bc_type="natural") on an uneven Starobinsky table', () => {
    const { x, y } = starobinskyTable();
    const lo = x[0]!;
    const hi = x[x.length - 1]!;
    // Knots, both ends, and 600 points in between (not on knots).
    const q = [...x, ...Array.from({ length: 600 }, (_, i) => lo + ((hi - lo) * (i + 0.37)) / 600)];
    const reference = scipySpline(x, y, q); // source: SciPy (Virtanen et al., Nature Methods 2020)
    const ours = evaluateAll(createNaturalSpline(Float64Array.from(x), Float64Array.from(y)), q);
    expect(relativeDeviation(ours.v, reference.v)).toBeLessThan(1e-12);
    expect(relativeDeviation(ours.d1, reference.d1)).toBeLessThan(1e-12);
    expect(relativeDeviation(ours.d2, reference.d2)).toBeLessThan(1e-12);
  });

  it('reproduces a straight line to rounding (natural end conditions hold for it, S" = 0)', () => {
    // Common practice: a line has zero second derivative, so it is its own natural spline. Bounds
    // are a few ulps of |y| <= 10 (measured 1.8e-15, 4.4e-15, 1.2e-14).
    const x = Float64Array.from([-1, -0.3, 0.1, 0.15, 0.9, 2.4, 2.5, 4]);
    const y = x.map((v) => 3 * v - 2);
    const spline = createNaturalSpline(x, y);
    const out = new Float64Array(3);
    for (let p = -1; p <= 4; p += 0.013) {
      spline.evaluate(p, out);
      expect(Math.abs(out[0]! - (3 * p - 2))).toBeLessThan(1e-14);
      expect(Math.abs(out[1]! - 3)).toBeLessThan(2e-14);
      expect(Math.abs(out[2]!)).toBeLessThan(1e-13);
    }
  });

  it('converges at fourth order away from the ends (third for S\', second for S")', () => {
    // Source: de Boor, A Practical Guide to Splines (Springer 1978), ch. IV-V: the cubic spline
    // error is O(h^4) for the value, O(h^3) and O(h^2) for S' and S''; the O(h^2) error of the
    // natural end conditions decays geometrically with the distance from the ends.
    // The window [2.9, 4.6] holds the interior extremum of V'''' (at e^{-a phi} = 1/16, phi = 3.39):
    // with the largest error at a window edge, the ratio would depend on where the edge falls
    // between the knots of each grid rather than on the order of the method.
    const a = Math.sqrt(2 / 3);
    const maxError = (intervals: number): [number, number, number] => {
      const x = Float64Array.from({ length: intervals + 1 }, (_, i) => 0.5 + (5.5 * i) / intervals);
      const spline = createNaturalSpline(x, x.map(starobinsky));
      const out = new Float64Array(3);
      const errors: [number, number, number] = [0, 0, 0];
      for (let k = 0; k <= 17_000; k++) {
        const p = 2.9 + k * 1e-4;
        const e = Math.exp(-a * p);
        spline.evaluate(p, out);
        errors[0] = Math.max(errors[0], Math.abs(out[0]! - starobinsky(p)));
        errors[1] = Math.max(errors[1], Math.abs(out[1]! - 2 * a * e * (1 - e)));
        errors[2] = Math.max(errors[2], Math.abs(out[2]! - 2 * a * a * e * (2 * e - 1)));
      }
      return errors;
    };
    const coarse = maxError(80);
    const fine = maxError(160);
    // Measured 16.01, 8.004, 4.0006; a 1% band leaves room for the higher-order terms only.
    expect(coarse[0] / fine[0]).toBeGreaterThan(15.84);
    expect(coarse[0] / fine[0]).toBeLessThan(16.16);
    expect(coarse[1] / fine[1]).toBeGreaterThan(7.92);
    expect(coarse[1] / fine[1]).toBeLessThan(8.08);
    expect(coarse[2] / fine[2]).toBeGreaterThan(3.96);
    expect(coarse[2] / fine[2]).toBeLessThan(4.04);
  });

  it('returns NaN outside the table and exact samples at the knots', () => {
    const { x, y } = starobinskyTable();
    const spline = createNaturalSpline(Float64Array.from(x), Float64Array.from(y));
    const out = new Float64Array(3);
    for (const p of [x[0]! - 1e-9, x[x.length - 1]! + 1e-9, -Infinity, Infinity, NaN]) {
      spline.evaluate(p, out);
      expect([...out].every(Number.isNaN)).toBe(true);
    }
    spline.evaluate(x[0]!, out);
    expect(out[0]).toBe(y[0]);
    expect(out[2]).toBe(0); // natural end condition
    spline.evaluate(x[x.length - 1]!, out);
    expect(out[0]).toBeCloseTo(y[y.length - 1]!, 15);
  });

  it('gives the same values whatever the order of calls (the interval hint is only a shortcut)', () => {
    const { x, y } = starobinskyTable();
    const spline = createNaturalSpline(Float64Array.from(x), Float64Array.from(y));
    const q = Array.from({ length: 300 }, (_, i) => 0.3 + (7.7 * ((i * 7919) % 300)) / 299);
    const scattered = evaluateAll(spline, q);
    const fresh = q.map((p) => evaluateAll(createNaturalSpline(Float64Array.from(x), Float64Array.from(y)), [p]));
    expect(scattered.v).toEqual(fresh.map((f) => f.v[0]));
    expect(scattered.d2).toEqual(fresh.map((f) => f.d2[0]));
  });

  it('writes at an offset and rejects unusable samples', () => {
    const spline = createNaturalSpline(Float64Array.from([0, 1, 2]), Float64Array.from([0, 1, 4]));
    const out = new Float64Array(5).fill(7);
    spline.evaluate(1, out, 2);
    expect([...out]).toEqual([7, 7, 1, 2, 3]); // M_1 = 3 from the 1x1 natural system
    expect(() => createNaturalSpline(Float64Array.from([0, 1, 1]), Float64Array.from([0, 1, 2]))).toThrow(
      /strictly increasing/,
    );
    expect(() => createNaturalSpline(Float64Array.from([0, 1]), Float64Array.from([0]))).toThrow(/x has 2 samples but y has 1/);
    expect(() => createNaturalSpline(Float64Array.from([0]), Float64Array.from([0]))).toThrow(/at least 2 samples/);
    expect(() => createNaturalSpline(Float64Array.from([0, NaN]), Float64Array.from([0, 1]))).toThrow(/not finite/);
  });
});
