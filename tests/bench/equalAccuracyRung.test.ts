import { describe, expect, it } from 'vitest';
import { equalAccuracyRung } from '../../bench/physics.ts';

// The benchmark's baseline rule (a work-precision comparison, Hairer, Nørsett & Wanner 1993,
// Solving ODEs I, section II.10): the scipy script is timed at the loosest tolerance at which
// both its n_s and its N_end are at least as accurate as ours.
const ladder = [
  { rtol: 1e-8, nsError: 5e-8, nEndError: 2e-8 },
  { rtol: 1e-9, nsError: 2e-9, nEndError: 3e-9 },
  { rtol: 1e-10, nsError: 7e-11, nEndError: 1e-10 },
  { rtol: 1e-11, nsError: 3e-12, nEndError: 5e-12 },
];

describe('equal-accuracy rung of the scipy baseline', () => {
  it('is the loosest rung meeting both errors', () => {
    expect(equalAccuracyRung(ladder, { ns: 4e-9, nEnd: 5e-9 }).rtol).toBe(1e-9);
  });
  it('takes the stricter of the two: a tight N_end moves it down the ladder', () => {
    expect(equalAccuracyRung(ladder, { ns: 4e-9, nEnd: 3e-11 }).rtol).toBe(1e-11);
  });
  it('falls back to the tightest rung when none is accurate enough', () => {
    expect(equalAccuracyRung(ladder, { ns: 1e-13, nEnd: 1e-13 }).rtol).toBe(1e-11);
  });
});
