import { canonicalJson } from './canonicalJson.ts';
import { validatePlan, parsePlanText } from './validatePlan.ts';

/**
 * A plan's identity for tracing results back to it: SHA-256 of its canonical JSON. The text is
 * read and validated first, so comments, layout, key order and spelled-out defaults
 * (`combine: grid`) do not change the hash, while any value that does change (title and notes
 * included) does. Web Crypto, so it runs the same in the browser and in Node 20.
 */

/** Hex SHA-256 of the validated plan's canonical JSON; `plan` is its text or its data. */
export async function planHash(plan: unknown): Promise<string> {
  const validated = typeof plan === 'string' ? parsePlanText(plan) : validatePlan(plan);
  const bytes = new TextEncoder().encode(canonicalJson(validated));
  const digest = await crypto.subtle.digest('SHA-256', bytes);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}
