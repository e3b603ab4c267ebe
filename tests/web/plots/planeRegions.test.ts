import { describe, expect, it } from 'vitest';
import { CMB_2018_BMODES_2021, type BoundSet } from '../../../shared/physics/bounds/boundSet.ts';
import { createScorer } from '../../../shared/physics/bounds/score.ts';
import { regionBox, regionPolygons } from '../../../web/src/components/plots/planeRegions.ts';

/**
 * The chi-square distribution with 2 degrees of freedom has CDF 1 - exp(-x/2), so its p-quantile
 * is -2 ln(1 - p) (common practice; any statistics table: 2.279 at 68%, 5.991 at 95%). A 95% upper
 * limit L on a half-Gaussian has sigma = L / 1.959964 (the normal 97.5% point, from tables).
 */
const set = CMB_2018_BMODES_2021;
const c68 = -2 * Math.log(1 - 0.68);
const c95 = -2 * Math.log(1 - 0.95);
const sigmaR = 0.036 / 1.959964;
const box = { nsMin: 0.9, nsMax: 1.03, rMin: 1e-6, rMax: 1 };

describe('bound regions in the n_s–r plane', () => {
  it('spans n_s = mean ± sigma sqrt(q) and reaches r = sigma_r sqrt(q) at the mean', () => {
    const [r95, r68] = regionPolygons(set, box);
    expect(r95!.level).toBe('inside95');
    expect(r68!.level).toBe('inside68');
    expect(r95!.threshold).toBeCloseTo(c95, 9);
    expect(r68!.threshold).toBeCloseTo(c68, 9);
    for (const [poly, q] of [[r95!, c95], [r68!, c68]] as const) {
      const ns = poly.points.map((p) => p[0]);
      expect(Math.min(...ns)).toBeCloseTo(0.9649 - 0.0042 * Math.sqrt(q), 9);
      expect(Math.max(...ns)).toBeCloseTo(0.9649 + 0.0042 * Math.sqrt(q), 9);
      const rTop = Math.max(...poly.points.map((p) => p[1]));
      expect(Math.abs(rTop / (sigmaR * Math.sqrt(q)) - 1)).toBeLessThan(1e-5);
    }
    expect(regionBox(set).rMax!).toBeCloseTo(sigmaR * Math.sqrt(c95), 8);
  });

  it('draws exactly where the scorer changes region: just inside the edge is in, just outside is out', () => {
    const score = createScorer(set);
    const [r95, r68] = regionPolygons(set, box);
    for (const [poly, inside, outside] of [[r68!, 'inside68', 'inside95'], [r95!, 'inside95', 'outside']] as const) {
      const upper = poly.points.slice(0, poly.points.length / 2).filter(([, r]) => r > box.rMin * 10);
      expect(upper.length).toBeGreaterThan(100);
      for (const [ns, r] of upper) {
        expect(score({ ns, r: r * (1 - 1e-6), alphaS: 0, nt: 0 }).region).toBe(inside);
        expect(score({ ns, r: r * (1 + 1e-6), alphaS: 0, nt: 0 }).region).toBe(outside);
      }
      // The lower edge is the plot's floor: an upper limit allows every r down to 0.
      expect(poly.points.slice(poly.points.length / 2).every(([, r]) => r === box.rMin)).toBe(true);
    }
  });

  it('is clipped to the plot box', () => {
    const narrow = { nsMin: 0.96, nsMax: 0.97, rMin: 1e-3, rMax: 0.02 };
    for (const poly of regionPolygons(set, narrow)) {
      for (const [ns, r] of poly.points) {
        expect(ns).toBeGreaterThanOrEqual(0.96);
        expect(ns).toBeLessThanOrEqual(0.97);
        expect(r).toBeGreaterThanOrEqual(1e-3);
        expect(r).toBeLessThanOrEqual(0.02);
      }
    }
  });

  it('follows the set: n_s alone gives a vertical band, a Gaussian r a closed ellipse, neither no region', () => {
    const nsOnly: BoundSet = { ...set, constraints: [set.constraints[0]!] };
    const band = regionPolygons(nsOnly, box)[0]!;
    // One constraint: q = 0.989 at 68% would be for 1 dof; the 95% band is mean ± 1.95996 sigma.
    expect(Math.max(...band.points.map((p) => p[0]))).toBeCloseTo(0.9649 + 0.0042 * 1.959964, 6);
    expect(new Set(band.points.map((p) => p[1]))).toEqual(new Set([box.rMin, box.rMax]));

    const ellipse: BoundSet = { ...set, constraints: [set.constraints[0]!, { observable: 'r', kind: 'gaussian', mean: 0.01, sigma: 0.002 }] };
    const score = createScorer(ellipse);
    const [outer] = regionPolygons(ellipse, { ...box, rMin: 0 });
    for (const [ns, r] of outer!.points) expect(Math.abs(score({ ns, r, alphaS: 0, nt: 0 }).chi2 - c95)).toBeLessThan(1e-6);

    const runningOnly: BoundSet = { ...set, constraints: [{ observable: 'alphaS', kind: 'gaussian', mean: 0, sigma: 0.01 }] };
    expect(regionPolygons(runningOnly, box)).toEqual([]);
  });
});
