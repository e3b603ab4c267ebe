/**
 * The whitelist: turns a mathjs tree into an `Expr`, or throws a message that says what was found
 * and what is allowed. Anything not named here (assignments, property access, strings, matrices,
 * conditionals, ...) is rejected, so later stages never see it.
 */
import type { MathNode } from 'mathjs/number';
import { InvalidInputError } from '../../errors.ts';
import { CONSTANTS, DERIVATIVE_FUNCTIONS, USER_FUNCTIONS, isFunctionName, type BinaryOp, type Expr } from './ast.ts';

export interface CheckContext {
  readonly parameterNames: readonly string[];
  readonly field: string;
  /** Trees from mathjs's `derivative` may also use sec and sech. */
  readonly derivative: boolean;
  /**
   * Most nodes the tree may have. Derivatives of deeply nested input grow polynomially with the
   * depth, so this keeps compile time and formula size bounded for hostile input.
   */
  readonly maxNodes: number;
  /** Deepest nesting allowed, so that every later (recursive) stage stays well inside the stack. */
  readonly maxDepth: number;
}

const OPERATORS = 'binary + - * / ^, unary - and +, implicit multiplication';

const WHAT: Readonly<Record<string, string>> = {
  AccessorNode: 'property access or indexing',
  AssignmentNode: 'an assignment',
  FunctionAssignmentNode: 'a function definition',
  ArrayNode: 'a matrix or array',
  ObjectNode: 'an object',
  RangeNode: 'a range',
  ConditionalNode: 'a conditional (? :)',
  RelationalNode: 'a comparison',
  BlockNode: 'several statements (; or a new line)',
  IndexNode: 'an index',
};

// Loosely typed view of a mathjs node: the fields read below, checked before use.
interface AnyNode {
  type: string;
  value?: unknown;
  name?: string;
  op?: string;
  fn?: unknown;
  args?: AnyNode[];
  content?: AnyNode;
  toString(): string;
}

export function checkTree(node: MathNode, ctx: CheckContext): Expr {
  return check(node as unknown as AnyNode, { ...ctx, remaining: ctx.maxNodes, depth: 0 });
}

/** The context plus the node count and current depth of the walk. */
type Walk = CheckContext & { remaining: number; depth: number };

function fail(ctx: CheckContext, message: string): never {
  throw new InvalidInputError(`${ctx.field}: ${message}`, ctx.field, 'invalid_expression');
}

function check(node: AnyNode, ctx: Walk): Expr {
  if (--ctx.remaining < 0) {
    const what = ctx.derivative ? 'its derivatives have' : 'it has';
    fail(ctx, `the expression is too complex to compile (${what} more than ${ctx.maxNodes} terms)`);
  }
  if (ctx.depth >= ctx.maxDepth) fail(ctx, `the expression is nested too deeply (more than ${ctx.maxDepth} levels)`);
  ctx.depth++;
  try {
    return checkNode(node, ctx);
  } finally {
    ctx.depth--;
  }
}

function checkNode(node: AnyNode, ctx: Walk): Expr {
  switch (node.type) {
    case 'ParenthesisNode':
      return check(node.content as AnyNode, ctx);
    case 'ConstantNode':
      return checkConstant(node, ctx);
    case 'SymbolNode':
      return checkSymbol(String(node.name), ctx);
    case 'OperatorNode':
      return checkOperator(node, ctx);
    case 'FunctionNode':
      return checkFunction(node, ctx);
    default: {
      const what = WHAT[node.type] ?? `a ${node.type}`;
      return fail(ctx, `${what} is not allowed ("${node.toString()}"); ` +
        `an expression may use numbers, phi, pi, e, the declared parameters, ${OPERATORS} and the functions ${USER_FUNCTIONS.join(', ')}`);
    }
  }
}

function checkConstant(node: AnyNode, ctx: CheckContext): Expr {
  const value = node.value;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) fail(ctx, `${String(value)} is not a finite number`);
    return { kind: 'num', value };
  }
  if (typeof value === 'string') return fail(ctx, `strings are not allowed (${node.toString()}); only numbers`);
  return fail(ctx, `the literal ${String(value)} is not allowed; only finite numbers`);
}

function checkSymbol(name: string, ctx: CheckContext): Expr {
  if (name === 'phi' || Object.hasOwn(CONSTANTS, name) || ctx.parameterNames.includes(name)) {
    return { kind: 'sym', name };
  }
  const declared = ctx.parameterNames.length > 0 ? ctx.parameterNames.join(', ') : 'none';
  return fail(ctx, `unknown symbol "${name}"; allowed are phi, pi, e and the declared parameters (${declared})`);
}

const BINARY: Readonly<Record<string, BinaryOp>> = {
  add: '+', subtract: '-', multiply: '*', divide: '/', pow: '^',
};

function checkOperator(node: AnyNode, ctx: Walk): Expr {
  const args = node.args ?? [];
  const [a, b] = args;
  const fn = String(node.fn);
  const op = BINARY[fn];
  if (op !== undefined && args.length === 2 && a !== undefined && b !== undefined && node.op === op) {
    return { kind: 'op', op, left: check(a, ctx), right: check(b, ctx) };
  }
  if (args.length === 1 && a !== undefined) {
    if (fn === 'unaryMinus' && node.op === '-') return { kind: 'neg', arg: check(a, ctx) };
    if (fn === 'unaryPlus' && node.op === '+') return check(a, ctx);
  }
  return fail(ctx, `the operator "${String(node.op)}" is not allowed ("${node.toString()}"); allowed: ${OPERATORS}`);
}

function checkFunction(node: AnyNode, ctx: Walk): Expr {
  const callee = node.fn as AnyNode | undefined;
  if (callee?.type !== 'SymbolNode' || typeof callee.name !== 'string') {
    return fail(ctx, `only named functions can be called ("${node.toString()}")`);
  }
  const name = callee.name;
  const args = node.args ?? [];
  const allowed = USER_FUNCTIONS.includes(name) || (ctx.derivative && DERIVATIVE_FUNCTIONS.includes(name));
  if (!allowed) {
    if (name === 'phi' || ctx.parameterNames.includes(name)) {
      fail(ctx, `"${name}(...)" calls ${name} as a function; write ${name}*(...) to multiply`);
    }
    fail(ctx, `unknown function "${name}"; allowed functions: ${USER_FUNCTIONS.join(', ')}`);
  }
  if (name === 'pow') {
    const [base, exponent] = args;
    if (args.length !== 2 || base === undefined || exponent === undefined) {
      fail(ctx, `pow takes two arguments, pow(base, exponent); found ${args.length}`);
    }
    return { kind: 'op', op: '^', left: check(base, ctx), right: check(exponent, ctx) };
  }
  const [arg] = args;
  if (args.length !== 1 || arg === undefined || !isFunctionName(name)) {
    const hint = name === 'log' ? ' (natural logarithm; for base b write log(x)/log(b))' : '';
    return fail(ctx, `${name} takes one argument${hint}; found ${args.length} in "${node.toString()}"`);
  }
  return { kind: 'call', fn: name, arg: check(arg, ctx) };
}
