import { z } from 'zod';
import { InvalidInputError } from '../../errors.ts';

/**
 * A bound set: the observational constraints points are scored against. Messages leave out the
 * field name because every consumer shows the issue path beside them (see parseBoundSet).
 */

export const OBSERVABLES = ['ns', 'r', 'alphaS', 'nt'] as const;
export type Observable = (typeof OBSERVABLES)[number];

const got = (input: unknown): string =>
  input === undefined ? 'nothing' : typeof input === 'number' ? String(input) : JSON.stringify(input);

const observable = z.enum(OBSERVABLES, {
  error: (iss) => `must be one of ${OBSERVABLES.join(', ')}; got ${got(iss.input)}`,
});
// z.number() already rejects NaN and +-Infinity in zod 4.
const finite = z.number({ error: (iss) => `must be a finite number; got ${got(iss.input)}` });
const positive = finite.gt(0, { error: (iss) => `must be > 0; got ${got(iss.input)}` });

const nonEmpty = z.string({ error: 'must be a string' }).min(1, { error: 'must not be empty' });

const gaussianConstraint = z.strictObject({
  observable,
  kind: z.literal('gaussian'),
  mean: finite,
  /** One standard deviation (the 68% half-width of a Gaussian). */
  sigma: positive,
});

const upperConstraint = z.strictObject({
  observable,
  kind: z.literal('upper'),
  limit: positive,
  /** Probability that the observable lies below `limit`, e.g. 0.95. */
  confidence: finite.gt(0).lt(1, { error: (iss) => `must be in (0, 1); got ${got(iss.input)}` }),
});

const constraint = z.discriminatedUnion('kind', [gaussianConstraint, upperConstraint], {
  error: (iss) => (iss.code === 'invalid_union' ? 'must be "gaussian" or "upper"' : undefined),
});

export const boundSetSchema = z
  .strictObject({
    id: nonEmpty,
    label: nonEmpty,
    citation: z.string({ error: 'must be a string (may be empty)' }),
    constraints: z.array(constraint).min(1, { error: 'must list at least one constraint' }),
    /** Sets the target A_s the potential is normalised to; not a chi-square term. */
    amplitude: z.strictObject({ lnAs10Mean: finite, lnAs10Sigma: positive }).optional(),
  })
  .superRefine((set, ctx) => {
    // Two constraints on one observable would count it twice in chi-square and in the dof.
    const seen = new Map<string, number>();
    set.constraints.forEach((c, i) => {
      const first = seen.get(c.observable);
      if (first !== undefined) {
        ctx.addIssue({
          code: 'custom',
          path: ['constraints', i, 'observable'],
          message: `"${c.observable}" is already constrained by constraints[${first}]`,
        });
      } else seen.set(c.observable, i);
    });
  });

export type BoundSet = z.infer<typeof boundSetSchema>;
export type BoundConstraint = BoundSet['constraints'][number];

function qualify(field: string, path: readonly PropertyKey[]): string {
  let name = field;
  for (const key of path) name += typeof key === 'number' ? `[${key}]` : `.${String(key)}`;
  return name;
}

/** Validates user input; the error names every offending path, e.g. `boundSet.constraints[0].sigma`. */
export function parseBoundSet(input: unknown, field = 'boundSet'): BoundSet {
  const result = boundSetSchema.safeParse(input);
  if (result.success) return result.data;
  const issues = result.error.issues;
  const message = issues.map((issue) => `${qualify(field, issue.path)} ${issue.message}`).join('; ');
  throw new InvalidInputError(message, qualify(field, issues[0]?.path ?? []));
}

/** Default A_s when a bound set gives no amplitude (DESIGN.md physics core). */
export const DEFAULT_TARGET_AMPLITUDE = 2.1e-9;

export const CMB_2018_BMODES_2021: BoundSet = {
  id: 'cmb-2018-bmodes-2021',
  label: 'CMB 2018 + B-modes 2021',
  citation:
    'n_s = 0.9649 ± 0.0042 (68%): Planck Collaboration 2020, A&A 641, A6 and A10. ' +
    'r_0.05 < 0.036 (95%): BICEP/Keck Collaboration 2021, PRL 127, 151301. ' +
    'ln(10^10 A_s) = 3.044 ± 0.014: Planck Collaboration 2020, A&A 641, A6. ' +
    'Values quoted from memory of the papers; check them against the publications before relying on them.',
  constraints: [
    { observable: 'ns', kind: 'gaussian', mean: 0.9649, sigma: 0.0042 },
    { observable: 'r', kind: 'upper', limit: 0.036, confidence: 0.95 },
  ],
  amplitude: { lnAs10Mean: 3.044, lnAs10Sigma: 0.014 },
};

export const DEFAULT_BOUND_SET: BoundSet = CMB_2018_BMODES_2021;

/** A_s the potential is normalised to: exp(ln(10^10 A_s)) / 1e10, or 2.1e-9 without an amplitude. */
export function targetAmplitude(boundSet: BoundSet): number {
  return boundSet.amplitude === undefined ? DEFAULT_TARGET_AMPLITUDE : Math.exp(boundSet.amplitude.lnAs10Mean) / 1e10;
}
