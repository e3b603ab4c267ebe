/**
 * The built-in potential families (DESIGN.md, "Command-line contract"). Each is only data — an
 * expression in phi and its parameters — compiled by the same code as a custom expression, so
 * there is one code path.
 */
import { InvalidInputError } from '../../errors.ts';
import { compileExpression, type GeneratedPotential } from './expression.ts';

export interface FamilyParameter {
  readonly name: string;
  readonly default: number;
  /** Suggested scan range. */
  readonly range: readonly [number, number];
  readonly scale: 'linear' | 'log';
  /** Only values > 0 describe the family (a negative width, scale or power is another potential or none). */
  readonly positive?: true;
  readonly description: string;
}

export interface PotentialFamily {
  readonly id: string;
  readonly label: string;
  readonly expression: string;
  /** `V0` first, then the shape parameters. */
  readonly parameters: readonly FamilyParameter[];
  /** Interval (expressions in the parameters) in which the automatic search for phi0 looks. */
  readonly fieldDomain: { readonly min: string; readonly max: string };
  /** Inflation never ends by itself (eps1 < 1 everywhere): the plan must give the end field. */
  readonly needsEndPhi?: true;
  readonly description: string;
  readonly reference: string;
}

const V0: FamilyParameter = {
  name: 'V0', default: 1, range: [1e-16, 1], scale: 'log', positive: true,
  description: 'overall scale of V (M_pl = 1); drops out of the background, sets A_s',
};
const ALPHA: FamilyParameter = {
  name: 'alpha', default: 1, range: [0.01, 100], scale: 'log', positive: true,
  description: 'alpha-attractor parameter (curvature of the field space is -2/(3 alpha))',
};
const LINDE_1983 = 'A. D. Linde, "Chaotic inflation", Phys. Lett. B 129, 177 (1983)';

/*
 * Plateau families get a field domain that scales with their width: at its upper end
 * exp(-sqrt(2/(3 alpha)) phi) = e^-20 (E-model) or phi/sqrt(6 alpha) = 10 (T-model), which
 * still leaves millions of e-folds for any alpha in range, while a fixed bound like 100 would
 * make V' underflow to zero for small alpha.
 */
export const FAMILIES: readonly PotentialFamily[] = [
  {
    id: 'quadratic', label: 'Quadratic', expression: 'V0 * phi^2', parameters: [V0],
    fieldDomain: { min: '0', max: '100' },
    description: 'Chaotic inflation with a mass term, V0 phi^2.', reference: LINDE_1983,
  },
  {
    id: 'monomial', label: 'Monomial', expression: 'V0 * phi^p',
    parameters: [V0, { name: 'p', default: 2, range: [0.5, 6], scale: 'linear', positive: true, description: 'power of phi' }],
    fieldDomain: { min: '0', max: '100' },
    description: 'Chaotic inflation with a power law, V0 phi^p.', reference: LINDE_1983,
  },
  {
    id: 'starobinsky', label: 'Starobinsky', expression: 'V0 * (1 - exp(-sqrt(2/3) * phi))^2', parameters: [V0],
    fieldDomain: { min: '0', max: '20 * sqrt(3/2)' },
    description: 'R + R^2 gravity in the Einstein frame: a plateau at large phi.',
    reference: 'A. A. Starobinsky, Phys. Lett. B 91, 99 (1980)',
  },
  {
    id: 'natural', label: 'Natural inflation', expression: 'V0 * (1 + cos(phi / f))',
    parameters: [V0, { name: 'f', default: 7, range: [1, 50], scale: 'log', positive: true, description: 'axion decay constant' }],
    fieldDomain: { min: '0', max: 'pi * f' },
    description: 'A pseudo-Nambu-Goldstone boson rolling from the top (phi = 0) to the minimum at pi f.',
    reference: 'K. Freese, J. A. Frieman & A. V. Olinto, Phys. Rev. Lett. 65, 3233 (1990)',
  },
  {
    id: 'e-model', label: 'E-model (alpha-attractor)', expression: 'V0 * (1 - exp(-sqrt(2 / (3 * alpha)) * phi))^2',
    parameters: [V0, ALPHA],
    fieldDomain: { min: '0', max: '20 * sqrt(3 * alpha / 2)' },
    description: 'Exponential alpha-attractor; alpha = 1 is the Starobinsky potential.',
    reference: 'R. Kallosh, A. Linde & D. Roest, "Superconformal inflationary alpha-attractors", ' +
      'JHEP 11 (2013) 198, arXiv:1311.0472 (journal reference from memory)',
  },
  {
    id: 't-model', label: 'T-model (alpha-attractor)', expression: 'V0 * tanh(phi / sqrt(6 * alpha))^2',
    parameters: [V0, ALPHA],
    fieldDomain: { min: '0', max: '10 * sqrt(6 * alpha)' },
    description: 'tanh alpha-attractor: quadratic near phi = 0, a plateau beyond sqrt(6 alpha).',
    reference: 'R. Kallosh & A. Linde, "Universality class in conformal inflation", JCAP 07 (2013) 002',
  },
  {
    id: 'hilltop', label: 'Hilltop', expression: 'V0 * (1 - (phi / mu)^q)',
    parameters: [
      V0,
      { name: 'mu', default: 10, range: [1, 50], scale: 'linear', positive: true, description: 'field value where V = 0' },
      { name: 'q', default: 4, range: [2, 8], scale: 'linear', positive: true, description: 'power of the hilltop' },
    ],
    fieldDomain: { min: '0', max: 'mu' },
    description: 'Small-field inflation rolling off a maximum at phi = 0 towards V = 0 at mu.',
    reference: 'L. Boubekeur & D. H. Lyth, "Hilltop inflation", JCAP 07 (2005) 010',
  },
  {
    id: 'exponential', label: 'Exponential (power-law inflation)', expression: 'V0 * exp(-lambda * phi)',
    parameters: [V0, { name: 'lambda', default: 0.2, range: [0.01, 1.2], scale: 'linear', description: 'slope, eps1 = lambda^2/2' }],
    fieldDomain: { min: '-100', max: '100' }, needsEndPhi: true,
    description: 'Power-law inflation with exact spectra; eps1 is constant, so the end field must be given.',
    reference: 'F. Lucchin & S. Matarrese, "Power-law inflation", Phys. Rev. D 32, 1316 (1985)',
  },
];

export interface CompiledFamily extends GeneratedPotential {
  readonly family: PotentialFamily;
  /** Default value of every parameter, for `resolveParameters`. */
  readonly defaults: Readonly<Record<string, number>>;
  /** Parameters that must be > 0 (FamilyParameter.positive). */
  readonly positive: readonly string[];
  /** Generated statements of the search interval for phi0 (`family.fieldDomain`; V is the bound). */
  readonly domainCode: { readonly min: string; readonly max: string };
}

/** Names of the family's parameters that must be > 0. */
export const positiveParameters = (family: PotentialFamily): string[] => family.parameters.filter((p) => p.positive).map((p) => p.name);

export function getFamily(id: string): PotentialFamily {
  const family = FAMILIES.find((f) => f.id === id);
  if (family === undefined) {
    throw new InvalidInputError(
      `family: unknown family "${id}"; built-in families: ${FAMILIES.map((f) => f.id).join(', ')}`,
      'family', 'unknown_family');
  }
  return family;
}

// Compiling differentiates symbolically and generates code: do it once per family.
const cache = new Map<string, CompiledFamily>();

export function compileFamily(id: string): CompiledFamily {
  const cached = cache.get(id);
  if (cached !== undefined) return cached;
  const family = getFamily(id);
  const names = family.parameters.map((p) => p.name);
  const potential = compileExpression(family.expression, names);
  // Domain bounds are constant in phi: compiled the same way, the bound being V.
  const minBound = compileExpression(family.fieldDomain.min, names, 'fieldDomain.min');
  const maxBound = compileExpression(family.fieldDomain.max, names, 'fieldDomain.max');
  const compiled: CompiledFamily = {
    ...potential,
    family,
    domainCode: { min: minBound.code, max: maxBound.code },
    defaults: Object.fromEntries(family.parameters.map((p) => [p.name, p.default])),
    positive: positiveParameters(family),
  };
  cache.set(id, compiled);
  return compiled;
}
