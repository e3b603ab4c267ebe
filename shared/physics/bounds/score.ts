import type { BoundSet, Observable } from './boundSet.ts';
import { chiSquareQuantile, normalQuantile } from './chiSquare.ts';

export interface PointObservables {
  ns: number;
  r: number;
  alphaS: number;
  nt: number;
}

export type Region = 'inside68' | 'inside95' | 'outside';

export interface PointScore {
  chi2: number;
  region: Region;
}

/**
 * Probability content of the two regions. The app's wording is "the 68% and 95% regions", as in
 * the CMB papers' "68% and 95% CL" contours, so 0.68 and 0.95 rather than the Gaussian
 * 1- and 2-sigma contents 0.6827 and 0.9545.
 */
export const REGION_PROBABILITIES = { inside68: 0.68, inside95: 0.95 } as const;

const OBSERVABLE_INDEX: Record<Observable, number> = { ns: 0, r: 1, alphaS: 2, nt: 3 };

/**
 * Width of the half-Gaussian, centred at zero, whose `confidence` quantile is `limit`:
 * P(0 <= x <= limit) = confidence  <=>  limit = sigma * Phi^{-1}((1 + confidence) / 2).
 * For 95% this is limit / 1.959964. Common practice for turning a one-sided limit on a
 * non-negative quantity such as r into a chi-square term.
 */
export function upperLimitSigma(limit: number, confidence: number): number {
  return limit / normalQuantile((1 + confidence) / 2);
}

/**
 * Builds the scoring function of one bound set. Quantiles and widths are computed here once,
 * since the returned function runs for every point of a scan.
 *
 * chi2 = sum over constraints of ((x - mean) / sigma)^2 for a Gaussian and (max(x, 0) / sigma)^2
 * for an upper limit. The region compares chi2 with the chi-square quantiles for dof = number of
 * constraints, i.e. the joint region of all constrained observables: with the default set a
 * point with r exactly at its 95% limit and n_s at its mean has chi2 = 3.84 < 5.99 and is still
 * inside95 (the joint 2-dof region is wider than each marginal limit).
 * A constrained observable that is not finite makes chi2 Infinity and the region 'outside';
 * observables the set does not constrain are not read.
 */
export function createScorer(boundSet: BoundSet): (obs: PointObservables) => PointScore {
  const n = boundSet.constraints.length;
  const index = new Int8Array(n);
  const center = new Float64Array(n);
  const inverseSigma = new Float64Array(n);
  const isUpper = new Uint8Array(n);
  boundSet.constraints.forEach((c, i) => {
    index[i] = OBSERVABLE_INDEX[c.observable];
    if (c.kind === 'gaussian') {
      center[i] = c.mean;
      inverseSigma[i] = 1 / c.sigma;
    } else {
      isUpper[i] = 1;
      inverseSigma[i] = 1 / upperLimitSigma(c.limit, c.confidence);
    }
  });
  const chi2At68 = chiSquareQuantile(REGION_PROBABILITIES.inside68, n);
  const chi2At95 = chiSquareQuantile(REGION_PROBABILITIES.inside95, n);
  const values = new Float64Array(4);

  return (obs: PointObservables): PointScore => {
    values[0] = obs.ns;
    values[1] = obs.r;
    values[2] = obs.alphaS;
    values[3] = obs.nt;
    let chi2 = 0;
    for (let i = 0; i < n; i++) {
      const x = values[index[i]!]!;
      if (!Number.isFinite(x)) return { chi2: Infinity, region: 'outside' };
      const z = (isUpper[i] === 1 ? Math.max(x, 0) : x - center[i]!) * inverseSigma[i]!;
      chi2 += z * z;
    }
    const region: Region = chi2 < chi2At68 ? 'inside68' : chi2 < chi2At95 ? 'inside95' : 'outside';
    return { chi2, region };
  };
}

/** Scores one point; for many points build the scorer once with createScorer. */
export function scorePoint(obs: PointObservables, boundSet: BoundSet): PointScore {
  return createScorer(boundSet)(obs);
}

/** The chi-square thresholds a scorer uses, for legends and for tests. */
export function regionThresholds(boundSet: BoundSet): { inside68: number; inside95: number } {
  const dof = boundSet.constraints.length;
  return {
    inside68: chiSquareQuantile(REGION_PROBABILITIES.inside68, dof),
    inside95: chiSquareQuantile(REGION_PROBABILITIES.inside95, dof),
  };
}
