import { Command } from 'commander';
import { API_TOKEN_PREFIX } from '../../shared/api/accounts.ts';
import { ApiError, createApiClient } from '../../shared/api/client.ts';
import { InvalidInputError, RollwayError } from '../../shared/errors.ts';
import { credentialsPath, writeStored, type StoredCredential } from '../credentials.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { askHidden, readStdin } from '../password.ts';

interface LoginOptions { url?: string; email?: string; passwordStdin?: boolean; token?: string; json?: boolean }

function serverUrl(option: string | undefined): string {
  const url = option ?? process.env.ROLLWAY_URL;
  if (!url) throw new InvalidInputError('--url: give the server, e.g. --url http://127.0.0.1:4600 (or set ROLLWAY_URL)', '--url');
  if (!/^https?:\/\/[^/\s]+/i.test(url)) throw new InvalidInputError(`--url: "${url}" is not an http:// or https:// address`, '--url');
  return url.replace(/\/+$/, '');
}

/** Signs in (password → session JWT, or an API token checked with /auth/me) and stores the credential. */
async function login(options: LoginOptions): Promise<void> {
  const url = serverUrl(options.url);
  let stored: StoredCredential;
  let expiresAt: string;
  if (options.token !== undefined) {
    if (!options.token.startsWith(API_TOKEN_PREFIX)) throw new InvalidInputError(`--token: an API token starts with ${API_TOKEN_PREFIX}; to sign in with a password give --email`, '--token');
    const me = await createApiClient({ url, token: options.token }).me();
    stored = { url, token: options.token, kind: 'token', email: me.user.email };
    expiresAt = me.auth.expiresAt;
  } else {
    if (!options.email) throw new InvalidInputError('--email: give the e-mail you sign in with (or --token rwt_… for an API token)', '--email');
    const password = options.passwordStdin ? await readStdin('--password-stdin') : await askHidden(`Password for ${options.email} at ${url}: `);
    const session = await createApiClient({ url }).login({ email: options.email, password }).catch((error: unknown) => {
      // Here a 401 is a wrong e-mail or password, not a session to renew.
      if (error instanceof ApiError && error.status === 401) throw new RollwayError(error.code, `not signed in: ${error.message} (${options.email} at ${url}); check the e-mail and password`, 401);
      throw error;
    });
    if (!session.token) throw new InvalidInputError('the server signed you in but sent no session token for the CLI; is it an older Rollway?', 'token');
    stored = { url, token: session.token, kind: 'session', email: session.user.email };
    expiresAt = session.expiresAt;
  }
  await writeStored(stored);
  if (options.json) {
    printJson({ url, kind: stored.kind, email: stored.email, expiresAt, path: credentialsPath() });
  } else {
    const what = stored.kind === 'token' ? 'API token' : 'session';
    process.stdout.write(`signed in to ${url} as ${stored.email} (${what} until ${expiresAt.slice(0, 16).replace('T', ' ')} UTC)\n`);
    process.stderr.write(`credential stored in ${credentialsPath()} (readable by you only)\n`);
  }
  if (process.env.ROLLWAY_TOKEN) process.stderr.write('rollway: note: ROLLWAY_TOKEN is set and is used instead of the stored credential\n');
}

export const loginCommand = new Command('login')
  .description('sign in to a Rollway server and store the credential for the next commands')
  .option('--url <url>', 'the server, e.g. http://127.0.0.1:4600 (env ROLLWAY_URL)')
  .option('--email <email>', 'your e-mail; the password is asked for on the terminal, without echo')
  .option('--password-stdin', 'read the password from stdin instead (for scripts)')
  .option('--token <rwt_…>', 'store this API token instead of signing in with a password')
  .option('--json', 'print {url, kind, email, expiresAt, path} as JSON')
  .addHelpText('after', examples(
    'rollway login --url http://127.0.0.1:4600 --email ada@example.org',
    'pass show rollway | rollway login --url https://rollway.example.org --email ada@example.org --password-stdin',
    'rollway login --url https://rollway.example.org --token rwt_…',
  ))
  .action(login);
