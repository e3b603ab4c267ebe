import { readdir, readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { parsePlanText } from '../../shared/plan/validatePlan.ts';
import { planHash } from '../../shared/plan/planHash.ts';
import type { Actor } from '../auth/actor.ts';
import type { ScansService } from '../scans/scansService.ts';

const EXAMPLES = fileURLToPath(new URL('../../examples/', import.meta.url));

/**
 * Submits every example plan of the demo scenario that is not stored yet (matched by plan hash),
 * owned by `owner` and shared with their first group when given.
 */
export async function seedDemo(scans: ScansService, owner?: Actor): Promise<string[]> {
  const stored = new Set((await scans.list()).map((s) => s.planHash));
  const submitted: string[] = [];
  for (const name of (await readdir(EXAMPLES)).filter((f) => /\.ya?ml$/.test(f)).sort()) {
    const planText = await readFile(`${EXAMPLES}${name}`, 'utf8');
    if (stored.has(await planHash(parsePlanText(planText)))) continue;
    const groupId = owner?.groupIds[0];
    await scans.submit({ planText, ...(groupId === undefined ? {} : { groupId }) }, owner);
    submitted.push(name);
  }
  return submitted;
}
