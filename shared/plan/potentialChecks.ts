import { InvalidInputError } from '../errors.ts';
import { checkParameterNames, compileExpression } from '../physics/potential/expression.ts';
import { FAMILIES, positiveParameters } from '../physics/potential/families.ts';
import { parseTabulatedPotential } from '../physics/potential/tabulated.ts';
import type { PlanIssue } from './planError.ts';

/** What the rest of the checks need to know about a plan's potential. */
export interface PotentialFacts {
  /** How the messages name it: `the "e-model" family`, `the expression`, `the table`. */
  label: string;
  /** Names that may appear as axes or under fixed. */
  allowed: readonly string[];
  /** Names that need a value (an expression has no defaults besides V0). */
  required: readonly string[];
  /** The family never ends inflation by itself (DESIGN.md: exponential needs an end field). */
  needsEndPhi: boolean;
  /** Names whose values must be > 0 (a family's FamilyParameter.positive). */
  positive: readonly string[];
}

export const isRecord = (x: unknown): x is Record<string, unknown> =>
  typeof x === 'object' && x !== null && !Array.isArray(x);

/** The physics core's message "field: reason" or "field line 3: reason" as a plan issue. */
function fromInputError(err: unknown, path: string): PlanIssue {
  if (!(err instanceof InvalidInputError)) throw err;
  const rest = err.message.startsWith(path) ? err.message.slice(path.length).replace(/^:\s*/, '').trim() : err.message;
  return { path, message: rest };
}

/**
 * Checks the potential as the physics core will see it: a known family, an expression that
 * compiles with its declared parameters, a table that parses. Returns undefined when the potential
 * is not usable, so that name checks against it are skipped rather than reported twice.
 */
export function checkPotential(raw: unknown, issues: PlanIssue[]): PotentialFacts | undefined {
  if (!isRecord(raw)) return undefined;
  const { family, expression, table, parameters } = raw;
  const given = [family, expression, table].filter((x) => x !== undefined).length;
  if (given !== 1) return undefined; // scanPlanSchema says which to give

  if (typeof family === 'string' && family !== '') {
    const found = FAMILIES.find((f) => f.id === family);
    if (found === undefined) {
      issues.push({ path: 'potential.family', message: `unknown family "${family}"; built-in families: ${FAMILIES.map((f) => f.id).join(', ')}` });
      return undefined;
    }
    const names = found.parameters.map((p) => p.name);
    return { label: `the "${family}" family`, allowed: names, required: [], needsEndPhi: found.needsEndPhi === true, positive: positiveParameters(found) };
  }

  if (typeof expression === 'string' && expression !== '') {
    const declared = parameters === undefined ? [] : parameters;
    if (!Array.isArray(declared) || !declared.every((n): n is string => typeof n === 'string')) return undefined;
    try {
      checkParameterNames(declared, 'potential.parameters');
    } catch (err) {
      issues.push(fromInputError(err, 'potential.parameters'));
      return undefined;
    }
    try {
      compileExpression(expression, declared.filter((n) => n !== 'V0'), 'potential.expression');
    } catch (err) {
      issues.push(fromInputError(err, 'potential.expression'));
    }
    const allowed = declared.includes('V0') ? declared : [...declared, 'V0'];
    return { label: 'the expression', allowed, required: declared.filter((n) => n !== 'V0'), needsEndPhi: false, positive: [] };
  }

  if (typeof table === 'string' && table !== '') {
    try {
      parseTabulatedPotential(table, 'potential.table');
    } catch (err) {
      issues.push(fromInputError(err, 'potential.table'));
    }
    return { label: 'the table', allowed: ['V0'], required: [], needsEndPhi: false, positive: [] };
  }
  return undefined;
}
