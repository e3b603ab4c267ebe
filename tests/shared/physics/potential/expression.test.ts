import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../../../../shared/errors.ts';
import { checkParameterNames, compileExpression } from '../../../../shared/physics/potential/expression.ts';
import type { CompiledPotential } from '../../../../shared/physics/potential/types.ts';

function evaluate(c: CompiledPotential, phi: number, params: readonly number[]): [number, number, number] {
  const out = new Float64Array(3);
  c.evaluate(phi, Float64Array.from(params), out);
  return [out[0] ?? NaN, out[1] ?? NaN, out[2] ?? NaN];
}

/** The InvalidInputError thrown by `fn`, so tests can assert its message and field. */
function rejection(fn: () => unknown): InvalidInputError {
  try {
    fn();
  } catch (err) {
    if (err instanceof InvalidInputError) return err;
    throw err;
  }
  throw new Error('expected an InvalidInputError');
}

describe('compileExpression: what it accepts', () => {
  it('evaluates V, V\' and V\'\' of a polynomial (derivatives by hand)', () => {
    const c = compileExpression('a*phi^3 + 2 phi - 1', ['a', 'V0']);
    expect(c.parameterNames).toEqual(['a', 'V0']);
    // V = a phi^3 + 2 phi - 1, V' = 3 a phi^2 + 2, V'' = 6 a phi (V0 declared but unused)
    expect(evaluate(c, 2, [0.5, 7])).toEqual([7, 8, 6]);
  });

  it('appends V0 as an overall factor when it is not declared', () => {
    const c = compileExpression('phi^2', []);
    expect(c.parameterNames).toEqual(['V0']);
    expect(evaluate(c, 3, [2])).toEqual([18, 12, 4]);
    expect(c.formula.V).toBe('V0 * phi ^ 2');
  });

  it('knows pi and e, unary + and -, pow() and a constant potential', () => {
    const c = compileExpression('pi * phi + e - (+phi) + pow(phi, 2) * -1', ['V0']);
    const [V, dV, d2V] = evaluate(c, 2, [1]);
    expect(V).toBeCloseTo(Math.PI * 2 + Math.E - 2 - 4, 14);
    expect(dV).toBeCloseTo(Math.PI - 1 - 4, 14);
    expect(d2V).toBe(-2);
    expect(evaluate(compileExpression('3', ['V0']), 1, [1])).toEqual([3, 0, 0]);
  });

  it('returns formulas that parse back to the same functions', () => {
    const source = 'V0 * (phi^2)^3 / (1 + phi)^-2 - 2^phi^2 + -phi^2 + (-phi)^2 + exp(-(phi - 1)^2)';
    const c = compileExpression(source, ['V0']);
    [c.formula.V, c.formula.dV, c.formula.d2V].forEach((formula, i) => {
      const again = compileExpression(formula, ['V0']);
      for (const phi of [0.3, 1.1]) {
        const want = evaluate(c, phi, [1.7])[i] ?? NaN;
        expect(evaluate(again, phi, [1.7])[0]).toBeCloseTo(want, 10);
      }
    });
  });

  it('returns readable formulas for V and its derivatives', () => {
    const c = compileExpression('V0 * exp(-lambda * phi)', ['V0', 'lambda']);
    expect(c.formula).toEqual({
      V: 'V0 * exp(-lambda * phi)',
      dV: '-(V0 * lambda * exp(-(lambda * phi)))',
      d2V: 'V0 * lambda * lambda * exp(-(lambda * phi))',
    });
  });

  // Central differences (common practice): error O(h^2 f''') + O(eps f / h); with h = 1e-5 both
  // are ~1e-10 relative for these smooth functions, so 1e-7 leaves a wide margin.
  it('matches central finite differences with every allowed function', () => {
    const source = 'exp(-phi) + log(phi) + log10(phi) + sqrt(phi) + sin(phi) + cos(phi) + tan(phi/3)' +
      ' + atan(phi) + sinh(phi) + cosh(phi) + tanh(phi) + asinh(phi) + abs(phi - 3) + pow(phi, 3)' +
      ' + 2^phi + phi^phi + phi^-2 + phi^0.5 + phi^-0.5 + phi^4';
    const c = compileExpression(source, ['V0']);
    const h = 1e-5;
    for (const phi of [0.7, 1.3, 2.1]) {
      const [, dV, d2V] = evaluate(c, phi, [1]);
      const [Vp, dVp] = evaluate(c, phi + h, [1]);
      const [Vm, dVm] = evaluate(c, phi - h, [1]);
      expect(Math.abs((Vp - Vm) / (2 * h) - dV)).toBeLessThan(1e-7 * Math.abs(dV));
      expect(Math.abs((dVp - dVm) / (2 * h) - d2V)).toBeLessThan(1e-7 * Math.abs(d2V));
    }
  });
});

describe('compileExpression: what it rejects', () => {
  const cases: [string, RegExp][] = [
    ['constructor', /unknown symbol "constructor".*phi, pi, e and the declared parameters \(alpha, V0\)/],
    ['phi.constructor', /property access or indexing is not allowed/],
    ['phi[1]', /property access or indexing is not allowed/],
    ['x = 1', /an assignment is not allowed/],
    ['f(x) = x', /a function definition is not allowed/],
    ['unknownFn(phi)', /unknown function "unknownFn"; allowed functions: exp, log, log10, sqrt, .*abs, pow/],
    ['alpha(phi)', /calls alpha as a function; write alpha\*\(\.\.\.\) to multiply/],
    ['beta*phi', /unknown symbol "beta"/],
    ['"str"', /strings are not allowed/],
    ['[1,2]', /a matrix or array is not allowed/],
    ['{a:1}', /an object is not allowed/],
    ['1:3', /a range is not allowed/],
    ['phi > 1 ? 1 : 0', /a conditional \(\? :\) is not allowed/],
    ['phi > 1', /the operator ">" is not allowed.*allowed: binary \+ - \* \/ \^/],
    ['1 < phi < 2', /a comparison is not allowed/],
    ['phi; phi', /several statements/],
    ['phi\nphi', /several statements/],
    ['phi!', /the operator "!" is not allowed/],
    ['phi mod 2', /the operator "mod" is not allowed/],
    ["phi'", /the operator "'" is not allowed/],
    ['log(phi, 2)', /log takes one argument \(natural logarithm; for base b write log\(x\)\/log\(b\)\); found 2/],
    ['pow(phi)', /pow takes two arguments/],
    ['sec(phi)', /unknown function "sec"/],
    ['NaN * phi', /NaN is not a finite number/],
    ['Infinity', /Infinity is not a finite number/],
    ['1e400 * phi', /Infinity is not a finite number/],
    ['true', /the literal true is not allowed/],
    ['5 cm', /unknown symbol "cm"/],
    ['log(0) * phi', /the constant part "log\(0\)" evaluates to -Infinity/],
    ['', /the expression is empty/],
    ['   ', /the expression is empty/],
    ['phi +* 2', /syntax error at character 6 \(near "\* 2"\): Value expected/],
    ['phi + '.repeat(400) + '1', /2401 characters long; at most 2000 are allowed/],
    ['('.repeat(990) + 'phi' + ')'.repeat(990), /nested too deeply/],
    ['-'.repeat(300) + 'phi', /nested too deeply \(more than 200 levels\)/],
    [Array(400).fill('(phi + 1)').join(' * ').slice(0, 1990), /too complex to compile \(its derivatives have more than 20000 terms\)/],
  ];
  it.each(cases)('rejects %j', (source, message) => {
    const err = rejection(() => compileExpression(source, ['alpha']));
    expect(err.message).toMatch(message);
    expect(err.field).toBe('expression');
    expect(err.code).toBe('invalid_expression');
  });

  it('rejects an undeclared parameter and lists the declared ones', () => {
    const err = rejection(() => compileExpression('alpha*phi', ['mu']));
    expect(err.message).toMatch(/unknown symbol "alpha"; allowed are phi, pi, e and the declared parameters \(mu, V0\)/);
  });

  it('names the field it was given', () => {
    expect(rejection(() => compileExpression('phi +', [], 'plan.potential')).field).toBe('plan.potential');
  });
});

describe('parameter names', () => {
  it.each([
    ['phi', /"phi" is reserved/], ['pi', /"pi" is reserved/], ['e', /"e" is reserved/],
    ['exp', /name of a function/], ['pow', /name of a function/], ['sech', /name of a function/],
    ['constructor', /not allowed as a parameter name/], ['__proto__', /not allowed as a parameter name/],
    ['toString', /not allowed as a parameter name/], ['1a', /not a valid name/], ['a-b', /not a valid name/],
    ['true', /keyword or literal/], ['NaN', /keyword or literal/], ['mod', /keyword or literal/], ['in', /keyword or literal/],
  ])('rejects %j', (name, message) => {
    const err = rejection(() => checkParameterNames([name]));
    expect(err.message).toMatch(message);
    expect(err.field).toBe('parameters');
  });

  it('rejects duplicates and accepts ordinary names', () => {
    expect(rejection(() => checkParameterNames(['mu', 'mu'])).message).toMatch(/"mu" is declared twice/);
    expect(() => checkParameterNames(['alpha', 'gamma', 'i', 'E', 'mu_2'])).not.toThrow();
  });

  it('keeps user identifiers out of the generated code', () => {
    const c = compileExpression('alpha * phi^2 + gamma_1 * exp(-E * phi)', ['alpha', 'gamma_1', 'E']);
    const code = c.evaluate.toString();
    expect(code).not.toMatch(/alpha|gamma_1|\bE\b/);
    expect(code).toContain('p[0]');
    // Every identifier left once numbers are removed is ours: phi, p, out, Math.*, temporaries,
    // and the locals V, dV, d2V that the generated statements declare (POTENTIAL_LOCALS).
    const identifiers = code.replace(/(?<![\w$])\d+(\.\d*)?(e[+-]?\d+)?/g, '0').match(/[A-Za-z_$][\w$]*/g) ?? [];
    const ours = /^(phi|p|out|Math|exp|function|anonymous|const|use|strict|t\d+|V|dV|d2V)$/;
    expect(identifiers.filter((id) => !ours.test(id))).toEqual([]);
  });

  it('reads parameters named like its own locals from p, never from the locals', () => {
    // Parameters named dV and d2V: V = dV phi^2 + d2V, V' = 2 dV phi, V'' = 2 dV (times V0 = 1).
    const c = compileExpression('dV * phi^2 + d2V', ['dV', 'd2V']);
    expect(c.parameterNames).toEqual(['dV', 'd2V', 'V0']);
    const out = new Float64Array(3);
    c.evaluate(2, new Float64Array([3, 5, 1]), out);
    expect([...out]).toEqual([17, 12, 6]);
  });
});
