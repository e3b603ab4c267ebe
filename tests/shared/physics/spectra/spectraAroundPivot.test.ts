import { describe, expect, it } from 'vitest';
import { computePoint } from '../../../../shared/physics/point/computePoint.ts';
import { preparePoint } from '../../../../shared/physics/point/preparePoint.ts';
import { spectraAroundPivot } from '../../../../shared/physics/spectra/spectraAroundPivot.ts';
import { pointRequestSchema, type PointRequestInput } from '../../../../shared/plan/pointRequest.ts';

const prepare = (request: PointRequestInput) => preparePoint(pointRequestSchema.parse(request));

/**
 * Power-law inflation, V = V0 exp(-lambda phi), p = 2/lambda^2, has exactly power-law spectra:
 * P_R(k) ∝ k^(n_s - 1) with n_s - 1 = -2/(p - 1), and r = P_t/P_R = 16/p at every k
 * (Lyth & Stewart 1992, Phys. Lett. B 274, 168; Lucchin & Matarrese 1985, PRD 32, 1316).
 */
describe('spectra around the pivot', () => {
  it('follow the exact power law of power-law inflation over seven e-folds of k', () => {
    const p = 30;
    const input = prepare({ potential: { family: 'exponential' }, params: { lambda: Math.sqrt(2 / p) }, endPhi: 10, pivot: { efolds: 55 }, exact: true, targetAs: 2.1e-9 });
    const point = computePoint(input);
    expect(point.status).toBe('ok');
    const { samples, failures } = spectraAroundPivot(input, point.phiStart, point.nPivot);
    expect(failures).toEqual([]);
    expect(samples).toHaveLength(7);
    // H falls as the field rolls, so a mode leaving one e-fold later has ln k a little under +1.
    const lnK = samples.map((s) => s.lnK);
    expect(lnK[3]).toBe(0);
    for (let i = 1; i < lnK.length; i++) expect(lnK[i]! - lnK[i - 1]!).toBeCloseTo(1 - 1 / p, 6);
    for (const s of samples) {
      const want = 2.1e-9 * Math.exp((-2 / (p - 1)) * s.lnK);
      expect(Math.abs(s.scalar / want - 1), `P_R at ln k = ${s.lnK}`).toBeLessThan(1e-6);
      expect(Math.abs(s.tensor / s.scalar / (16 / p) - 1), `r at ln k = ${s.lnK}`).toBeLessThan(1e-6);
    }
  });

  it('agree with the stored exact n_s and r at the pivot of an alpha-attractor', () => {
    const input = prepare({ potential: { family: 'e-model' }, params: { alpha: 1 }, pivot: { efolds: 55 }, exact: true });
    const point = computePoint(input);
    expect(point.status).toBe('ok');
    const { samples } = spectraAroundPivot(input, point.phiStart, point.nPivot, [-1, 0, 1]);
    const [lo, mid, hi] = samples as [typeof samples[0], typeof samples[0], typeof samples[0]];
    // Same read-off as the stored value but over a stencil of ±1 in ln k instead of ±0.1: the
    // running alpha_s ~ -6e-4 bends the spectrum, so only agreement to ~1e-4 is expected.
    const slope = (Math.log(hi.scalar) - Math.log(lo.scalar)) / (hi.lnK - lo.lnK);
    expect(Math.abs(1 + slope - point.exact!.ns)).toBeLessThan(1e-4);
    expect(mid.tensor / mid.scalar).toBeCloseTo(point.exact!.r, 10);
    expect(mid.scalar).toBeCloseTo(input.targetAs, 20);
  });
});
