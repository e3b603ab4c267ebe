import type { PotentialEvaluator } from '../potential/types.ts';
import type { EndCondition } from './integrateBackground.ts';

/**
 * Automatic start of the background: bracket upward from the end of inflation. The slow-roll
 * end (eps_V = 1) or the given end field is found on a grid over the family's field domain, then
 * the slow-roll e-fold integral N = ∫ V/|V'| dphi is accumulated uphill until it reaches the
 * target. This is only a starting guess; the caller measures the real number of e-folds with the
 * full equations and asks again with a larger target if they fall short.
 */
export interface FieldDomain {
  min: number;
  max: number;
}

export type InitialFieldResult = { ok: true; phi0: number } | { ok: false; status: 'no_inflation' | 'too_few_efolds'; reason: string };

/** Grid steps over the domain; the guess only has to be good enough for the full equations to check. */
const GRID = 256;
/**
 * Gauss–Legendre, 4 nodes a grid cell: exact for cubics, so on smooth stretches of V/|V'| the
 * count is far better than the guess needs; near a hilltop's maximum, where the density diverges,
 * no rule is exact and the full equations' check corrects the guess.
 */
const GAUSS_X = [-0.8611363115940526, -0.3399810435848563, 0.3399810435848563, 0.8611363115940526];
const GAUSS_W = [0.3478548451374538, 0.6521451548625461, 0.6521451548625461, 0.3478548451374538];

interface SlowRoll {
  /** V/|V'| (e-folds per unit field), NaN where the potential is not positive and finite. */
  efoldDensity(phi: number): number;
  epsV(phi: number): number;
  slope(phi: number): number;
  /** One evaluation: has the walk left the slow-roll region (eps_V >= 1) or passed a maximum? */
  leaves(phi: number, slopeSign: number): boolean;
}

function slowRoll(evaluate: PotentialEvaluator, params: Float64Array): SlowRoll {
  const buf = new Float64Array(3);
  const at = (phi: number): void => evaluate(phi, params, buf);
  const positive = (): boolean => buf[0]! > 0 && Number.isFinite(buf[0]!) && Number.isFinite(buf[1]!);
  return {
    efoldDensity: (phi) => (at(phi), positive() ? buf[0]! / Math.abs(buf[1]!) : Number.NaN),
    epsV: (phi) => (at(phi), positive() ? 0.5 * (buf[1]! / buf[0]!) ** 2 : Number.NaN),
    slope: (phi) => (at(phi), buf[1]!),
    leaves: (phi, slopeSign) => (at(phi), Math.sign(buf[1]!) !== slopeSign || !(positive() && 0.5 * (buf[1]! / buf[0]!) ** 2 < 1)),
  };
}

/** Gauss–Legendre of V/|V'| over [a, b]; nodes never touch a hilltop's exact maximum. */
function efoldsBetween(sr: SlowRoll, a: number, b: number): number {
  const mid = 0.5 * (a + b);
  const half = 0.5 * Math.abs(b - a);
  let sum = 0;
  for (let i = 0; i < GAUSS_X.length; i++) sum += GAUSS_W[i]! * sr.efoldDensity(mid + half * GAUSS_X[i]!);
  return sum * half;
}

/**
 * Root of f in [a, b] (f(a), f(b) of opposite signs) by the Illinois variant of regula falsi
 * (Dowell & Jarratt 1971, BIT 11, 168): superlinear, and never leaves the bracket. The root is a
 * starting point for the walk, so 1e-12 of the cell is plenty.
 */
function rootInBracket(f: (x: number) => number, a: number, b: number): number {
  let fa = f(a);
  let fb = f(b);
  const tolerance = 1e-12 * Math.abs(b - a);
  let side = 0;
  for (let i = 0; i < 100 && Math.abs(b - a) > tolerance; i++) {
    let c = (a * fb - b * fa) / (fb - fa);
    let fc = f(c);
    // A non-finite value inside the cell: fall back to bisection there.
    if (!Number.isFinite(fc)) fc = f((c = 0.5 * (a + b)));
    if (fc === 0 || !Number.isFinite(fc)) return c;
    if ((fc < 0) === (fb < 0)) {
      b = c;
      fb = fc;
      // The same end moved twice: halve the other end's weight so it moves too.
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = c;
      fa = fc;
      if (side === 1) fb /= 2;
      side = 1;
    }
  }
  return 0.5 * (a + b);
}

/**
 * x in [a, b] where F(x) = 0 for an increasing F with F' = dF known: Newton steps, each kept
 * inside the shrinking bracket (bisection when a step would leave it).
 */
function solveIncreasing(F: (x: number) => number, dF: (x: number) => number, a: number, b: number, guess: number): number {
  let lo = Math.min(a, b);
  let hi = Math.max(a, b);
  let x = Math.min(Math.max(guess, lo), hi);
  const rising = b > a;
  for (let i = 0; i < 60; i++) {
    const value = F(x);
    if (value === 0) return x;
    // F increases from a to b: below the root on a's side.
    if ((value < 0) === rising) lo = x;
    else hi = x;
    const next = x - value / dF(x);
    const bounded = next > lo && next < hi ? next : 0.5 * (lo + hi);
    if (Math.abs(bounded - x) <= 4e-16 * Math.abs(x) || hi - lo <= 4e-16 * Math.abs(x)) return bounded;
    x = bounded;
  }
  return x;
}

/** Walks uphill from `start` in direction `dir` until `target` slow-roll e-folds are collected. */
function walkUphill(sr: SlowRoll, start: number, dir: number, domain: FieldDomain, target: number): { phi0?: number; collected: number } {
  const h = (domain.max - domain.min) / GRID;
  let collected = 0;
  let phi = start;
  const startSlope = Math.sign(sr.slope(start));
  for (let i = 0; i < 2 * GRID; i++) {
    const next = phi + dir * h;
    if (next < domain.min - 1e-12 * h || next > domain.max + 1e-12 * h) break;
    // Steep right from the start: there is no slow-roll region to collect from.
    if (i === 0 && !(sr.epsV(next) < 1)) return { collected: 0 };
    const gained = efoldsBetween(sr, phi, next);
    if (!Number.isFinite(gained)) return { collected };
    if (collected + gained >= target) {
      const base = phi;
      const need = target - collected;
      // d/dx of the collected e-folds is the density V/|V'| (times the direction of the walk).
      const phi0 = solveIncreasing((x) => efoldsBetween(sr, base, x) - need, (x) => dir * sr.efoldDensity(x), base, next, base + ((next - base) * need) / gained);
      return { phi0, collected: target };
    }
    collected += gained;
    // Leaving the slow-roll region or passing over a maximum ends the walk.
    if (sr.leaves(next, startSlope)) return { collected };
    phi = next;
  }
  return { collected };
}

/** Field values where eps_V crosses 1, each with the uphill direction into the inflating side. */
function slowRollEnds(sr: SlowRoll, domain: FieldDomain): Array<{ phi: number; dir: number }> {
  const h = (domain.max - domain.min) / GRID;
  const ends: Array<{ phi: number; dir: number }> = [];
  let prev = sr.epsV(domain.min) - 1;
  for (let i = 1; i <= GRID; i++) {
    const x = domain.min + i * h;
    const cur = sr.epsV(x) - 1;
    if (Number.isFinite(prev) && Number.isFinite(cur) && (prev < 0) !== (cur < 0)) {
      const phi = rootInBracket((p) => sr.epsV(p) - 1, x - h, x);
      const dir = cur < 0 ? 1 : -1;
      // The field must roll toward this point: V rises into the inflating side.
      if (Math.sign(sr.slope(phi)) === dir) ends.push({ phi, dir });
    }
    prev = cur;
  }
  return ends;
}

export function findInitialField(
  evaluate: PotentialEvaluator,
  params: Float64Array,
  domain: FieldDomain,
  end: EndCondition,
  targetEfolds: number,
): InitialFieldResult {
  const sr = slowRoll(evaluate, params);
  const starts = end.kind === 'field'
    ? [{ phi: end.phiEnd, dir: Math.sign(sr.slope(end.phiEnd)) }]
    : slowRollEnds(sr, domain);
  if (starts.length === 0 || starts.every((s) => s.dir === 0)) {
    return {
      ok: false,
      status: 'no_inflation',
      reason: end.kind === 'field'
        ? `the potential is flat or not positive at end-phi = ${end.phiEnd}`
        : `no slow-roll region (eps_V < 1 ending at eps_V = 1) in phi ∈ [${domain.min}, ${domain.max}]`,
    };
  }
  let best = 0;
  for (const s of starts) {
    const walk = walkUphill(sr, s.phi, s.dir, domain, targetEfolds);
    if (walk.phi0 !== undefined) return { ok: true, phi0: walk.phi0 };
    best = Math.max(best, walk.collected);
  }
  if (best === 0) {
    return { ok: false, status: 'no_inflation', reason: `eps_V >= 1 next to the end of inflation in phi ∈ [${domain.min}, ${domain.max}]: the potential is too steep to inflate` };
  }
  return {
    ok: false,
    status: 'too_few_efolds',
    reason: `only about ${best.toFixed(1)} slow-roll e-folds are available in phi ∈ [${domain.min}, ${domain.max}], ${targetEfolds.toFixed(1)} needed`,
  };
}
