/**
 * JavaScript source for an evaluator, generated from checked trees only. Every token comes from
 * this file: `phi`, `p[i]` (i an index we computed), `Math.*` names from the fixed table in
 * ast.ts, numbers we format ourselves, operators and our own temporaries `t0, t1, ...`.
 *
 * Each compound node becomes one `const`; identical code (after ordering the operands of + and *,
 * which is exact in floating point) reuses the earlier temporary. That is common-subexpression
 * elimination across V, V' and V'' — mathjs's derivatives repeat the same exp(...) or power many
 * times — and it is what lets a compiled custom potential run close to a hand-written one.
 */
import { InvalidInputError } from '../../errors.ts';
import { CONSTANTS, FUNCTIONS, toMathNode, type Expr } from './ast.ts';

interface Value {
  readonly code: string;
  /** Set when the subtree depends on neither phi nor a parameter: folded at compile time. */
  readonly constant?: number;
}

/** A number as a JavaScript literal; only finite values ever reach the generated code. */
function literal(value: number): string {
  if (!Number.isFinite(value)) throw new Error(`internal: non-finite literal ${value}`);
  if (Object.is(value, -0)) return '(-0)';
  return value < 0 ? `(${String(value)})` : String(value);
}

class Emitter {
  private readonly lines: { readonly name: string; readonly code: string }[] = [];
  private readonly temps = new Map<string, string>();
  /** Temporaries of the form `c * x` (c a literal) or `-x`, so that negating them is canonical. */
  private readonly forms = new Map<string, { readonly coef: number; readonly rest: string }>();

  constructor(
    private readonly parameterNames: readonly string[],
    private readonly field: string,
  ) {}

  /** Declarations that the given results depend on, in order (folding leaves some unused). */
  declarations(results: readonly string[]): string[] {
    const used = new Set(results);
    const kept: string[] = [];
    for (let i = this.lines.length - 1; i >= 0; i--) {
      const line = this.lines[i];
      if (line === undefined || !used.has(line.name)) continue;
      for (const ref of line.code.match(/\bt\d+\b/g) ?? []) used.add(ref);
      kept.push(`const ${line.name} = ${line.code};`);
    }
    return kept.reverse();
  }

  private bind(code: string): Value {
    let name = this.temps.get(code);
    if (name === undefined) {
      name = `t${this.temps.size}`;
      this.temps.set(code, name);
      this.lines.push({ name, code });
    }
    return { code: name };
  }

  private constant(value: number, expr: Expr): Value {
    if (!Number.isFinite(value)) {
      throw new InvalidInputError(
        `${this.field}: the constant part "${toMathNode(expr).toString()}" evaluates to ${value}`,
        this.field, 'invalid_expression');
    }
    return { code: literal(value), constant: value };
  }

  value(expr: Expr): Value {
    switch (expr.kind) {
      case 'num':
        return this.constant(expr.value, expr);
      case 'sym': {
        if (expr.name === 'phi') return { code: 'phi' };
        const index = this.parameterNames.indexOf(expr.name);
        if (index >= 0) return this.bind(`p[${index}]`);
        const value = CONSTANTS[expr.name];
        if (value === undefined) throw new Error(`internal: unchecked symbol reached codegen`);
        return this.constant(value, expr);
      }
      case 'neg':
        return this.negate(this.value(expr.arg), expr);
      case 'call': {
        const a = this.value(expr.arg);
        const spec = FUNCTIONS[expr.fn];
        return a.constant !== undefined ? this.constant(spec.value(a.constant), expr) : this.bind(spec.js(a.code));
      }
      case 'op':
        return this.operation(expr, this.value(expr.left), this.value(expr.right));
    }
  }

  /**
   * -(c * x) is emitted as (-c) * x and -(-x) as x — both exact — so that `-sqrt(2/3)*phi` from the
   * user and `-(sqrt(2/3)*phi)` from mathjs's derivative share one temporary (and one exp).
   */
  private negate(a: Value, expr: Expr): Value {
    if (a.constant !== undefined) return this.constant(-a.constant, expr);
    const form = this.forms.get(a.code);
    if (form === undefined) return this.scaled(-1, a.code);
    if (form.coef === -1) return { code: form.rest };
    return this.scaled(-form.coef, form.rest);
  }

  private scaled(coef: number, rest: string): Value {
    const result = this.bind(coef === -1 ? `-${rest}` : `${literal(coef)} * ${rest}`);
    this.forms.set(result.code, { coef, rest });
    return result;
  }

  private operation(expr: Expr & { kind: 'op' }, a: Value, b: Value): Value {
    if (a.constant !== undefined && b.constant !== undefined) {
      const x = a.constant;
      const y = b.constant;
      const folded = { '+': x + y, '-': x - y, '*': x * y, '/': x / y, '^': x ** y }[expr.op];
      return this.constant(folded, expr);
    }
    switch (expr.op) {
      case '*':
        if (a.constant !== undefined) return this.scaled(a.constant, b.code);
        if (b.constant !== undefined) return this.scaled(b.constant, a.code);
        return this.bind([a.code, b.code].sort().join(' * '));
      case '+': {
        return this.bind([a.code, b.code].sort().join(' + '));
      }
      case '-':
      case '/':
        return this.bind(`${a.code} ${expr.op} ${b.code}`);
      case '^':
        return b.constant !== undefined ? this.power(a, b.constant) : this.bind(`${a.code} ** ${b.code}`);
    }
  }

  /** Small integer and half-integer powers by multiplication and sqrt, far cheaper than `**`. */
  private power(base: Value, k: number): Value {
    const square = (): Value => this.bind(`${base.code} * ${base.code}`);
    switch (k) {
      case 2: return square();
      case 3: return this.bind(`${square().code} * ${base.code}`);
      case 4: return this.bind(`${square().code} * ${square().code}`);
      case 0.5: return this.bind(`Math.sqrt(${base.code})`);
      case -0.5: return this.bind(`1 / ${this.power(base, 0.5).code}`);
      case -1: return this.bind(`1 / ${base.code}`);
      case -2:
      case -3:
      case -4: return this.bind(`1 / ${this.power(base, -k).code}`);
      default: return this.bind(`${base.code} ** ${literal(k)}`);
    }
  }
}

/**
 * Statements that read `phi` and the parameters (`p[index in parameterNames]`) and declare
 * `const <locals[i]> = outputs[i]`: the potential's part of the functions portable.ts and the
 * background equations build around them. Only this file's tokens appear in them.
 */
export function generateStatements(outputs: readonly Expr[], parameterNames: readonly string[], field: string, locals: readonly string[]): string {
  const emitter = new Emitter(parameterNames, field);
  const results = outputs.map((expr) => emitter.value(expr).code);
  return [...emitter.declarations(results), ...results.map((code, i) => `const ${locals[i]} = ${code};`)].join('\n');
}
