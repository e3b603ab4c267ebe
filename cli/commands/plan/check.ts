import { Command } from 'commander';
import { EXIT } from '../../handleError.ts';
import { examples } from '../../help.ts';
import { printJson } from '../../output.ts';
import { readPlanFile } from '../../planFile.ts';
import { count } from '../../terminal.ts';

interface CheckResult { file: string; valid: boolean; pointCount: number | null; issues: Array<{ path: string; message: string }> }

/** Validates on this machine with the server's own rules: every problem with its field path. */
async function checkPlan(file: string): Promise<CheckResult> {
  const { planText, format } = await readPlanFile(file);
  const [{ parsePlanText }, { planPointCount }, { PlanValidationError }] = await Promise.all([
    import('../../../shared/plan/validatePlan.ts'), import('../../../shared/plan/expandPlan.ts'), import('../../../shared/plan/planError.ts'),
  ]);
  try {
    const plan = parsePlanText(planText, format);
    return { file, valid: true, pointCount: planPointCount(plan), issues: [] };
  } catch (error) {
    if (!(error instanceof PlanValidationError)) throw error;
    return { file, valid: false, pointCount: null, issues: [...error.issues] };
  }
}

export const check = new Command('check')
  .description('validate a scan plan on this machine: its point count, or every problem with its field path (exit 2)')
  .argument('<FILE>', 'scan plan (YAML, or JSON when it ends in .json)')
  .option('--json', 'print {file, valid, pointCount, issues} as JSON')
  .addHelpText('after', examples('rollway plan check examples/quick-check.yaml', 'rollway plan check plan.yaml && rollway submit plan.yaml --watch'))
  .action(async (file: string, options: { json?: boolean }) => {
    const result = await checkPlan(file);
    if (!result.valid) process.exitCode = EXIT.usage;
    if (options.json) {
      printJson(result);
    } else if (result.valid) {
      process.stdout.write(`${file}: valid, ${count(result.pointCount!)} points\n`);
    } else {
      const head = `${file}: ${result.issues.length === 1 ? '1 problem' : `${result.issues.length} problems`}`;
      const lines = result.issues.map((i) => `  ${i.path === '' ? '' : `${i.path}: `}${i.message}`);
      process.stderr.write(`${[head, ...lines].join('\n')}\n`);
    }
  });
