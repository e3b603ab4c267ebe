/**
 * Turns named parameter values (from a scan plan, the CLI's --param or an API request) into the
 * vector a `PotentialEvaluator` reads, in `CompiledPotential.parameterNames` order.
 */
import { InvalidInputError } from '../../errors.ts';

/**
 * `given` overrides `defaults`; every name needs one or the other. Lookups use own properties only,
 * so a key like `constructor` is never read from Object.prototype.
 */
export function resolveParameters(
  names: readonly string[],
  defaults: Readonly<Record<string, number>>,
  given: Readonly<Record<string, number>>,
  field = 'params',
): Float64Array {
  const allowed = names.length > 0 ? names.join(', ') : 'none';
  for (const key of Object.keys(given)) {
    if (!names.includes(key)) {
      throw new InvalidInputError(
        `${field}.${key}: unknown parameter "${key}"; allowed parameters: ${allowed}`,
        `${field}.${key}`, 'invalid_parameter');
    }
  }
  const values = new Float64Array(names.length);
  const missing: string[] = [];
  names.forEach((name, i) => {
    const source = Object.hasOwn(given, name) ? given : Object.hasOwn(defaults, name) ? defaults : undefined;
    if (source === undefined) {
      missing.push(name);
      return;
    }
    const value: unknown = source[name];
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      throw new InvalidInputError(
        `${field}.${name}: must be a finite number, got ${typeof value === 'number' ? value : JSON.stringify(value) ?? String(value)}`,
        `${field}.${name}`, 'invalid_parameter');
    }
    values[i] = value;
  });
  if (missing.length > 0) {
    throw new InvalidInputError(
      `${field}.${missing[0]}: no value given and no default for ${missing.map((m) => `"${m}"`).join(', ')}`,
      `${field}.${missing[0]}`, 'invalid_parameter');
  }
  return values;
}
