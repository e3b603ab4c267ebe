import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { DEFAULT_BOUND_SET, type BoundSet } from '../../../../shared/physics/bounds/boundSet.ts';
import {
  createScorer,
  regionThresholds,
  scorePoint,
  upperLimitSigma,
} from '../../../../shared/physics/bounds/score.ts';

// Reference values from SciPy (Virtanen et al., Nature Methods 2020) in Debian's python3-scipy.
const reference = JSON.parse(
  execFileSync(
    '/usr/bin/python3',
    [
      '-c',
      `import json
from scipy import stats
print(json.dumps({
  "z975": float(stats.norm.ppf(0.975)), "z84": float(stats.norm.ppf(0.84)),
  "q68": [float(stats.chi2.ppf(0.68, k)) for k in (1, 2, 3)],
  "q95": [float(stats.chi2.ppf(0.95, k)) for k in (1, 2, 3)],
}))`,
    ],
    { encoding: 'utf8' },
  ),
) as { z975: number; z84: number; q68: number[]; q95: number[] };

const nsMean = 0.9649;
const nsSigma = 0.0042;
const rSigma = 0.036 / reference.z975;
const point = (ns: number, r: number, alphaS = 0, nt = 0) => ({ ns, r, alphaS, nt });
const score = createScorer(DEFAULT_BOUND_SET);

function close(actual: number, expected: number, tolerance = 1e-13): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}

describe('upper limits as half-Gaussians', () => {
  it('uses sigma = limit / Phi^-1((1 + confidence) / 2), checked with scipy.stats.norm.ppf', () => {
    close(upperLimitSigma(0.036, 0.95), rSigma);
    close(upperLimitSigma(0.036, 0.95), 0.036 / 1.959963984540054); // common practice: 1.96 sigma at 95%
    close(upperLimitSigma(0.1, 0.68), 0.1 / reference.z84);
  });
});

describe('region thresholds', () => {
  it('are the chi-square 68% and 95% quantiles for dof = number of constraints (scipy chi2.ppf)', () => {
    const t = regionThresholds(DEFAULT_BOUND_SET);
    close(t.inside68, reference.q68[1]!, 1e-12);
    close(t.inside95, reference.q95[1]!, 1e-12);
  });
});

describe('scoring against CMB 2018 + B-modes 2021', () => {
  it('puts a point at the n_s mean with r = 0 inside68 with chi2 = 0', () => {
    expect(score(point(nsMean, 0))).toEqual({ chi2: 0, region: 'inside68' });
  });

  it('adds the r term at the n_s mean', () => {
    const s = score(point(nsMean, 0.01));
    close(s.chi2, (0.01 / rSigma) ** 2);
    expect(s.region).toBe('inside68');
  });

  it('puts n_s at 2 sigma inside95 and at 3 sigma outside', () => {
    const two = score(point(nsMean - 2 * nsSigma, 0));
    close(two.chi2, 4, 1e-10);
    expect(two.region).toBe('inside95');
    const three = score(point(nsMean + 3 * nsSigma, 0));
    close(three.chi2, 9, 1e-10);
    expect(three.region).toBe('outside');
  });

  it('gives r at its 95% limit the 1-dof 95% chi-square value, inside the joint 2-dof 95% region', () => {
    const s = score(point(nsMean, 0.036));
    close(s.chi2, reference.q95[0]!, 1e-12);
    expect(s.region).toBe('inside95');
  });

  it('does not penalise r < 0 (the half-Gaussian starts at zero)', () => {
    expect(score(point(nsMean, -0.01)).chi2).toBe(0);
  });

  it('scores a point with a non-finite constrained observable outside with chi2 Infinity', () => {
    for (const bad of [point(NaN, 0.01), point(nsMean, Infinity), point(nsMean, NaN)]) {
      expect(score(bad)).toEqual({ chi2: Infinity, region: 'outside' });
    }
    // alpha_s and n_t are not constrained by this set, so they are not read.
    expect(score(point(nsMean, 0, NaN, NaN))).toEqual({ chi2: 0, region: 'inside68' });
  });

  it('scorePoint gives the same as a scorer built once', () => {
    const p = point(0.9612, 0.02, -0.001, -0.0025);
    expect(scorePoint(p, DEFAULT_BOUND_SET)).toEqual(score(p));
  });
});

describe('a user bound set on running and tilt', () => {
  const custom: BoundSet = {
    id: 'toy',
    label: 'Toy running bound',
    citation: '',
    constraints: [
      { observable: 'alphaS', kind: 'gaussian', mean: -0.0045, sigma: 0.0067 },
      { observable: 'nt', kind: 'upper', limit: 0.5, confidence: 0.68 },
      { observable: 'ns', kind: 'gaussian', mean: 0.965, sigma: 0.004 },
    ],
  };

  it('sums the terms and uses 3-dof thresholds', () => {
    const s = createScorer(custom)(point(0.965 + 0.004, 0.5, -0.0045 - 0.0067, 1));
    close(s.chi2, 1 + 1 + (1 / (0.5 / reference.z84)) ** 2, 1e-12);
    expect(s.chi2).toBeGreaterThan(reference.q68[2]!);
    expect(s.region).toBe('inside95');
    close(regionThresholds(custom).inside95, reference.q95[2]!, 1e-12);
  });
});
