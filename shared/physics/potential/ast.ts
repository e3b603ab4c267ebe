/**
 * The small expression tree the compiler works on. A user's mathjs tree is converted into this
 * form only after every node has passed the whitelist (see syntax.ts), and mathjs trees handed to
 * `derivative` are rebuilt from it, so nothing the user's text produced (extra properties, custom
 * node types) travels further than the checker.
 */
import { ConstantNode, FunctionNode, OperatorNode, SymbolNode, type MathNode } from 'mathjs/number';

export type BinaryOp = '+' | '-' | '*' | '/' | '^';

export type Expr =
  | { readonly kind: 'num'; readonly value: number }
  /** `phi`, `pi`, `e` or a declared parameter. */
  | { readonly kind: 'sym'; readonly name: string }
  | { readonly kind: 'neg'; readonly arg: Expr }
  | { readonly kind: 'op'; readonly op: BinaryOp; readonly left: Expr; readonly right: Expr }
  | { readonly kind: 'call'; readonly fn: FunctionName; readonly arg: Expr };

interface FunctionSpec {
  /** JavaScript for the call, built only from the argument's generated code. */
  readonly js: (arg: string) => string;
  /** Same function for folding constant subtrees at compile time. */
  readonly value: (x: number) => number;
}

/**
 * Every function the generated code can call. The first group is what users may write; `sec` and
 * `sech` only arise as mathjs's derivatives of tan and tanh. `pow(a, b)` is accepted by the checker
 * but becomes `a ^ b`, so it needs no entry.
 */
export const FUNCTIONS = {
  exp: { js: (a) => `Math.exp(${a})`, value: Math.exp },
  log: { js: (a) => `Math.log(${a})`, value: Math.log },
  log10: { js: (a) => `Math.log10(${a})`, value: Math.log10 },
  sqrt: { js: (a) => `Math.sqrt(${a})`, value: Math.sqrt },
  sin: { js: (a) => `Math.sin(${a})`, value: Math.sin },
  cos: { js: (a) => `Math.cos(${a})`, value: Math.cos },
  tan: { js: (a) => `Math.tan(${a})`, value: Math.tan },
  atan: { js: (a) => `Math.atan(${a})`, value: Math.atan },
  sinh: { js: (a) => `Math.sinh(${a})`, value: Math.sinh },
  cosh: { js: (a) => `Math.cosh(${a})`, value: Math.cosh },
  tanh: { js: (a) => `Math.tanh(${a})`, value: Math.tanh },
  asinh: { js: (a) => `Math.asinh(${a})`, value: Math.asinh },
  abs: { js: (a) => `Math.abs(${a})`, value: Math.abs },
  sec: { js: (a) => `1 / Math.cos(${a})`, value: (x) => 1 / Math.cos(x) },
  sech: { js: (a) => `1 / Math.cosh(${a})`, value: (x) => 1 / Math.cosh(x) },
} satisfies Record<string, FunctionSpec>;

export type FunctionName = keyof typeof FUNCTIONS;

/** What a user may call, in the order error messages list them. */
export const USER_FUNCTIONS: readonly string[] = [
  'exp', 'log', 'log10', 'sqrt', 'sin', 'cos', 'tan', 'atan',
  'sinh', 'cosh', 'tanh', 'asinh', 'abs', 'pow',
];
/** Functions that only mathjs's derivative introduces. */
export const DERIVATIVE_FUNCTIONS: readonly string[] = ['sec', 'sech'];

export const CONSTANTS: Readonly<Record<string, number>> = { pi: Math.PI, e: Math.E };

export function isFunctionName(name: string): name is FunctionName {
  return Object.hasOwn(FUNCTIONS, name);
}

const OP_FN = { '+': 'add', '-': 'subtract', '*': 'multiply', '/': 'divide', '^': 'pow' } as const;

/** Fresh mathjs nodes for `derivative` and `toString`; built from checked data only. */
export function toMathNode(expr: Expr): MathNode {
  switch (expr.kind) {
    case 'num':
      return new ConstantNode(expr.value);
    case 'sym':
      return new SymbolNode(expr.name);
    case 'neg':
      return new OperatorNode('-', 'unaryMinus', [toMathNode(expr.arg)]);
    case 'op':
      return new OperatorNode(expr.op, OP_FN[expr.op], [toMathNode(expr.left), toMathNode(expr.right)]);
    case 'call':
      return new FunctionNode(new SymbolNode(expr.fn), [toMathNode(expr.arg)]);
  }
}
