/**
 * Light, value-preserving clean-up of the trees mathjs's `derivative` returns unsimplified
 * (`2 * 1 * phi ^ (2 - 1)`). mathjs's own `simplify` is not used: it applies rules that change
 * values on part of the domain (it turns `(phi^2)^(1/2)` into `phi`, `x/x` into 1), and it takes
 * tens of milliseconds per derivative. The rules here are exact in floating point except that
 * `0 * x` drops an x that could be infinite, which is what the derivative means, and
 * `a * (1 / b)` becomes the (better rounded) `a / b`.
 */
import type { BinaryOp, Expr } from './ast.ts';

const num = (value: number): Expr => ({ kind: 'num', value });
const isNum = (e: Expr, value: number): boolean => e.kind === 'num' && Object.is(e.value, value);

/** Fold number-with-number only when the result is a small integer, so `2/3` stays readable. */
function foldable(value: number): boolean {
  return Number.isInteger(value) && Math.abs(value) <= 2 ** 53;
}

export function neg(arg: Expr): Expr {
  if (arg.kind === 'num') return num(-arg.value);
  if (arg.kind === 'neg') return arg.arg;
  return { kind: 'neg', arg };
}

function op(o: BinaryOp, left: Expr, right: Expr): Expr {
  return { kind: 'op', op: o, left, right };
}

export function add(a: Expr, b: Expr): Expr {
  if (isNum(a, 0)) return b;
  if (isNum(b, 0)) return a;
  if (a.kind === 'num' && b.kind === 'num' && foldable(a.value + b.value)) return num(a.value + b.value);
  if (b.kind === 'neg') return sub(a, b.arg);
  if (a.kind === 'neg') return sub(b, a.arg);
  if (b.kind === 'num' && b.value < 0) return op('-', a, num(-b.value));
  return op('+', a, b);
}

export function sub(a: Expr, b: Expr): Expr {
  if (isNum(b, 0)) return a;
  if (isNum(a, 0)) return neg(b);
  if (a.kind === 'num' && b.kind === 'num' && foldable(a.value - b.value)) return num(a.value - b.value);
  if (b.kind === 'neg') return add(a, b.arg);
  if (b.kind === 'num' && b.value < 0) return op('+', a, num(-b.value));
  return op('-', a, b);
}

export function mul(a: Expr, b: Expr): Expr {
  if (isNum(a, 1)) return b;
  if (isNum(b, 1)) return a;
  if (isNum(a, 0) || isNum(b, 0)) return num(0);
  if (isNum(a, -1)) return neg(b);
  if (isNum(b, -1)) return neg(a);
  if (a.kind === 'num' && b.kind === 'num' && foldable(a.value * b.value)) return num(a.value * b.value);
  if (a.kind === 'neg') return neg(mul(a.arg, b));
  if (b.kind === 'neg') return neg(mul(a, b.arg));
  // a * (1 / b) -> a / b: one rounding instead of two, and how a person writes it.
  if (b.kind === 'op' && b.op === '/' && isNum(b.left, 1)) return div(a, b.right);
  if (a.kind === 'op' && a.op === '/' && isNum(a.left, 1)) return div(b, a.right);
  return op('*', a, b);
}

export function div(a: Expr, b: Expr): Expr {
  if (isNum(b, 1)) return a;
  if (isNum(a, 0) && !isNum(b, 0)) return num(0);
  if (a.kind === 'num' && b.kind === 'num' && b.value !== 0 && foldable(a.value / b.value)) {
    return num(a.value / b.value);
  }
  if (a.kind === 'neg') return neg(div(a.arg, b));
  if (b.kind === 'neg') return neg(div(a, b.arg));
  return op('/', a, b);
}

export function pow(a: Expr, b: Expr): Expr {
  if (isNum(b, 1)) return a;
  if (isNum(b, 0)) return num(1);
  if (a.kind === 'num' && b.kind === 'num' && foldable(a.value ** b.value)) return num(a.value ** b.value);
  return op('^', a, b);
}

const BUILD: Readonly<Record<BinaryOp, (a: Expr, b: Expr) => Expr>> = {
  '+': add, '-': sub, '*': mul, '/': div, '^': pow,
};

/** Rebuild bottom-up through the rules above. */
export function tidy(expr: Expr): Expr {
  switch (expr.kind) {
    case 'num':
    case 'sym':
      return expr;
    case 'neg':
      return neg(tidy(expr.arg));
    case 'call':
      return { kind: 'call', fn: expr.fn, arg: tidy(expr.arg) };
    case 'op':
      return BUILD[expr.op](tidy(expr.left), tidy(expr.right));
  }
}
