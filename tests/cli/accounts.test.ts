import { existsSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { FakeSmtp } from '../../server/mail/fakeSmtp.ts';
import { call, inviteAndJoin, startServerWithMail, type TestServer } from '../helpers/accounts.ts';
import { TEST_ADMIN } from '../helpers/auth.ts';
import { cliHome, rollway, rollwayOnTty } from './runCli.ts';

/** login, whoami, tokens, admin and logout through the real CLI against a real server with accounts. */

// Each test starts several CLI processes (about a second of CPU each); on a loaded machine that is slow.
vi.setConfig({ testTimeout: 120_000 });

const PLAN = 'title: token test\npotential: { family: quadratic }\naxes:\n  - { name: pivotEfolds, values: [50, 55] }\n';
const NO_STACK = /\n\s+at /;

let server: TestServer;
let smtp: FakeSmtp;
let researcher: Awaited<ReturnType<typeof inviteAndJoin>>;
let collaborator: Awaited<ReturnType<typeof inviteAndJoin>>;
const RIA = 'ria@cli.test';
const credentialFile = (home: Record<string, string>) => join(home.XDG_CONFIG_HOME!, 'rollway', 'credentials.json');
const stored = (home: Record<string, string>) => JSON.parse(readFileSync(credentialFile(home), 'utf8'));

/** A fresh home signed in with --password-stdin. */
async function signedIn(email: string, password: string): Promise<Record<string, string>> {
  const home = cliHome();
  const out = await rollway(['login', '--url', server.url, '--email', email, '--password-stdin'], { env: home, input: `${password}\n` });
  expect(out.code, out.stderr).toBe(0);
  return home;
}

beforeAll(async () => {
  ({ server, smtp } = await startServerWithMail());
  [researcher, collaborator] = await Promise.all([
    inviteAndJoin(server, smtp, { email: RIA, role: 'researcher' }),
    inviteAndJoin(server, smtp, { email: 'cal@cli.test', role: 'collaborator' }),
  ]);
}, 120_000);
afterAll(async () => {
  await server?.stop();
  await smtp?.close();
});

/** Signed in once as the researcher by the first test, used by the later ones. */
let home: Record<string, string>;

describe('rollway login / whoami / logout', () => {
  it('signs in with --password-stdin and keeps the session in a 0600 file under XDG_CONFIG_HOME', async () => {
    home = cliHome();
    const out = await rollway(['login', '--url', server.url, '--email', RIA, '--password-stdin'], { env: home, input: `${researcher.password}\n` });
    expect(out.code, out.stderr).toBe(0);
    expect(out.stdout).toMatch(new RegExp(`^signed in to ${server.url} as ${RIA} \\(session until \\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d UTC\\)\\n$`));
    expect(statSync(credentialFile(home)).mode & 0o777).toBe(0o600);
    expect(statSync(join(home.XDG_CONFIG_HOME!, 'rollway')).mode & 0o077).toBe(0);
    expect(stored(home)).toMatchObject({ url: server.url, kind: 'session', email: RIA, token: expect.stringMatching(/^[\w-]+\.[\w-]+\.[\w-]+$/) });
  });

  it('whoami shows user, role and quota left, and --json is the answer of /auth/me', async () => {
    const [text, json] = await Promise.all([rollway(['whoami'], { env: home }), rollway(['whoami', '--json'], { env: home })]);
    expect(text.code, text.stderr).toBe(0);
    expect(text.stdout).toMatch(new RegExp(`^user\\s+.*<${RIA}>\\n`));
    expect(text.stdout).toMatch(/\nrole\s+researcher\n/);
    expect(text.stdout).toMatch(/\nquota\s+[\d,]+ of [\d,]+ points left this month \(resets \d{4}-\d\d-\d\d\); 0\/\d+ scans running\n/);
    const me = await call(server.url, 'GET', '/auth/me', { token: stored(home).token });
    expect(JSON.parse(json.stdout)).toEqual(me.body);
  });

  it('refuses a wrong password (exit 3) and stores nothing', async () => {
    const fresh = cliHome();
    const out = await rollway(['login', '--url', server.url, '--email', RIA, '--password-stdin'], { env: fresh, input: 'not the password\n' });
    expect(out.code).toBe(3);
    expect(out.stderr).toMatch(/^rollway: not signed in: .*check the e-mail and password\n$/);
    expect(existsSync(credentialFile(fresh))).toBe(false);
  });

  let ttyHome: Record<string, string>;
  it('asks for the password on a terminal without echoing it', async () => {
    const fresh = (ttyHome = cliHome());
    const out = await rollwayOnTty(['login', '--url', server.url, '--email', RIA], { env: fresh, answer: { after: /Password for ria@cli\.test at /, text: `${researcher.password}\r` } });
    expect(out.code, out.stdout).toBe(0);
    expect(out.stdout).toMatch(/signed in to .* as ria@cli\.test/);
    expect(out.stdout).not.toContain(researcher.password);
    expect(stored(fresh).kind).toBe('session');
  });

  it('says how to give the password when there is no terminal, and checks --url and --token (exit 2)', async () => {
    const fresh = cliHome();
    const runs = await Promise.all([
      rollway(['login', '--url', server.url, '--email', RIA], { env: fresh }),
      rollway(['login', '--email', RIA, '--password-stdin'], { env: fresh, input: 'x\n' }),
      rollway(['login', '--url', server.url, '--token', 'abc'], { env: fresh }),
    ]);
    const messages = [/pipe it in with --password-stdin/, /--url: give the server/, /--token: an API token starts with rwt_/];
    runs.forEach((out, i) => {
      expect(out.code).toBe(2);
      expect(out.stderr).toMatch(messages[i]!);
    });
  });

  it('logout ends the session on the server and removes the file; the old token is refused (exit 3)', async () => {
    const session = ttyHome;
    const token = stored(session).token;
    const out = await rollway(['logout'], { env: session });
    expect(out.code, out.stderr).toBe(0);
    expect(out.stdout).toMatch(new RegExp(`^signed out of ${server.url}; removed `));
    expect(existsSync(credentialFile(session))).toBe(false);
    const again = await rollway(['whoami'], { env: { ...cliHome(), ROLLWAY_URL: server.url, ROLLWAY_TOKEN: token } });
    expect(again.code).toBe(3);
    expect(again.stderr).toMatch(/^rollway: not signed in: .*; the server does not accept the credential in ROLLWAY_TOKEN: make a new token/);
    expect(again.stderr).not.toMatch(NO_STACK);
  });
});

describe('rollway tokens', () => {
  it('creates a token (secret once, on stdout), signs in with it, is refused what its scope lacks, and is revoked', async () => {
    const created = await rollway(['tokens', 'create', '--name', 'laptop cron', '--scopes', 'read', '--days', '7'], { env: home });
    expect(created.code, created.stderr).toBe(0);
    expect(created.stdout).toMatch(/^rwt_\S+\n$/);
    expect(created.stderr).toMatch(/token \d+ "laptop cron" \(read\) valid until .*Copy the secret now: it is not shown again/);
    const secret = created.stdout.trim();

    const [list, table] = await Promise.all([rollway(['tokens', 'list', '--json'], { env: home }), rollway(['tokens', 'list'], { env: home })]);
    const token = JSON.parse(list.stdout).find((t: any) => t.name === 'laptop cron');
    expect(token).toMatchObject({ scopes: ['read'], revoked: false });
    expect(list.stdout).not.toContain(secret);
    expect(table.stdout).toMatch(new RegExp(`\\n\\s*${token.id}\\s+laptop cron\\s+read\\s+\\S+\\s+\\d{4}-\\d\\d-\\d\\d\\s+\\S+\\s+active\\n`));

    const machine = cliHome();
    const login = await rollway(['login', '--url', server.url, '--token', secret], { env: machine });
    expect(login.code, login.stderr).toBe(0);
    expect(stored(machine)).toMatchObject({ kind: 'token', email: RIA, token: secret });
    const planFile = join(machine.HOME!, 'plan.yaml');
    writeFileSync(planFile, PLAN);
    const [whoami, scans, submit, admin] = await Promise.all([
      rollway(['whoami'], { env: machine }),
      rollway(['scans', '--json'], { env: machine }),
      rollway(['submit', planFile], { env: machine }),
      rollway(['admin', 'users'], { env: machine }),
    ]);
    expect(whoami.stdout).toMatch(/signed in\s+API token \(read\) until/);
    expect(scans.code, scans.stderr).toBe(0);
    for (const denied of [submit, admin]) {
      expect(denied.code).toBe(3);
      expect(denied.stderr).toMatch(/^rollway: not allowed: .*; ask an admin if you need this\n$/);
    }

    const revoked = await rollway(['tokens', 'revoke', String(token.id)], { env: home });
    expect(revoked.stdout).toBe(`token ${token.id} revoked\n`);
    const after = await rollway(['whoami'], { env: machine });
    expect(after.code).toBe(3);
    expect(after.stderr).toMatch(/^rollway: not signed in: .*; sign in again with rollway login --url URL --email E\n$/);
  });

  it('ROLLWAY_TOKEN overrides the stored credential; a bogus one exits 3', async () => {
    const [asCollaborator, bogus] = await Promise.all([
      rollway(['whoami', '--json'], { env: { ...home, ROLLWAY_TOKEN: collaborator.token } }),
      rollway(['scans'], { env: { ...home, ROLLWAY_TOKEN: 'rwt_not-a-real-token' } }),
    ]);
    expect(JSON.parse(asCollaborator.stdout).user).toMatchObject({ email: 'cal@cli.test', role: 'collaborator' });
    expect(bogus.code).toBe(3);
    expect(bogus.stderr).toMatch(/^rollway: not signed in: .*ROLLWAY_TOKEN/);
  });
});

describe('rollway submit --group', () => {
  it('shares a scan with a group of the submitter, and refuses one they are not in (exit 2)', async () => {
    const group = await call(server.url, 'POST', '/admin/groups', { token: server.adminToken, json: { name: 'CLI team' } });
    await call(server.url, 'POST', `/admin/groups/${group.body.id}/members`, { token: server.adminToken, json: { userId: researcher.id } });
    const other = await call(server.url, 'POST', '/admin/groups', { token: server.adminToken, json: { name: 'Not ours' } });
    const planFile = join(home.HOME!, 'group-plan.yaml');
    writeFileSync(planFile, PLAN);
    const [shared, refused] = await Promise.all([
      rollway(['submit', planFile, '--group', String(group.body.id), '--json'], { env: home }),
      rollway(['submit', planFile, '--group', String(other.body.id)], { env: home }),
    ]);
    expect(shared.code, shared.stderr).toBe(0);
    expect(JSON.parse(shared.stdout)).toMatchObject({ group: { id: group.body.id, name: 'CLI team' }, owner: { email: RIA } });
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(new RegExp(`^rollway: groupId: you are not a member of a group with id ${other.body.id}`));
  });
});

describe('rollway admin', () => {
  it('lists users, sets a quota by e-mail, reports usage; non-admins get exit 3', async () => {
    const admin = await signedIn(TEST_ADMIN.email, TEST_ADMIN.password);
    const ria = home;
    const [users, usersJson, usage, badMonth, denied] = await Promise.all([
      rollway(['admin', 'users'], { env: admin }),
      rollway(['admin', 'users', '--json'], { env: admin }),
      rollway(['admin', 'usage', '--json'], { env: admin }),
      rollway(['admin', 'usage', '--month', '2025-13'], { env: admin }),
      rollway(['admin', 'users'], { env: ria }),
    ]);
    expect(users.stdout).toMatch(/^ID\s+EMAIL\s+NAME\s+ROLE\s+STATE\s+GROUPS\s+POINTS THIS MONTH\s+MAX RUNNING\n/);
    expect(users.stdout).toMatch(new RegExp(`\\n\\s*${researcher.id}\\s+${RIA}\\s+.*researcher\\s+active`));
    expect(JSON.parse(usersJson.stdout).map((u: any) => u.email)).toEqual(expect.arrayContaining([TEST_ADMIN.email, RIA, 'cal@cli.test']));
    const { body: expectedUsage } = await call(server.url, 'GET', '/admin/usage', { token: server.adminToken });
    expect(JSON.parse(usage.stdout)).toEqual(expectedUsage);
    expect(badMonth.code).toBe(2);
    expect(badMonth.stderr).toMatch(/--month: "2025-13" must be a month as YYYY-MM/);
    expect(denied.code).toBe(3);
    expect(denied.stderr).toMatch(/^rollway: not allowed: /);

    const set = await rollway(['admin', 'quota', 'set', RIA, '1234', '--max-running', '2'], { env: admin });
    expect(set.code, set.stderr).toBe(0);
    expect(set.stdout).toBe(`${RIA}: 1,234 points a month, 2 scans at once\n`);
    const [me, unknown, notNumber] = await Promise.all([
      rollway(['whoami', '--json'], { env: ria }),
      rollway(['admin', 'quota', 'set', 'nobody@cli.test', '5'], { env: admin }),
      rollway(['admin', 'quota', 'set', RIA, 'lots'], { env: admin }),
    ]);
    expect(JSON.parse(me.stdout).quota).toMatchObject({ monthlyPoints: 1234, maxRunning: 2 });
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/USER: no user with e-mail "nobody@cli.test"/);
    expect(notNumber.code).toBe(2);
    expect(notNumber.stderr).toMatch(/POINTS: "lots" must be a whole number from 0 to 1,000,000,000, or "default"/);
  });
});
