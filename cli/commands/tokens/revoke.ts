import { Command } from 'commander';
import { connect } from '../../connect.ts';
import { examples } from '../../help.ts';
import { positiveId } from '../../planFile.ts';

export const revoke = new Command('revoke')
  .description('revoke one of your API tokens; scripts using it get "not signed in" from now on')
  .argument('<ID>', 'token id (see rollway tokens list)')
  .addHelpText('after', examples('rollway tokens revoke 3'))
  .action(async (id: string) => {
    const tokenId = positiveId(id);
    const { client } = await connect();
    await client.tokens.revoke(tokenId);
    process.stdout.write(`token ${tokenId} revoked\n`);
  });
