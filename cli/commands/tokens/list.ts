import { Command } from 'commander';
import type { ApiToken } from '../../../shared/api/accounts.ts';
import { connect } from '../../connect.ts';
import { examples } from '../../help.ts';
import { printJson } from '../../output.ts';
import { printTable, type Column } from '../../table.ts';
import { painter } from '../../terminal.ts';

const state = (t: ApiToken): string => (t.revoked ? 'revoked' : Date.parse(t.expiresAt) <= Date.now() ? 'expired' : 'active');

export const list = new Command('list')
  .description('list your API tokens (never their secrets)')
  .option('--json', 'print the list as a JSON array')
  .addHelpText('after', examples('rollway tokens list'))
  .action(async (options: { json?: boolean }) => {
    const { client } = await connect();
    const tokens = await client.tokens.list();
    if (options.json) {
      printJson(tokens);
      return;
    }
    const paint = painter();
    const columns: Column<ApiToken>[] = [
      { header: 'ID', value: (t) => String(t.id), right: true },
      { header: 'NAME', value: (t) => t.name },
      { header: 'SCOPES', value: (t) => t.scopes.join(',') },
      { header: 'PREFIX', value: (t) => t.prefix },
      { header: 'EXPIRES', value: (t) => t.expiresAt.slice(0, 10) },
      { header: 'LAST USED', value: (t) => t.lastUsedAt?.slice(0, 10) ?? '—' },
      { header: 'STATE', value: (t) => paint(state(t) === 'active' ? 'green' : 'dim', state(t)) },
    ];
    printTable(columns, tokens, 'No API tokens: create one with rollway tokens create --name N');
  });
