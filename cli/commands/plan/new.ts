import { writeFile } from 'node:fs/promises';
import { Command } from 'commander';
import { InvalidInputError } from '../../../shared/errors.ts';
import { examples } from '../../help.ts';

interface NewOptions { family: string; out?: string; force?: boolean }

export const create = new Command('new')
  .description('write a commented starter plan for a built-in family (it passes plan check as it is)')
  .requiredOption('--family <id>', 'built-in family: quadratic, monomial, starobinsky, natural, e-model, t-model, hilltop, exponential')
  .option('--out <file>', 'write to this file instead of stdout (never overwrites unless --force)')
  .option('--force', 'overwrite --out if it exists')
  .addHelpText('after', examples('rollway plan new --family t-model --out tmodel.yaml', 'rollway plan new --family hilltop | less'))
  .action(async (options: NewOptions) => {
    const [{ getFamily }, { starterPlan }] = await Promise.all([
      import('../../../shared/physics/potential/families.ts'), import('../../planTemplate.ts'),
    ]);
    const text = starterPlan(getFamily(options.family));
    if (options.out === undefined) {
      process.stdout.write(text);
      return;
    }
    await writeFile(options.out, text, { flag: options.force ? 'w' : 'wx' }).catch((error: NodeJS.ErrnoException) => {
      if (error.code === 'EEXIST') throw new InvalidInputError(`--out: "${options.out}" exists; choose another name or add --force`, '--out');
      throw new InvalidInputError(`--out: cannot write "${options.out}" (${error.code ?? error.message})`, '--out');
    });
    process.stderr.write(`wrote ${options.out}; check it with: rollway plan check ${options.out}\n`);
  });
