import { describe, expect, it } from 'vitest';
import { InvalidInputError } from '../../../../shared/errors.ts';
import {
  boundSetSchema,
  CMB_2018_BMODES_2021,
  DEFAULT_BOUND_SET,
  parseBoundSet,
  targetAmplitude,
  type BoundSet,
} from '../../../../shared/physics/bounds/boundSet.ts';

const valid = (): BoundSet => structuredClone(CMB_2018_BMODES_2021);

/** First issue of a failed parse as "path: message", the way the API and the CLI show it. */
function firstIssue(input: unknown): string {
  const result = boundSetSchema.safeParse(input);
  if (result.success) throw new Error('expected the schema to reject the input');
  const issue = result.error.issues[0]!;
  return `${issue.path.join('.')}: ${issue.message}`;
}

describe('boundSetSchema', () => {
  it('accepts the default preset', () => {
    expect(boundSetSchema.parse(DEFAULT_BOUND_SET)).toEqual(DEFAULT_BOUND_SET);
    expect(DEFAULT_BOUND_SET).toBe(CMB_2018_BMODES_2021);
  });

  it('holds the published values (from memory of the papers, as DESIGN.md records them)', () => {
    // Planck Collaboration 2020, A&A 641 A6 and A10: n_s = 0.9649 +- 0.0042 (68%).
    expect(DEFAULT_BOUND_SET.constraints).toContainEqual({ observable: 'ns', kind: 'gaussian', mean: 0.9649, sigma: 0.0042 });
    // BICEP/Keck Collaboration 2021, PRL 127 151301: r_0.05 < 0.036 (95%).
    expect(DEFAULT_BOUND_SET.constraints).toContainEqual({ observable: 'r', kind: 'upper', limit: 0.036, confidence: 0.95 });
    // Planck Collaboration 2020, A&A 641 A6: ln(10^10 A_s) = 3.044 +- 0.014.
    expect(DEFAULT_BOUND_SET.amplitude).toEqual({ lnAs10Mean: 3.044, lnAs10Sigma: 0.014 });
    expect(DEFAULT_BOUND_SET.label).toBe('CMB 2018 + B-modes 2021');
    expect(DEFAULT_BOUND_SET.citation).toMatch(/A&A 641.*PRL 127, 151301.*from memory/s);
  });

  it('rejects sigma <= 0, naming the field path', () => {
    const zero = valid();
    (zero.constraints[0] as { sigma: number }).sigma = 0;
    expect(firstIssue(zero)).toMatch(/^constraints\.0\.sigma: must be > 0; got 0$/);
    const negative = valid();
    (negative.constraints[0] as { sigma: number }).sigma = -0.1;
    expect(firstIssue(negative)).toMatch(/^constraints\.0\.sigma: must be > 0; got -0\.1$/);
  });

  it('rejects an unknown observable, listing the allowed ones', () => {
    const input = valid();
    (input.constraints[1] as { observable: string }).observable = 'w';
    expect(firstIssue(input)).toMatch(/^constraints\.1\.observable: must be one of ns, r, alphaS, nt; got "w"$/);
  });

  it.each<[string, (set: Record<string, unknown>) => void, RegExp]>([
    ['an unknown kind', (s) => ((s.constraints as object[])[0] = { observable: 'ns', kind: 'lower', limit: 1 }), /^constraints\.0\.kind: must be "gaussian" or "upper"$/],
    ['confidence = 1', (s) => ((s.constraints as Array<Record<string, unknown>>)[1]!.confidence = 1), /^constraints\.1\.confidence: must be in \(0, 1\); got 1$/],
    ['limit = 0', (s) => ((s.constraints as Array<Record<string, unknown>>)[1]!.limit = 0), /^constraints\.1\.limit: must be > 0; got 0$/],
    ['a non-finite mean', (s) => ((s.constraints as Array<Record<string, unknown>>)[0]!.mean = Infinity), /^constraints\.0\.mean: must be a finite number; got Infinity$/],
    ['no constraints', (s) => (s.constraints = []), /^constraints: must list at least one constraint$/],
    ['the same observable twice', (s) => (s.constraints as object[]).push({ observable: 'ns', kind: 'gaussian', mean: 0.96, sigma: 0.01 }), /^constraints\.2\.observable: "ns" is already constrained by constraints\[0\]$/],
    ['an amplitude width of 0', (s) => (s.amplitude = { lnAs10Mean: 3, lnAs10Sigma: 0 }), /^amplitude\.lnAs10Sigma: must be > 0; got 0$/],
    ['an empty label', (s) => (s.label = ''), /^label: must not be empty$/],
    ['an unknown key', (s) => (s.colour = 'red'), /colour/],
  ])('rejects %s with the path in the message', (_name, mutate, message) => {
    const input = valid() as unknown as Record<string, unknown>;
    mutate(input);
    expect(firstIssue(input)).toMatch(message);
  });
});

describe('parseBoundSet', () => {
  it('throws an InvalidInputError whose message and field name the path', () => {
    const input = valid();
    (input.constraints[0] as { sigma: number }).sigma = 0;
    let caught: unknown;
    try {
      parseBoundSet(input, 'plan.bounds');
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(InvalidInputError);
    expect((caught as InvalidInputError).message).toBe('plan.bounds.constraints[0].sigma must be > 0; got 0');
    expect((caught as InvalidInputError).field).toBe('plan.bounds.constraints[0].sigma');
  });

  it('returns the parsed bound set when it is valid', () => {
    expect(parseBoundSet(valid())).toEqual(DEFAULT_BOUND_SET);
  });
});

describe('targetAmplitude', () => {
  it('is exp(ln(10^10 A_s)) / 1e10, and 2.1e-9 without an amplitude', () => {
    // e^3.044 / 1e10 = 2.0989031673e-9 (arithmetic, checked with Python math.exp).
    expect(Math.abs(targetAmplitude(DEFAULT_BOUND_SET) / 2.0989031673e-9 - 1)).toBeLessThan(1e-10);
    const { amplitude: _omitted, ...withoutAmplitude } = valid();
    expect(targetAmplitude(withoutAmplitude)).toBe(2.1e-9); // DESIGN.md default target
  });
});
