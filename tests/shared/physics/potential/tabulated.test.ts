import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../../../../shared/errors.ts';
import {
  compileTabulatedPotential,
  parseTabulatedPotential,
} from '../../../../shared/physics/potential/tabulated.ts';

// Debian's python3-scipy, the reference for the spline behind a tabulated potential.
const PYTHON = '/usr/bin/python3';
const SCIPY_SPLINE = `
import json, sys
from scipy.interpolate import CubicSpline
d = json.load(sys.stdin)
s = CubicSpline(d["x"], d["y"], bc_type="natural")
print(json.dumps([s(d["q"]).tolist(), s(d["q"], 1).tolist(), s(d["q"], 2).tolist()]))
`;

const starobinsky = (phi: number): number => (1 - Math.exp(-Math.sqrt(2 / 3) * phi)) ** 2;

describe('parseTabulatedPotential', () => {
  it('reads CSV with a header, comments, blank lines and CRLF line ends', () => {
    const text = '# Starobinsky, M_pl = 1\r\nphi,V\r\n\r\n0.5, 0.1\r\n1.0,0.3 # steep part\r\n2,5e-1\r\n3.5,  0.8\r\n';
    const table = parseTabulatedPotential(text);
    expect([...table.phi]).toEqual([0.5, 1, 2, 3.5]);
    expect([...table.V]).toEqual([0.1, 0.3, 0.5, 0.8]);
  });

  it('reads whitespace-separated columns and a header with units', () => {
    const table = parseTabulatedPotential('phi  V [M_pl^4]\n-1 2\n0\t1\n1   2.5\n +2 -3.25E-2\n');
    expect([...table.phi]).toEqual([-1, 0, 1, 2]);
    expect([...table.V]).toEqual([2, 1, 2.5, -0.0325]);
  });

  // Each message names the field, the line as an editor counts it, and the column.
  const errorCases: Array<[string, string, RegExp]> = [
    ['a non-number', 'phi,V\n0,1\n1,2\n2,3\n3,4\n4,5\n5,abc\n', /^table line 7, column 2 \(V\): "abc" is not a number$/],
    ['a non-number phi', '0,1\n1,2\n0x10,3\n3,4\n', /^table line 3, column 1 \(phi\): "0x10" is not a number$/],
    ['an empty field', '0,1\n1,\n2,3\n3,4\n', /^table line 2, column 2 \(V\): "" is not a number$/],
    ['fewer than 4 rows', '# short\n0,1\n1,2\n2,3\n', /^table: needs at least 4 rows of \(phi, V\), found 3$/],
    ['an empty text', '', /^table: needs at least 4 rows of \(phi, V\), found 0$/],
    ['a repeated phi', '0,1\n1,2\n1,3\n3,4\n', /^table line 3, column 1 \(phi\): 1 is not greater than 1 on line 2; phi must be strictly increasing$/],
    ['a decreasing phi', '0,1\n2,2\n# gap\n1,3\n3,4\n', /^table line 4, column 1 \(phi\): 1 is not greater than 2 on line 2/],
    ['V = nan', '0,1\n1,nan\n2,3\n3,4\n', /^table line 2, column 2 \(V\): "nan" is not finite$/],
    ['V = -inf', '0,1\n1,2\n2,-Inf\n3,4\n', /^table line 3, column 2 \(V\): "-Inf" is not finite$/],
    ['V overflowing a double', '0,1\n1,2\n2,1e400\n3,4\n', /^table line 3, column 2 \(V\): "1e400" is not finite$/],
    ['three columns', '0,1\n1,2,7\n2,3\n3,4\n', /^table line 2: expected 2 columns \(phi, V\), found 3$/],
    ['one column', '0,1\n1\n2,3\n3,4\n', /^table line 2: expected 2 columns \(phi, V\), found 1$/],
    ['a second header', 'phi,V\n0,1\nphi,V\n2,3\n3,4\n', /^table line 3, column 1 \(phi\): "phi" is not a number$/],
  ];
  it.each(errorCases)('rejects %s with a message naming line and column', (_name, text, message) => {
    expect(() => parseTabulatedPotential(text)).toThrow(InvalidInputError);
    expect(() => parseTabulatedPotential(text)).toThrow(message);
  });

  it('rejects more than 100000 rows, naming the first extra line', () => {
    const rows = Array.from({ length: 100_001 }, (_, i) => `${i * 1e-3},1`);
    const text = `phi,V\n${rows.join('\n')}\n`;
    expect(() => parseTabulatedPotential(text)).toThrow(/^table line 100002: more than 100000 rows/);
    expect(parseTabulatedPotential(`phi,V\n${rows.slice(1).join('\n')}`).phi.length).toBe(100_000);
  });

  it('uses the given field name in messages and on the error', () => {
    let caught: unknown;
    try {
      parseTabulatedPotential('0,1\n1,x\n', 'potential.table');
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(InvalidInputError);
    expect((caught as InvalidInputError).message).toMatch(/^potential\.table line 2, column 2 \(V\): "x" is not a number$/);
    expect((caught as InvalidInputError).field).toBe('potential.table');
  });
});

describe('compileTabulatedPotential', () => {
  const phi = Array.from({ length: 40 }, (_, i) => 0.3 + 7.7 * (i / 39) ** 1.6 + 0.01 * Math.sin(3 * i));
  const csv = `phi,V\n${phi.map((p) => `${p},${starobinsky(p)}`).join('\n')}\n`;
  const potential = compileTabulatedPotential(parseTabulatedPotential(csv));

  it('evaluates V0 times the natural spline, matching scipy CubicSpline(bc_type="natural")', () => {
    const lo = phi[0]!;
    const hi = phi[phi.length - 1]!;
    const q = Array.from({ length: 400 }, (_, i) => lo + ((hi - lo) * (i + 0.5)) / 400);
    const input = JSON.stringify({ x: phi, y: phi.map(starobinsky), q });
    // Source: SciPy (Virtanen et al., Nature Methods 2020), scipy.interpolate.CubicSpline.
    const reference = JSON.parse(execFileSync(PYTHON, ['-c', SCIPY_SPLINE], { input, encoding: 'utf8' })) as number[][];
    const V0 = 2.5e-10;
    const out = new Float64Array(3);
    for (let k = 0; k < 3; k++) {
      const ref = reference[k]!;
      // Relative to the largest magnitude: V'' crosses zero at the inflection point.
      const scale = V0 * Math.max(...ref.map(Math.abs));
      q.forEach((p, i) => {
        potential.evaluate(p, Float64Array.of(V0), out);
        expect(Math.abs(out[k]! - V0 * ref[i]!)).toBeLessThan(1e-12 * scale);
      });
    }
  });

  it('has V0 as its only parameter, defaulting to 1, and describes the table', () => {
    expect(potential.parameterNames).toEqual(['V0']);
    const withDefault = new Float64Array(3);
    const withOne = new Float64Array(3);
    potential.evaluate(4, new Float64Array(0), withDefault);
    potential.evaluate(4, Float64Array.of(1), withOne);
    expect([...withDefault]).toEqual([...withOne]);
    const range = `table of 40 points, phi in [${phi[0]}, ${phi[39]}]`;
    expect(potential.formula).toEqual({
      V: `V0 * spline(${range})`,
      dV: `V0 * spline'(${range})`,
      d2V: `V0 * spline''(${range})`,
    });
  });

  it('gives non-finite values outside the table, so the integrator fails the point', () => {
    const out = new Float64Array(3);
    potential.evaluate(phi[39]! + 0.1, Float64Array.of(1), out);
    expect([...out].some(Number.isFinite)).toBe(false);
    potential.evaluate(0, Float64Array.of(1), out);
    expect([...out].some(Number.isFinite)).toBe(false);
  });
});
