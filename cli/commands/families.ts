import { Command } from 'commander';
import { pointRequestSchema } from '../../shared/plan/pointRequest.ts';
import { examples } from '../help.ts';
import { printPointTable } from '../output.ts';

/** End fields for families that never end by themselves, so the table can include them. */
const END_PHI: Record<string, number> = { exponential: 10 };

export const families = new Command('families')
  .description('compute every built-in family at its default parameters (N_* = 55, exact spectra) and print a table')
  .option('--pivot-efolds <N>', 'e-folds between the pivot and the end of inflation', '55')
  .addHelpText('after', examples('rollway families', 'rollway families --pivot-efolds 60'))
  .action(async (options: { pivotEfolds: string }) => {
    const [{ FAMILIES }, { computePoint }, { preparePoint }] = await Promise.all([
      import('../../shared/physics/potential/families.ts'),
      import('../../shared/physics/point/computePoint.ts'),
      import('../../shared/physics/point/preparePoint.ts'),
    ]);
    const rows = FAMILIES.map((family) => {
      const request = pointRequestSchema.parse({
        potential: { family: family.id },
        pivot: { efolds: Number(options.pivotEfolds) },
        endPhi: END_PHI[family.id],
        exact: true,
      });
      return { label: family.id, result: computePoint(preparePoint(request)) };
    });
    printPointTable(rows);
  });
