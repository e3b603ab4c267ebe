import { Command } from 'commander';
import { createApiClient } from '../../shared/api/client.ts';
import { credentialsPath, readStored, removeStored } from '../credentials.ts';
import { examples } from '../help.ts';

/** Ends the session on the server when it can, and always forgets the stored credential. */
async function logout(): Promise<void> {
  const stored = await readStored();
  if (!stored) {
    process.stdout.write('not signed in: no stored credential\n');
    return;
  }
  if (stored.kind === 'session') {
    await createApiClient({ url: stored.url, token: stored.token, timeoutSeconds: 10 }).logout().catch((error: Error) => {
      process.stderr.write(`rollway: could not end the session on the server (${error.message}); the stored credential is removed anyway\n`);
    });
  }
  await removeStored();
  process.stdout.write(`signed out of ${stored.url}; removed ${credentialsPath()}\n`);
  if (stored.kind === 'token') process.stderr.write('the API token itself stays valid until it expires or is revoked (rollway tokens revoke ID)\n');
  if (process.env.ROLLWAY_TOKEN) process.stderr.write('rollway: note: ROLLWAY_TOKEN is still set in this shell\n');
}

export const logoutCommand = new Command('logout')
  .description('end the session on the server and remove the stored credential')
  .addHelpText('after', examples('rollway logout'))
  .action(logout);
