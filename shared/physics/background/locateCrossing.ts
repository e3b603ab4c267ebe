import type { Integrator } from '../ode/integrate.ts';

/**
 * An end condition g(phi, u), negative before the event and zero at it: g and its first two
 * N-derivatives along the flow, exact (from the equations of motion).
 */
export interface EventFunction {
  derivatives(phi: number, u: number): [number, number, number];
}

const MAX_NEWTON = 8;
/**
 * Below this Newton correction the state is moved by y + delta y' instead of one more
 * re-integration: the error delta^2 |y''|/2 is at the level of rounding, and the root is then
 * known to ~delta^2 (quadratic convergence).
 */
const TAYLOR_LIMIT = 1e-8;

/** Quintic Hermite interpolant on s in [0, 1] from value, first and second derivative (in s) at both ends. */
function quinticHermite(a: readonly number[], b: readonly number[], s: number): number {
  const t = 1 - s;
  const s2 = s * s;
  const t2 = t * t;
  const s3 = s2 * s;
  const t3 = t2 * t;
  return t3 * (a[0]! * (1 + 3 * s + 6 * s2) + a[1]! * s * (1 + 3 * s) + 0.5 * a[2]! * s2)
    + s3 * (b[0]! * (1 + 3 * t + 6 * t2) - b[1]! * t * (1 + 3 * t) + 0.5 * b[2]! * t2);
}

/**
 * Locates g = 0 between two accepted steps without the solver's dense output (which costs
 * ~150x in odex). g, g' and g'' are known exactly at both step ends, so a quintic Hermite
 * interpolant of g brackets a first guess (~1e-6 in N); Newton iterations with the exact slope,
 * each on a short re-integration from the previous iterate, converge quadratically. Every odex
 * call has a fixed set-up cost of some microseconds, so the number of re-integrations (usually
 * two) is what counts.
 */
export function locateCrossing(
  integrator: Integrator,
  g: EventFunction,
  x0: number,
  y0: number[],
  x1: number,
  y1: number[],
): { x: number; y: number[]; evaluations: number } {
  const h = x1 - x0;
  const scaled = ([v, d1, d2]: [number, number, number]): number[] => [v, d1 * h, d2 * h * h];
  const left = scaled(g.derivatives(y0[0]!, y0[1]!));
  const right = scaled(g.derivatives(y1[0]!, y1[1]!));
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 50; i++) {
    const mid = 0.5 * (lo + hi);
    if (quinticHermite(left, right, mid) < 0) lo = mid;
    else hi = mid;
  }
  let evaluations = 0;
  let xFrom = x0;
  let yFrom = y0;
  let x = x0 + 0.5 * (lo + hi) * h;
  for (let i = 0; i < MAX_NEWTON; i++) {
    const run = integrator.advance(xFrom, yFrom, x);
    evaluations += run.evaluations;
    xFrom = x;
    yFrom = run.y;
    const [value, slope] = g.derivatives(yFrom[0]!, yFrom[1]!);
    const step = -value / slope;
    if (!Number.isFinite(step)) break;
    if (Math.abs(step) < TAYLOR_LIMIT) {
      const dy = [0, 0];
      integrator.rhs(xFrom, yFrom, dy);
      yFrom = [yFrom[0]! + step * dy[0]!, yFrom[1]! + step * dy[1]!];
      xFrom += step;
      evaluations += 1;
      break;
    }
    x = Math.min(Math.max(x + step, x0), x1);
    if (x === xFrom) break;
  }
  return { x: xFrom, y: yFrom, evaluations };
}
