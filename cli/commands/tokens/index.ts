import { Command } from 'commander';
import { examples } from '../../help.ts';
import { create } from './create.ts';
import { list } from './list.ts';
import { revoke } from './revoke.ts';

export const tokens = new Command('tokens')
  .description('API tokens for scripts: create, list, revoke')
  .addCommand(create)
  .addCommand(list)
  .addCommand(revoke)
  .addHelpText('after', examples('rollway tokens create --name ci --scopes read,submit --days 30', 'rollway tokens list', 'rollway tokens revoke 3'));
