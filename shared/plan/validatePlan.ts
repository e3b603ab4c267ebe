import { PlanValidationError } from './planError.ts';
import { checkPlanSemantics } from './planChecks.ts';
import { planErrorMap, toPlanIssues } from './planIssues.ts';
import { readPlanText, type PlanFormat } from './planText.ts';
import { scanPlanSchema, type ScanPlan } from './scanPlan.ts';

export type { PlanFormat } from './planText.ts';

/**
 * Validates a plan and reports every problem at once: the shape of each field (scanPlanSchema)
 * and the checks across fields (planChecks.ts) run on the same document in one pass.
 * Throws PlanValidationError; nothing about an invalid plan should be stored.
 */
export function validatePlan(data: unknown): ScanPlan {
  if (typeof data !== 'object' || data === null || Array.isArray(data)) {
    throw new PlanValidationError([{ path: '', message: 'the plan must be a mapping (YAML) or an object (JSON) of fields such as title, potential, axes' }]);
  }
  const parsed = scanPlanSchema.safeParse(data, { error: planErrorMap });
  const issues = [...(parsed.success ? [] : toPlanIssues(parsed.error.issues)), ...checkPlanSemantics(data)];
  if (issues.length > 0 || !parsed.success) throw new PlanValidationError(issues);
  return parsed.data;
}

/** Reads and validates a plan's text (YAML unless `format` or a leading "{" says JSON). */
export function parsePlanText(text: string, format?: PlanFormat): ScanPlan {
  return validatePlan(readPlanText(text, format));
}
