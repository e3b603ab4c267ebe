/**
 * Compiles a potential V(phi) written as a mathjs expression into a `CompiledPotential`.
 * The user's text is only ever given to mathjs's parser; the tree is checked against a whitelist
 * (syntax.ts), differentiated symbolically, and turned into JavaScript that we generate token by
 * token (codegen.ts), so no part of the user's text is evaluated as code.
 */
import { derivative, parse, type MathNode } from 'mathjs/number';
import { InvalidInputError } from '../../errors.ts';
import { CONSTANTS, FUNCTIONS, USER_FUNCTIONS, toMathNode, type Expr } from './ast.ts';
import { generateStatements } from './codegen.ts';
import { evaluatorFromCode, POTENTIAL_LOCALS } from './portable.ts';
import { checkTree } from './syntax.ts';
import { tidy } from './tidy.ts';
import type { CompiledPotential } from './types.ts';

/** A potential compiled from an expression, with the body of `evaluate` for rebuilding it in another thread. */
/** `code`: the generated statements that declare V, dV and d2V (codegen.ts, portable.ts). */
export type GeneratedPotential = CompiledPotential & { readonly code: string };

/** Far above any real potential; keeps parsing and differentiation of hostile input bounded. */
export const MAX_EXPRESSION_LENGTH = 2000;
/** Node budgets for V' and V'' trees (a realistic potential needs a few hundred). */
const MAX_DERIVATIVE_NODES = [20_000, 100_000] as const;
/** Nesting of the user's tree; derivatives nest a few times deeper, still far inside the stack. */
const MAX_DEPTH = 200;

const IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]{0,63}$/;
/** Words mathjs reads as operators next to an operand (`phi mod 2`, `phi to cm`). */
const KEYWORDS = ['and', 'or', 'not', 'xor', 'mod', 'to', 'in'];

/**
 * Parameter names must be plain identifiers that mathjs reads as symbols and that cannot be
 * mistaken for phi, a constant or a function; names of Object.prototype members are refused so a
 * parameter can never alias `constructor` or `__proto__` in the plain objects that carry values.
 */
export function checkParameterNames(names: readonly string[], field = 'parameters'): void {
  const fail = (message: string): never => {
    throw new InvalidInputError(`${field}: ${message}`, field, 'invalid_parameter');
  };
  const seen = new Set<string>();
  for (const name of names) {
    if (typeof name !== 'string' || !IDENTIFIER.test(name)) {
      fail(`"${String(name)}" is not a valid name (letters, digits and _, not starting with a digit, at most 64)`);
    }
    if (name === 'phi' || Object.hasOwn(CONSTANTS, name)) fail(`"${name}" is reserved (phi, pi and e are built in)`);
    if (USER_FUNCTIONS.includes(name) || Object.hasOwn(FUNCTIONS, name)) fail(`"${name}" is the name of a function`);
    if (name in Object.prototype || name === '__proto__' || name === 'prototype') {
      fail(`"${name}" is not allowed as a parameter name`);
    }
    if (KEYWORDS.includes(name) || !readsAsSymbol(name)) fail(`"${name}" is a keyword or literal of the expression language`);
    if (seen.has(name)) fail(`"${name}" is declared twice`);
    seen.add(name);
  }
}

function readsAsSymbol(name: string): boolean {
  try {
    const node = parse(name);
    return node.type === 'SymbolNode' && (node as MathNode & { name: string }).name === name;
  } catch {
    return false;
  }
}

function parseSource(source: string, field: string): MathNode {
  const fail = (message: string): never => {
    throw new InvalidInputError(`${field}: ${message}`, field, 'invalid_expression');
  };
  if (typeof source !== 'string' || source.trim() === '') return fail('the expression is empty');
  if (source.length > MAX_EXPRESSION_LENGTH) {
    fail(`the expression is ${source.length} characters long; at most ${MAX_EXPRESSION_LENGTH} are allowed`);
  }
  try {
    return parse(source);
  } catch (err) {
    const position = (err as { char?: unknown }).char;
    if (err instanceof SyntaxError && typeof position === 'number') {
      const reason = err.message.replace(/\s*\(char \d+\)\s*$/, '');
      const near = source.slice(Math.max(0, position - 1), position + 9);
      return fail(`syntax error at character ${position} (near "${near}"): ${reason}`);
    }
    if (err instanceof RangeError) throw err; // reported as "nested too deeply" by compileExpression
    return fail(`the expression cannot be parsed: ${(err as Error).message}`);
  }
}

function differentiate(expr: Expr, parameterNames: readonly string[], field: string, maxNodes: number): Expr {
  // simplify: false — see tidy.ts for why mathjs's simplifier is not used.
  const raw = derivative(toMathNode(expr), 'phi', { simplify: false });
  return tidy(checkTree(raw, { parameterNames, field, derivative: true, maxNodes, maxDepth: 20 * MAX_DEPTH }));
}

/**
 * Compile `source` (V as a function of `phi` and the named parameters) with V' and V'' from
 * symbolic differentiation. `parameterNames` gives the order of the `params` vector. If `V0` is
 * not among them it is appended and the whole expression is multiplied by it, so that every
 * compiled potential carries its overall scale as `CompiledPotential` promises.
 */
export function compileExpression(
  source: string,
  parameterNames: readonly string[],
  field = 'expression',
): GeneratedPotential {
  checkParameterNames(parameterNames);
  try {
    return compile(source, parameterNames, field);
  } catch (err) {
    // Deep nesting (e.g. a long run of unary minus) can exhaust the stack in any recursive stage.
    if (err instanceof RangeError) {
      throw new InvalidInputError(`${field}: the expression is nested too deeply`, field, 'invalid_expression');
    }
    throw err;
  }
}

function compile(source: string, parameterNames: readonly string[], field: string): GeneratedPotential {
  const names = parameterNames.includes('V0') ? [...parameterNames] : [...parameterNames, 'V0'];
  const ctx = { parameterNames: names, field, derivative: false, maxNodes: MAX_EXPRESSION_LENGTH, maxDepth: MAX_DEPTH };
  const checked = checkTree(parseSource(source, field), ctx);
  const V: Expr = names.length === parameterNames.length
    ? checked
    : { kind: 'op', op: '*', left: { kind: 'sym', name: 'V0' }, right: checked };
  const dV = differentiate(V, names, field, MAX_DERIVATIVE_NODES[0]);
  const d2V = differentiate(dV, names, field, MAX_DERIVATIVE_NODES[1]);
  const code = generateStatements([V, dV, d2V], names, field, POTENTIAL_LOCALS);
  return {
    parameterNames: names,
    evaluate: evaluatorFromCode(code),
    code,
    formula: { V: toMathNode(V).toString(), dV: toMathNode(dV).toString(), d2V: toMathNode(d2V).toString() },
  };
}
