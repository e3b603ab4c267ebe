import { describe, expect, it } from 'vitest';
import { family, point } from '../../../helpers/point.ts';

describe('quadratic potential against first-order slow roll', () => {
  for (const N of [50, 60]) {
    it(`N_* = ${N}`, () => {
      const result = point({ ...family('quadratic'), pivot: { efolds: N }, exact: true });
      expect(result.status).toBe('ok');
      // First-order slow roll (Liddle & Lyth, Cosmological Inflation and Large-Scale Structure, 2000):
      // n_s = 1 - 2/(N + 1/2), r = 8/(N + 1/2). The neglected terms are of second order, O(1/N^2);
      // the coefficient 2 bounds them (measured: 1.8/N^2 for n_s, mostly from the end of
      // inflation, where slow roll does not hold).
      const Nh = N + 0.5;
      expect(Math.abs(result.ns - (1 - 2 / Nh))).toBeLessThan(2 / Nh ** 2);
      expect(Math.abs(result.r - 8 / Nh) / (8 / Nh)).toBeLessThan(2 / Nh);
      // Second-order Hubble-flow against exact spectra: they differ at third order, eps^3.
      const eps = Math.max(result.eps1, Math.abs(result.eps2));
      expect(Math.abs(result.exact!.ns - result.ns)).toBeLessThan(eps ** 3 * 10);
    });
  }

  it('ends near phi = 1, not at the slow-roll estimate sqrt(2)', () => {
    // eps_V = 2/phi^2 = 1 gives sqrt(2), but near the end the field is no longer in slow roll:
    // the true eps1 = phi'^2/2 = 1 comes later, near phi ≈ 1 (common practice; cross-checked
    // against scipy's DOP853 in scipyCrossCheck.test.ts).
    const result = point({ ...family('quadratic'), pivot: { efolds: 55 } });
    expect(Math.abs(result.phiEnd - 1)).toBeLessThan(0.02);
    expect(Math.abs(result.phiEnd - Math.SQRT2)).toBeGreaterThan(0.3);
  });
});

describe('plateau (Starobinsky) potential against its large-N slow-roll limit', () => {
  // n_s ≈ 1 - 2/N, r ≈ 12/N^2 at large N (Mukhanov & Chibisov 1981, JETP Lett. 33, 532;
  // Starobinsky 1983, Sov. Astron. Lett. 9, 302). Corrections are O(ln N / N) relative,
  // so the agreement must improve as N grows.
  const relative = (N: number) => {
    const result = point({ ...family('starobinsky'), pivot: { efolds: N } });
    expect(result.status).toBe('ok');
    return { ns: Math.abs((1 - result.ns) - 2 / N) / (2 / N), r: Math.abs(result.r - 12 / N ** 2) / (12 / N ** 2) };
  };

  it('agrees at N_* = 55 within the size of the next order', () => {
    const at55 = relative(55);
    expect(at55.ns).toBeLessThan(Math.log(55) / 55);
    expect(at55.r).toBeLessThan(2 * Math.log(55) / 55);
  });

  it('converges towards it as N_* grows', () => {
    const at55 = relative(55);
    const at400 = relative(400);
    expect(at400.ns).toBeLessThan(at55.ns / 4);
    expect(at400.r).toBeLessThan(at55.r / 4);
  });
});

describe('exact spectra of a plateau model', () => {
  it('differ from second-order Hubble-flow values at third order', () => {
    const result = point({ ...family('starobinsky'), pivot: { efolds: 55 }, exact: true });
    const e2 = Math.abs(result.eps2);
    expect(Math.abs(result.exact!.ns - result.ns)).toBeLessThan(e2 ** 3);
    expect(Math.abs(result.exact!.r - result.r) / result.r).toBeLessThan(e2 ** 2);
    expect(Math.abs(result.exact!.As - result.As) / result.As).toBeLessThan(e2 ** 2);
  });
});
