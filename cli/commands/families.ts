import { Command } from 'commander';
import { FAMILIES } from '../../shared/physics/potential/families.ts';
import { computePoint } from '../../shared/physics/point/computePoint.ts';
import { preparePoint } from '../../shared/physics/point/preparePoint.ts';
import { pointRequestSchema } from '../../shared/plan/pointRequest.ts';
import { printPointTable } from '../output.ts';

/** End fields for families that never end by themselves, so the demo can include them. */
const DEMO_END_PHI: Record<string, number> = { exponential: 10 };

export const demo = new Command('demo')
  .description('compute every built-in family at its default parameters (N_* = 55, exact spectra) and print a table')
  .option('--pivot-efolds <N>', 'e-folds between the pivot and the end of inflation', '55')
  .action((options: { pivotEfolds: string }) => {
    const rows = FAMILIES.map((family) => {
      const request = pointRequestSchema.parse({
        potential: { family: family.id },
        pivot: { efolds: Number(options.pivotEfolds) },
        endPhi: DEMO_END_PHI[family.id],
        exact: true,
      });
      return { label: family.id, result: computePoint(preparePoint(request)) };
    });
    printPointTable(rows);
  });
