import { describe, expect, it } from 'vitest';
import { createBackgroundRhs } from '../../../../shared/physics/background/equations.ts';
import { preparePoint, preparePotential } from '../../../../shared/physics/point/preparePoint.ts';
import { FAMILIES } from '../../../../shared/physics/potential/families.ts';
import { pointRequestSchema } from '../../../../shared/plan/pointRequest.ts';

/*
 * The background equations exist twice: on the potential's evaluator (any potential, tables too)
 * and with a generated potential written in (inlinedBackgroundRhs, the fast path). Both must give
 * the same numbers to the bit, or a scan's results would depend on the path a point took.
 */
function sameDerivatives(potential: { family?: string; expression?: string }, params: Record<string, number> = {}) {
  const prepared = preparePotential(potential, Object.keys(params));
  expect(prepared.code).toBeDefined();
  const input = preparePoint(pointRequestSchema.parse({ potential, params, pivot: { efolds: 55 }, endPhi: 10 }), prepared);
  const plain = createBackgroundRhs(prepared.potential.evaluate, input.params);
  const inlined = input.backgroundRhs!;
  expect(inlined).toBeDefined();
  const domain = input.domain;
  const a = [0, 0];
  const b = [0, 0];
  let compared = 0;
  for (let i = 0; i < 200; i++) {
    const phi = domain.min + ((i + 0.37) / 200) * (domain.max - domain.min);
    const u = ((i % 7) - 3) * 10 ** -(i % 9);
    plain(0, [phi, u], a);
    inlined(0, [phi, u], b);
    expect(Object.is(a[0], b[0]) && Object.is(a[1], b[1]), `phi ${phi}, u ${u}: ${a} vs ${b}`).toBe(true);
    if (Number.isFinite(a[0]) && Number.isFinite(a[1])) compared++;
  }
  // Most of the domain gives finite numbers, so the comparison is not between NaNs only.
  expect(compared).toBeGreaterThan(150);
}

describe('inlined background right-hand side', () => {
  it.each(FAMILIES.map((f) => [f.id]))('matches the evaluator path to the bit: %s', (id) => {
    sameDerivatives({ family: id });
  });

  it('matches for a custom expression', () => {
    sameDerivatives({ expression: 'V0 * (1 - exp(-sqrt(2/3) * phi))^2 + lam * phi^4' }, { lam: 1e-3 });
  });

  it('is not used for a tabulated potential (no generated code)', () => {
    const potential = { table: 'phi,V\n0,1\n1,2\n2,4\n3,8\n4,16\n' };
    const prepared = preparePotential(potential, []);
    expect(prepared.code).toBeUndefined();
    const input = preparePoint(pointRequestSchema.parse({ potential, pivot: { efolds: 55 } }), prepared);
    expect(input.backgroundRhs).toBeUndefined();
  });
});
