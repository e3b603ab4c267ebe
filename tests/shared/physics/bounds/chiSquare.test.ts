import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import {
  chiSquareCdf,
  chiSquareQuantile,
  chiSquareSurvival,
  lnGamma,
  normalQuantile,
  regularizedGammaP,
} from '../../../../shared/physics/bounds/chiSquare.ts';

// Reference values from SciPy (Virtanen et al., Nature Methods 2020) in Debian's python3-scipy.
const PYTHON = '/usr/bin/python3';
const SCIPY = `
import json, sys
from scipy import special, stats
d = json.load(sys.stdin)
print(json.dumps({
  "cdf": [[float(stats.chi2.cdf(x, k)) for x in d["x"]] for k in d["dof"]],
  "sf": [[float(stats.chi2.sf(x, k)) for x in d["x"]] for k in d["dof"]],
  "ppf": [[float(stats.chi2.ppf(p, k)) for p in d["p"]] for k in d["dof"]],
  "norm": [float(stats.norm.ppf(p)) for p in d["pn"]],
  "gammaln": [float(special.gammaln(a)) for a in d["a"]],
  "gammainc": [float(special.gammainc(a, x)) for a, x in d["ax"]],
}))
`;

const dof = [1, 2, 3, 4, 5];
const x = [1e-6, 0.01, 0.3, 1, 2.2788, 3.8415, 5.9915, 7.5, 11.3, 20, 40, 90];
const p = [1e-6, 0.01, 0.1, 0.5, 0.68, 0.6827, 0.9, 0.95, 0.9545, 0.99, 0.9973, 0.999999];
const pn = [1e-300, 1e-20, 1e-9, 1e-4, 0.02, 0.075, 0.3, 0.5, 0.6827, 0.84, 0.9, 0.925, 0.975, 0.99865, 1 - 1e-12];
const a = [0.5, 1, 1.5, 2.5, 3.7, 12, 57.3];
const ax: Array<[number, number]> = [[0.5, 0.2], [2.5, 0.7], [2.5, 9], [10, 9.5], [10, 11.5], [30, 45], [0.5, 30]];
const reference = JSON.parse(
  execFileSync(PYTHON, ['-c', SCIPY], { input: JSON.stringify({ dof, x, p, pn, a, ax }), encoding: 'utf8' }),
) as { cdf: number[][]; sf: number[][]; ppf: number[][]; norm: number[]; gammaln: number[]; gammainc: number[] };

function expectRelative(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}

describe('chi-square distribution', () => {
  it.each(dof.map((k, i) => [k, i]))('cdf matches scipy.stats.chi2.cdf for dof %i', (k, i) => {
    x.forEach((value, j) => expectRelative(chiSquareCdf(value, k), reference.cdf[i]![j]!, 1e-12));
  });

  it.each(dof.map((k, i) => [k, i]))('survival function matches scipy.stats.chi2.sf for dof %i', (k, i) => {
    // Down to 2e-21 (x = 90, 1 dof), where 1 - cdf would be all rounding.
    x.forEach((value, j) => expectRelative(chiSquareSurvival(value, k), reference.sf[i]![j]!, 1e-12));
  });

  it.each(dof.map((k, i) => [k, i]))('quantile matches scipy.stats.chi2.ppf for dof %i', (k, i) => {
    p.forEach((prob, j) => expectRelative(chiSquareQuantile(prob, k), reference.ppf[i]![j]!, 1e-12));
  });

  it('inverts its own cdf', () => {
    for (const k of dof) for (const prob of p) expectRelative(chiSquareCdf(chiSquareQuantile(prob, k), k), prob, 1e-12);
  });

  it('handles the ends of its domain', () => {
    expect(chiSquareCdf(0, 3)).toBe(0);
    expect(chiSquareCdf(-1, 3)).toBe(0);
    expect(chiSquareCdf(Infinity, 3)).toBe(1);
    expect(chiSquareQuantile(0, 2)).toBe(0);
    expect(chiSquareQuantile(1, 2)).toBe(Infinity);
    expect(chiSquareQuantile(1.5, 2)).toBeNaN();
    expect(chiSquareQuantile(0.5, 0)).toBeNaN();
    // Exact for 2 dof: cdf = 1 - exp(-x/2), so the quantile is -2 ln(1 - p) (textbook identity).
    expectRelative(chiSquareQuantile(0.95, 2), -2 * Math.log(0.05), 1e-14);
  });
});

describe('gamma functions (Press et al., Numerical Recipes 3rd ed., 2007, §6.1-6.2)', () => {
  it('lnGamma matches scipy.special.gammaln', () => {
    a.forEach((value, i) => expect(Math.abs(lnGamma(value) - reference.gammaln[i]!)).toBeLessThan(1e-14 * Math.max(1, Math.abs(reference.gammaln[i]!))));
  });

  it('regularizedGammaP matches scipy.special.gammainc on both sides of x = a + 1', () => {
    ax.forEach(([s, value], i) => expectRelative(regularizedGammaP(s, value), reference.gammainc[i]!, 1e-12));
  });
});

describe('normalQuantile (Wichura 1988, Applied Statistics 37, 477, AS 241)', () => {
  it('matches scipy.stats.norm.ppf from the far tail to the centre', () => {
    pn.forEach((prob, i) => {
      const expected = reference.norm[i]!;
      expect(Math.abs(normalQuantile(prob) - expected)).toBeLessThanOrEqual(1e-14 * Math.max(1, Math.abs(expected)));
    });
  });

  it('is antisymmetric and infinite at the ends', () => {
    expect(normalQuantile(0.5)).toBe(0);
    // Not bit-exact: 1 - 0.975 is 0.025 plus 2e-17 in doubles.
    expect(Math.abs(normalQuantile(0.025) + normalQuantile(0.975))).toBeLessThan(1e-14);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(-0.1)).toBeNaN();
    // Common practice: the 95% two-sided normal point is 1.959964.
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
  });
});
