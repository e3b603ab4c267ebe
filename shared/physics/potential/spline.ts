import { InvalidInputError } from '../../errors.ts';

/**
 * A natural cubic spline through (x_i, y_i): piecewise cubic with continuous value, first and
 * second derivative, and S'' = 0 at both ends (de Boor, A Practical Guide to Splines, 1978, ch. IV).
 * The integrator needs V'' to be continuous, which rules out cheaper interpolants.
 */
export interface NaturalSpline {
  /** Table range; evaluate() returns NaN outside [xMin, xMax]. */
  readonly xMin: number;
  readonly xMax: number;
  readonly size: number;
  /**
   * Writes S(x), S'(x), S''(x) to out[offset], out[offset + 1], out[offset + 2]. Outside the table
   * (or for NaN x) all three are NaN: the integrator already treats non-finite values as a failed
   * point, and silently extrapolating a cubic would invent a potential the user never gave.
   */
  evaluate(x: number, out: Float64Array, offset?: number): void;
}

/**
 * Builds the spline. x must be strictly increasing with at least 2 finite samples; the arrays are
 * copied, so later changes by the caller do not move the spline.
 */
export function createNaturalSpline(x: Float64Array, y: Float64Array): NaturalSpline {
  const n = x.length;
  if (y.length !== n) throw new InvalidInputError(`spline: x has ${n} samples but y has ${y.length}`, 'y');
  if (n < 2) throw new InvalidInputError(`spline: needs at least 2 samples, got ${n}`, 'x');
  const xs = Float64Array.from(x);
  const ys = Float64Array.from(y);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(xs[i]!) || !Number.isFinite(ys[i]!)) {
      throw new InvalidInputError(`spline: sample ${i} is not finite`, 'x');
    }
    if (i > 0 && !(xs[i]! > xs[i - 1]!)) {
      throw new InvalidInputError(`spline: x must be strictly increasing (sample ${i})`, 'x');
    }
  }

  const m = secondDerivatives(xs, ys);
  // Per interval i, with t = x - x_i: S = y_i + t (b_i + t (c_i + t d_i)). Precomputing the
  // coefficients keeps evaluation to a few multiply-adds.
  const b = new Float64Array(n - 1);
  const c = new Float64Array(n - 1);
  const d = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) {
    const h = xs[i + 1]! - xs[i]!;
    const mi = m[i]!;
    const mj = m[i + 1]!;
    b[i] = (ys[i + 1]! - ys[i]!) / h - (h * (2 * mi + mj)) / 6;
    c[i] = mi / 2;
    d[i] = (mj - mi) / (6 * h);
  }

  const xMin = xs[0]!;
  const xMax = xs[n - 1]!;
  // Interval of the previous call: the integrator walks phi monotonically, so the next point is
  // almost always in the same or a neighbouring interval and the binary search is skipped.
  let hint = 0;

  function locate(v: number): number {
    if (v >= xs[hint]! && v <= xs[hint + 1]!) return hint;
    if (hint + 2 < n && v >= xs[hint + 1]! && v <= xs[hint + 2]!) return hint + 1;
    if (hint > 0 && v >= xs[hint - 1]! && v <= xs[hint]!) return hint - 1;
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >>> 1;
      if (v < xs[mid]!) hi = mid;
      else lo = mid;
    }
    return lo;
  }

  return {
    xMin,
    xMax,
    size: n,
    evaluate(v: number, out: Float64Array, offset = 0): void {
      if (!(v >= xMin && v <= xMax)) {
        out[offset] = NaN;
        out[offset + 1] = NaN;
        out[offset + 2] = NaN;
        return;
      }
      const i = locate(v);
      hint = i;
      const t = v - xs[i]!;
      const bi = b[i]!;
      const ci = c[i]!;
      const di = d[i]!;
      out[offset] = ys[i]! + t * (bi + t * (ci + t * di));
      out[offset + 1] = bi + t * (2 * ci + 3 * di * t);
      out[offset + 2] = 2 * ci + 6 * di * t;
    },
  };
}

/**
 * Second derivatives M_i at the knots from the continuity of S' (de Boor 1978, ch. IV):
 * h_{i-1} M_{i-1} + 2 (h_{i-1} + h_i) M_i + h_i M_{i+1} = 6 (s_i - s_{i-1}), M_0 = M_{n-1} = 0,
 * with s_i the slope of interval i. The system is tridiagonal and strictly diagonally dominant,
 * so the Thomas algorithm (elimination without pivoting) is stable.
 */
function secondDerivatives(x: Float64Array, y: Float64Array): Float64Array {
  const n = x.length;
  const m = new Float64Array(n);
  if (n < 3) return m;
  const k = n - 2; // interior unknowns M_1 .. M_{n-2}
  const cPrime = new Float64Array(k);
  const dPrime = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    const i = j + 1;
    const hl = x[i]! - x[i - 1]!;
    const hr = x[i + 1]! - x[i]!;
    const rhs = 6 * ((y[i + 1]! - y[i]!) / hr - (y[i]! - y[i - 1]!) / hl);
    const diag = 2 * (hl + hr);
    if (j === 0) {
      cPrime[0] = hr / diag;
      dPrime[0] = rhs / diag;
    } else {
      const denom = diag - hl * cPrime[j - 1]!;
      cPrime[j] = hr / denom;
      dPrime[j] = (rhs - hl * dPrime[j - 1]!) / denom;
    }
  }
  m[k] = dPrime[k - 1]!;
  for (let j = k - 2; j >= 0; j--) m[j + 1] = dPrime[j]! - cPrime[j]! * m[j + 2]!;
  return m;
}
