/**
 * The distribution functions a bound set needs: the chi-square CDF and its inverse (for the 68%
 * and 95% regions) and the standard normal quantile (to turn an upper limit into a width).
 */

const EPS = 1e-16;
const FPMIN = 1e-300;
const MAX_ITERATIONS = 1000;

// Lanczos approximation, 14 terms (Press et al., Numerical Recipes 3rd ed., 2007, §6.1).
const LANCZOS = [
  57.1562356658629235, -59.5979603554754912, 14.1360979747417471, -0.491913816097620199,
  0.339946499848118887e-4, 0.465236289270485756e-4, -0.983744753048795646e-4,
  0.158088703224912494e-3, -0.210264441724104883e-3, 0.217439618115212643e-3,
  -0.16431810653676389e-3, 0.844182239838527433e-4, -0.261908384015814087e-4,
  0.368991826595316234e-5,
];

/** ln Gamma(a) for a > 0 (Numerical Recipes 2007, §6.1, gammln). */
export function lnGamma(a: number): number {
  let y = a;
  const t = a + 5.2421875;
  const head = (a + 0.5) * Math.log(t) - t;
  let series = 0.999999999999997092;
  for (const c of LANCZOS) series += c / ++y;
  return head + Math.log((2.5066282746310005 * series) / a);
}

/** P(a, x) by its power series (Numerical Recipes 2007, §6.2); converges fast for x < a + 1. */
function gammaSeries(a: number, x: number, prefactor: number): number {
  let ap = a;
  let term = 1 / a;
  let sum = term;
  for (let i = 0; i < MAX_ITERATIONS && Math.abs(term) >= Math.abs(sum) * EPS; i++) {
    term *= x / ++ap;
    sum += term;
  }
  return sum * prefactor;
}

/** Q(a, x) = 1 - P(a, x) by its continued fraction, modified Lentz (NR 2007, §6.2); x >= a + 1. */
function gammaContinuedFraction(a: number, x: number, prefactor: number): number {
  let b = x + 1 - a;
  let c = 1 / FPMIN;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i <= MAX_ITERATIONS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < FPMIN) d = FPMIN;
    c = b + an / c;
    if (Math.abs(c) < FPMIN) c = FPMIN;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) <= EPS) break;
  }
  return prefactor * h;
}

/**
 * Regularized incomplete gamma P(a, x) = gamma(a, x) / Gamma(a) (upper = false) or its
 * complement Q(a, x) (upper = true). Each is computed by the method that converges on that side
 * of x = a + 1, and the other as 1 minus it; asking for Q directly keeps its relative accuracy
 * in the far tail, where 1 - P would have lost it to rounding.
 */
export function regularizedGamma(a: number, x: number, upper = false): number {
  if (!(a > 0) || !(x >= 0)) return NaN;
  if (x === 0) return upper ? 1 : 0;
  if (x === Infinity) return upper ? 0 : 1;
  const prefactor = Math.exp(-x + a * Math.log(x) - lnGamma(a));
  if (x < a + 1) {
    const lower = gammaSeries(a, x, prefactor);
    return upper ? 1 - lower : lower;
  }
  const tail = gammaContinuedFraction(a, x, prefactor);
  return upper ? tail : 1 - tail;
}

/** P(a, x), the regularized lower incomplete gamma function. */
export function regularizedGammaP(a: number, x: number): number {
  return regularizedGamma(a, x, false);
}

/** P(chi^2 <= x) for `dof` degrees of freedom: P(dof/2, x/2). */
export function chiSquareCdf(x: number, dof: number): number {
  if (x <= 0) return dof > 0 ? 0 : NaN;
  return regularizedGamma(dof / 2, x / 2, false);
}

/** P(chi^2 > x) = Q(dof/2, x/2), accurate far into the tail (p-values). */
export function chiSquareSurvival(x: number, dof: number): number {
  if (x <= 0) return dof > 0 ? 1 : NaN;
  return regularizedGamma(dof / 2, x / 2, true);
}

function chiSquarePdf(x: number, dof: number): number {
  const k = dof / 2;
  return Math.exp((k - 1) * Math.log(x) - x / 2 - k * Math.LN2 - lnGamma(k));
}

/**
 * The x with chiSquareCdf(x, dof) = p, for p in [0, 1]. Above p = 0.5 it solves
 * Q(x) = 1 - p instead (1 - p is exact there), since the CDF near 1 carries an absolute rounding
 * error of 1e-16 that, divided by the small density of the tail, would cost digits of x.
 * Newton steps are kept inside a bracket that shrinks at every evaluation, so a poor step falls
 * back to bisection. Stops when the step is below 1e-14 relative: with quadratic convergence the
 * remaining error is at the rounding level, well inside 1e-12.
 */
export function chiSquareQuantile(p: number, dof: number): number {
  if (!(p >= 0 && p <= 1) || !(dof > 0)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  const useTail = p > 0.5;
  const q = 1 - p;
  // Increasing in x, zero at the quantile.
  const residual = (x: number): number => (useTail ? q - chiSquareSurvival(x, dof) : chiSquareCdf(x, dof) - p);
  let lo = 0;
  let hi = Math.max(dof, 1);
  while (residual(hi) < 0) {
    lo = hi;
    hi *= 2;
  }
  let x = (lo + hi) / 2;
  for (let i = 0; i < 200; i++) {
    const f = residual(x);
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const step = f / chiSquarePdf(x, dof);
    if (Math.abs(step) <= 1e-14 * x) return x - step;
    const newton = x - step;
    x = newton > lo && newton < hi ? newton : (lo + hi) / 2;
    if (hi - lo <= 1e-15 * hi) return x;
  }
  return x;
}

// Wichura, Algorithm AS 241, Applied Statistics 37 (1988) 477-484 (PPND16, ~1e-16 relative).
const A = [3.387132872796366608, 133.14166789178437745, 1971.5909503065514427, 13731.693765509461125,
  45921.953931549871457, 67265.770927008700853, 33430.575583588128105, 2509.0809287301226727];
const B = [1, 42.313330701600911252, 687.1870074920579083, 5394.1960214247511077,
  21213.794301586595867, 39307.89580009271061, 28729.085735721942674, 5226.495278852854561];
const C = [1.42343711074968357734, 4.6303378461565452959, 5.7694972214606914055, 3.64784832476320460504,
  1.27045825245236838258, 0.24178072517745061177, 0.0227238449892691845833, 7.7454501427834140764e-4];
const D = [1, 2.05319162663775882187, 1.6763848301838038494, 0.68976733498510000455,
  0.14810397642748007459, 0.0151986665636164571966, 5.475938084995344946e-4, 1.05075007164441684324e-9];
const E = [6.6579046435011037772, 5.4637849111641143699, 1.7848265399172913358, 0.29656057182850489123,
  0.026532189526576123093, 0.0012426609473880784386, 2.71155556874348757815e-5, 2.01033439929228813265e-7];
const F = [1, 0.59983220655588793769, 0.13692988092273580531, 0.014875361290850614852,
  7.868691311456132591e-4, 1.8463183175100546818e-5, 1.4215117583164458887e-7, 2.04426310338993978564e-15];

function ratio(num: readonly number[], den: readonly number[], r: number): number {
  let n = 0;
  let d = 0;
  for (let i = 7; i >= 0; i--) {
    n = n * r + num[i]!;
    d = d * r + den[i]!;
  }
  return n / d;
}

/** Standard normal quantile Phi^{-1}(p) for p in (0, 1); +-Infinity at 1 and 0 (AS 241). */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) return q * ratio(A, B, 0.180625 - q * q);
  const r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  const z = r <= 5 ? ratio(C, D, r - 1.6) : ratio(E, F, r - 5);
  return q < 0 ? -z : z;
}
