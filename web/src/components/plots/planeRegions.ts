import type { BoundConstraint, BoundSet } from '../../../../shared/physics/bounds/boundSet.ts';
import { regionThresholds, upperLimitSigma } from '../../../../shared/physics/bounds/score.ts';

/**
 * The bound set's 68% and 95% regions in the n_s–r plane, exactly as points are scored
 * (shared/physics/bounds/score.ts): chi2 = Σ z_i^2 with z = (x - mean)/sigma for a Gaussian and
 * max(x, 0)/sigma_up for an upper limit, inside when chi2 is below the chi-square quantile for
 * dof = number of constraints. Constraints on other observables (alpha_s, n_t) are taken at their
 * best value, i.e. this is the slice of the joint region through them.
 */

export type RegionLevel = 'inside68' | 'inside95';
export interface PlaneBox { nsMin: number; nsMax: number; rMin: number; rMax: number }
export interface RegionPolygon { level: RegionLevel; threshold: number; points: [number, number][] }

const SAMPLES = 161;

/** The interval of one observable where its own chi2 share is at most `budget` (clamped to [lo, hi]). */
function allowed(c: BoundConstraint | undefined, budget: number, lo: number, hi: number): [number, number] {
  if (c === undefined || budget < 0) return budget < 0 ? [Number.NaN, Number.NaN] : [lo, hi];
  const half = (c.kind === 'gaussian' ? c.sigma : upperLimitSigma(c.limit, c.confidence)) * Math.sqrt(budget);
  const [a, b] = c.kind === 'gaussian' ? [c.mean - half, c.mean + half] : [-Infinity, half];
  return [Math.max(a, lo), Math.min(b, hi)];
}

/** One observable's share of chi2. */
function share(c: BoundConstraint | undefined, x: number): number {
  if (c === undefined) return 0;
  const z = c.kind === 'gaussian' ? (x - c.mean) / c.sigma : Math.max(x, 0) / upperLimitSigma(c.limit, c.confidence);
  return z * z;
}

const constraintOn = (set: BoundSet, name: 'ns' | 'r') => set.constraints.find((c) => c.observable === name);

/** The box the 95% region spans, unclamped (an unconstrained side is null). */
export function regionBox(set: BoundSet): { ns: [number, number] | null; rMax: number | null } {
  const c95 = regionThresholds(set).inside95;
  const ns = constraintOn(set, 'ns');
  const r = constraintOn(set, 'r');
  const nsBox = ns ? allowed(ns, c95, -Infinity, Infinity) : null;
  return { ns: nsBox && Number.isFinite(nsBox[0]) ? nsBox : null, rMax: r ? allowed(r, c95, -Infinity, Infinity)[1] : null };
}

/**
 * Closed outlines of both regions within `box` (the plot's extent): the upper edge from left to
 * right, then the lower edge back. None when the set constrains neither n_s nor r.
 */
export function regionPolygons(set: BoundSet, box: PlaneBox): RegionPolygon[] {
  const ns = constraintOn(set, 'ns');
  const r = constraintOn(set, 'r');
  if (!ns && !r) return [];
  const thresholds = regionThresholds(set);
  const out: RegionPolygon[] = [];
  // The least r can add to chi2 inside the box: n_s may use the rest, so the outline meets the
  // box's floor (or the r constraint's centre) exactly at its left and right ends.
  const rCentre = r === undefined ? box.rMin : r.kind === 'gaussian' ? r.mean : 0;
  const rShareMin = share(r, Math.min(Math.max(rCentre, box.rMin), box.rMax));
  for (const level of ['inside95', 'inside68'] as const) {
    const threshold = thresholds[level];
    const [a, b] = allowed(ns, threshold - rShareMin, box.nsMin, box.nsMax);
    if (!(a < b)) continue;
    // Cosine spacing puts more samples near the ends, where a Gaussian edge turns vertical.
    const xs = Array.from({ length: SAMPLES }, (_, i) => a + ((b - a) * (1 - Math.cos((Math.PI * i) / (SAMPLES - 1)))) / 2);
    const upper: [number, number][] = [];
    const lower: [number, number][] = [];
    for (const x of xs) {
      // Rounding may take the budget a hair under rShareMin at the ends; the interval is then one point.
      const [lo, hi] = allowed(r, Math.max(threshold - share(ns, x), rShareMin), box.rMin, box.rMax);
      if (!(lo <= hi)) continue;
      upper.push([x, hi]);
      lower.push([x, lo]);
    }
    if (upper.length > 1) out.push({ level, threshold, points: [...upper, ...lower.reverse()] });
  }
  return out;
}
