import type { Solver } from 'odex';
import { advance, type Rhs } from '../ode/integrate.ts';

/** g(phi, u): negative before the event, zero at it. */
export type EventFunction = (phi: number, u: number) => number;

const TOLERANCE_N = 1e-11;
const MAX_NEWTON = 8;

/**
 * Locates g = 0 between two accepted steps without the solver's dense output (which costs
 * ~150x in odex): a cubic Hermite interpolant from the step ends brackets a first guess, then
 * secant iterations on short re-integrations from the left step reach 1e-11 in N.
 */
export function locateCrossing(
  solver: Solver,
  f: Rhs,
  g: EventFunction,
  x0: number,
  y0: number[],
  x1: number,
  y1: number[],
): { x: number; y: number[]; evaluations: number } {
  const f0 = f(x0, y0);
  const f1 = f(x1, y1);
  const h = x1 - x0;
  const hermite = (s: number, k: number): number => {
    const s2 = s * s;
    const s3 = s2 * s;
    return (2 * s3 - 3 * s2 + 1) * y0[k]! + (s3 - 2 * s2 + s) * h * f0[k]! + (-2 * s3 + 3 * s2) * y1[k]! + (s3 - s2) * h * f1[k]!;
  };
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 40; i++) {
    const mid = 0.5 * (lo + hi);
    if (g(hermite(mid, 0), hermite(mid, 1)) < 0) lo = mid;
    else hi = mid;
  }
  let evaluations = 2;
  // Secant on re-integrated values, seeded by the Hermite guess and the right step end.
  let xa = x1;
  let ga = g(y1[0]!, y1[1]!);
  let xb = x0 + 0.5 * (lo + hi) * h;
  let yb = y1;
  for (let i = 0; i < MAX_NEWTON; i++) {
    const run = advance(solver, f, x0, y0, xb);
    evaluations += run.evaluations;
    yb = run.y;
    const gb = g(yb[0]!, yb[1]!);
    if (gb === 0 || gb === ga) break;
    const next = xb - (gb * (xb - xa)) / (gb - ga);
    // Secant converges superlinearly: once the correction is this small, xb is already that close.
    if (Math.abs(next - xb) < TOLERANCE_N) break;
    xa = xb;
    ga = gb;
    xb = Math.min(Math.max(next, x0), x1);
  }
  return { x: xb, y: yb, evaluations };
}
