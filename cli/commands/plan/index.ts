import { Command } from 'commander';
import { examples } from '../../help.ts';
import { check } from './check.ts';
import { create } from './new.ts';

export const plan = new Command('plan')
  .description('write and check scan plans on this machine (no server needed)')
  .addCommand(check)
  .addCommand(create)
  .addHelpText('after', examples('rollway plan new --family e-model --out e-model.yaml', 'rollway plan check e-model.yaml'));
