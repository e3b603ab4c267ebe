import { validatePlan, parsePlanText } from './validatePlan.ts';

/**
 * A plan's identity for tracing results back to it: SHA-256 of its canonical JSON. The text is
 * read and validated first, so comments, layout, key order and spelled-out defaults
 * (`combine: grid`) do not change the hash, while any value that does change (title and notes
 * included) does. Web Crypto, so it runs the same in the browser and in Node 20.
 */

/** JSON with the keys of every object sorted; undefined fields left out, as JSON.stringify does. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  if (typeof value === 'object' && value !== null) {
    const entries = Object.keys(value)
      .sort()
      .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
      .map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`);
    return `{${entries.join(',')}}`;
  }
  return JSON.stringify(value) ?? 'null';
}

/** Hex SHA-256 of the validated plan's canonical JSON; `plan` is its text or its data. */
export async function planHash(plan: unknown): Promise<string> {
  const validated = typeof plan === 'string' ? parsePlanText(plan) : validatePlan(plan);
  const bytes = new TextEncoder().encode(canonicalJson(validated));
  const digest = await crypto.subtle.digest('SHA-256', bytes);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}
