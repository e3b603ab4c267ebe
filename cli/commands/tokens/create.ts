import { Command } from 'commander';
import { TOKEN_SCOPES, type TokenScope } from '../../../shared/api/accounts.ts';
import { InvalidInputError } from '../../../shared/errors.ts';
import { connect } from '../../connect.ts';
import { examples } from '../../help.ts';
import { printJson } from '../../output.ts';

interface CreateOptions { name: string; scopes: string; days: string; json?: boolean }

export const create = new Command('create')
  .description('create an API token for scripts; its secret is printed once, on stdout')
  .requiredOption('--name <name>', 'what the token is for, e.g. "laptop cron"')
  .option('--scopes <list>', `comma list of ${TOKEN_SCOPES.join(', ')}`, 'read')
  .option('--days <n>', 'days until it expires (1 to 365)', '90')
  .option('--json', 'print {token, secret} as JSON')
  .addHelpText('after', examples(
    'rollway tokens create --name "cluster jobs" --scopes read,submit --days 30',
    'export ROLLWAY_TOKEN=$(rollway tokens create --name ci --days 7)',
  ))
  .action(async (options: CreateOptions) => {
    const scopes = options.scopes.split(',').map((s) => s.trim()).filter((s) => s !== '');
    const bad = scopes.find((s) => !(TOKEN_SCOPES as readonly string[]).includes(s));
    if (bad !== undefined || scopes.length === 0) throw new InvalidInputError(`--scopes: "${options.scopes}" must be a comma list of ${TOKEN_SCOPES.join(', ')}`, '--scopes');
    if (!/^\d{1,3}$/.test(options.days)) throw new InvalidInputError(`--days: "${options.days}" must be a whole number from 1 to 365`, '--days');
    const { client } = await connect();
    const created = await client.tokens.create({ name: options.name, scopes: scopes as TokenScope[], expiresInDays: Number(options.days) });
    if (options.json) {
      printJson(created);
      return;
    }
    const t = created.token;
    process.stderr.write(`token ${t.id} "${t.name}" (${t.scopes.join(', ')}) valid until ${t.expiresAt.slice(0, 10)}. Copy the secret now: it is not shown again.\n`);
    process.stdout.write(`${created.secret}\n`);
    process.stderr.write(`use it with ROLLWAY_TOKEN=<secret>, or rollway login --url ${client.url} --token <secret>\n`);
  });
