import { Command } from 'commander';
import { connect } from '../connect.ts';
import { examples } from '../help.ts';
import { printJson } from '../output.ts';
import { printFields } from '../table.ts';
import { count } from '../terminal.ts';

const day = (iso: string): string => iso.slice(0, 10);
const SOURCES = { env: 'ROLLWAY_TOKEN', file: 'the stored credential', none: 'no credential' } as const;

export const whoami = new Command('whoami')
  .description('who the server thinks you are: user, role, groups, quota left and the credential in use')
  .option('--json', 'print the answer of /auth/me as JSON')
  .addHelpText('after', examples('rollway whoami', 'rollway whoami --json | jq .quota.remainingPoints'))
  .action(async (options: { json?: boolean }) => {
    const { client, credential } = await connect();
    const me = await client.me();
    if (options.json) {
      printJson(me);
      return;
    }
    const q = me.quota;
    const how = me.auth.kind === 'token' ? `API token (${me.auth.scopes?.join(', ') ?? 'no scopes'})` : 'session';
    printFields([
      ['user', `${me.user.name || '—'} <${me.user.email}>`],
      ['role', me.user.role],
      ['groups', me.groups.map((g) => g.name).join(', ') || '—'],
      ['quota', q === null ? 'none (collaborators cannot submit)' : `${count(q.remainingPoints)} of ${count(q.monthlyPoints)} points left this month (resets ${day(q.resetsAt)}); ${q.running}/${q.maxRunning} scans running`],
      ['signed in', `${how} until ${me.auth.expiresAt.slice(0, 16).replace('T', ' ')} UTC, from ${SOURCES[credential.source]}`],
      ['server', client.url],
    ]);
  });
