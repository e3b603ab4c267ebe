import type { z } from 'zod';
import type { PlanIssue } from './planError.ts';

/**
 * Turns zod's issues into plan issues: a path like `axes[1].count` and a message that says what is
 * allowed. Fields with their own message keep it (zod lets a schema's message win over this map).
 */

export function got(input: unknown): string {
  if (input === undefined) return 'nothing';
  if (typeof input === 'number') return String(input);
  if (Array.isArray(input)) return `a list of ${input.length}`;
  if (typeof input === 'object' && input !== null) return 'a mapping';
  const shown = JSON.stringify(input) ?? String(input);
  return shown.length > 60 ? `${shown.slice(0, 57)}...` : shown;
}

const EXPECTED: Readonly<Record<string, string>> = {
  number: 'a finite number', int: 'a whole number', string: 'a string', boolean: 'true or false',
  array: 'a list', tuple: 'a list', object: 'a mapping', record: 'a mapping', nan: 'a finite number',
};

/** The object schema that raised an issue, to list its allowed fields (zod 4 passes it as `inst`). */
function shapeKeys(inst: unknown): string[] {
  const def = (inst as { _zod?: { def?: { shape?: unknown } } } | undefined)?._zod?.def;
  return typeof def?.shape === 'object' && def.shape !== null ? Object.keys(def.shape) : [];
}

function bound(iss: { minimum?: unknown; maximum?: unknown; inclusive?: boolean; origin?: string }, lower: boolean): string {
  const limit = String(lower ? iss.minimum : iss.maximum);
  if (iss.origin === 'string') return lower ? `must be at least ${limit} characters long` : `must be at most ${limit} characters long`;
  if (iss.origin === 'array') return lower ? `must have at least ${limit} entries` : `must have at most ${limit} entries`;
  const op = lower ? (iss.inclusive ? '>=' : '>') : (iss.inclusive ? '<=' : '<');
  return `must be ${op} ${limit}`;
}

/** Passed to safeParse as its error map; returns undefined to keep zod's message. */
export const planErrorMap: z.core.$ZodErrorMap = (iss) => {
  switch (iss.code) {
    case 'invalid_type': {
      const expected = EXPECTED[iss.expected] ?? iss.expected;
      return iss.input === undefined ? `required: ${expected}` : `must be ${expected}; got ${got(iss.input)}`;
    }
    case 'too_small':
      return `${bound(iss, true)}; got ${got(iss.input)}`;
    case 'too_big':
      return `${bound(iss, false)}; got ${got(iss.input)}`;
    case 'invalid_value':
      return `must be one of ${iss.values.map((v) => JSON.stringify(v)).join(', ')}; got ${got(iss.input)}`;
    case 'unrecognized_keys': {
      const allowed = shapeKeys(iss.inst);
      const unknown = iss.keys.map((k) => `"${k}"`).join(', ');
      const noun = iss.keys.length === 1 ? 'unknown field' : 'unknown fields';
      return allowed.length > 0 ? `${noun} ${unknown}; allowed: ${allowed.join(', ')}` : `${noun} ${unknown}`;
    }
    case 'invalid_union':
      return 'does not match any of the allowed forms';
    default:
      return undefined;
  }
};

const IDENTIFIER = /^[A-Za-z_$][A-Za-z0-9_$]*$/;

export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else if (typeof key === 'string' && IDENTIFIER.test(key)) out += out === '' ? key : `.${key}`;
    else out += `[${JSON.stringify(String(key))}]`;
  }
  return out;
}

/**
 * A union's issue becomes the issues of the one form the value was meant as — every form but one
 * failed on the type alone (a string where a bound set was expected) — else stays one issue.
 */
export function toPlanIssues(issues: readonly z.core.$ZodIssue[], prefix: readonly PropertyKey[] = []): PlanIssue[] {
  const out: PlanIssue[] = [];
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    if (issue.code === 'invalid_union') {
      const meant = issue.errors.filter((b) => !(b.length === 1 && b[0]?.code === 'invalid_type' && b[0].path.length === 0));
      if (meant.length === 1) {
        out.push(...toPlanIssues(meant[0]!, path));
        continue;
      }
    }
    out.push({ path: formatPath(path), message: issue.message });
  }
  return out;
}
