import { eq } from 'drizzle-orm';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../../server/config.ts';
import { apiTokens, linkTokens } from '../../../server/db/schema/accounts.ts';
import type { FakeSmtp } from '../../../server/mail/fakeSmtp.ts';
import { startServer } from '../../../server/startServer.ts';
import { call, inviteAndJoin, linkIn, startServerWithMail, type TestServer } from '../../helpers/accounts.ts';
import { waitForScan } from '../../helpers/server.ts';

const plan = (points: number, title = 'accounts test') =>
  `title: ${title}\npotential: { family: quadratic }\naxes:\n  - { name: pivotEfolds, range: { from: 50, to: 60, count: ${points} } }\n`;

describe('accounts: sign-in, sessions, tokens, groups, quotas, usage, mail', () => {
  let server: TestServer;
  let smtp: FakeSmtp;
  let groupId: number;
  let researcher: Awaited<ReturnType<typeof inviteAndJoin>>;
  let collaborator: Awaited<ReturnType<typeof inviteAndJoin>>;
  let outsider: Awaited<ReturnType<typeof inviteAndJoin>>;

  beforeAll(async () => {
    ({ server, smtp } = await startServerWithMail());
    groupId = (await call(server.url, 'POST', '/admin/groups', { token: server.adminToken, json: { name: 'Plateau team' } })).body.id;
    researcher = await inviteAndJoin(server, smtp, { email: 'ria@accounts.test', role: 'researcher', groupId });
    collaborator = await inviteAndJoin(server, smtp, { email: 'cal@accounts.test', role: 'collaborator', groupId });
    outsider = await inviteAndJoin(server, smtp, { email: 'otto@accounts.test', role: 'researcher' });
  }, 120_000);
  afterAll(async () => {
    await server?.stop();
    await smtp?.close();
  });

  it('answers a wrong password, an unknown e-mail and a disabled account with the same words', async () => {
    const wrong = await call(server.url, 'POST', '/auth/login', { json: { email: 'ria@accounts.test', password: 'not the password' } });
    const unknown = await call(server.url, 'POST', '/auth/login', { json: { email: 'nobody@accounts.test', password: 'whatever123' } });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(unknown.body).toEqual(wrong.body);
    const bad = await call(server.url, 'POST', '/auth/login', { json: { email: 'not-an-email', password: 'x' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('email');
  });

  it('keeps the session in an httpOnly SameSite cookie, and sign-out really ends it', async () => {
    const login = await call(server.url, 'POST', '/auth/login', { json: { email: 'ria@accounts.test', password: researcher.password } });
    const setCookie = login.headers.get('set-cookie') ?? '';
    expect(setCookie).toMatch(/^rollway_session=/);
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
    expect(login.body.token).toBeUndefined(); // only with returnToken (the CLI)
    const cookie = setCookie.split(';')[0]!;
    const me = await fetch(`${server.url}/api/v1/auth/me`, { headers: { cookie, authorization: '' } });
    expect(me.status).toBe(200);
    expect(((await me.json()) as any).user.email).toBe('ria@accounts.test');
    expect((await fetch(`${server.url}/api/v1/auth/logout`, { method: 'POST', headers: { cookie, authorization: '' } })).status).toBe(204);
    // The same, still unexpired JWT is refused at once: the session row is revoked.
    const after = await fetch(`${server.url}/api/v1/auth/me`, { headers: { cookie, authorization: '' } });
    expect(after.status).toBe(401);
    expect(((await after.json()) as any).error.message).toMatch(/sign in again/);
  });

  it('shows a token secret once, keeps only its hash, and a revoked or expired token gets 401 at once', async () => {
    const made = await call(server.url, 'POST', '/tokens', { token: researcher.token, json: { name: 'ci', scopes: ['read'], expiresInDays: 30 } });
    expect(made.status).toBe(201);
    const secret: string = made.body.secret;
    expect(secret).toMatch(/^rwt_/);
    const [row] = await server.db.select().from(apiTokens).where(eq(apiTokens.id, made.body.token.id));
    expect(JSON.stringify(row)).not.toContain(secret.slice(4));
    expect((await call(server.url, 'GET', '/scans', { token: secret })).status).toBe(200);
    const listed = await call(server.url, 'GET', '/tokens', { token: researcher.token });
    const entry = listed.body.tokens.find((t: any) => t.id === made.body.token.id);
    expect(entry).toMatchObject({ name: 'ci', scopes: ['read'], revoked: false });
    expect(entry.lastUsedAt).not.toBeNull();
    expect(JSON.stringify(listed.body)).not.toContain(secret);
    // Another user cannot revoke it (it is not theirs: 404).
    expect((await call(server.url, 'DELETE', `/tokens/${made.body.token.id}`, { token: outsider.token })).status).toBe(404);
    expect((await call(server.url, 'DELETE', `/tokens/${made.body.token.id}`, { token: researcher.token })).status).toBe(204);
    expect((await call(server.url, 'GET', '/scans', { token: secret })).status).toBe(401);

    const second = await call(server.url, 'POST', '/tokens', { token: researcher.token, json: { name: 'short', scopes: ['read'], expiresInDays: 1 } });
    await server.db.update(apiTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(apiTokens.id, second.body.token.id));
    const expired = await call(server.url, 'GET', '/scans', { token: second.body.secret });
    expect(expired.status).toBe(401);
    expect(expired.body.error.message).toMatch(/revoked or expired/);
    const badScope = await call(server.url, 'POST', '/tokens', { token: researcher.token, json: { name: 'x', scopes: ['admin'], expiresInDays: 1 } });
    expect(badScope.status).toBe(400);
    expect(badScope.body.error.message).toMatch(/scopes.*read, submit/);
  });

  it('shares a scan with its group; anyone else gets 404, as for a scan that does not exist', async () => {
    const made = await call(server.url, 'POST', '/scans', { token: researcher.token, json: { planText: plan(4, 'shared'), groupId } });
    expect(made.status).toBe(201);
    expect(made.body.owner).toMatchObject({ email: 'ria@accounts.test' });
    expect(made.body.group).toMatchObject({ id: groupId, name: 'Plateau team' });
    const id = made.body.id;
    expect((await call(server.url, 'GET', `/scans/${id}`, { token: collaborator.token })).status).toBe(200);
    expect((await call(server.url, 'GET', `/scans/${id}/results`, { token: collaborator.token })).status).toBe(200);
    const hidden = await call(server.url, 'GET', `/scans/${id}`, { token: outsider.token });
    const missing = await call(server.url, 'GET', '/scans/999999', { token: outsider.token });
    expect(hidden.status).toBe(404);
    expect(hidden.body.error.message).toBe(`scan ${id} does not exist`);
    expect(missing.status).toBe(404);
    expect((await call(server.url, 'GET', `/scans/${id}/download`, { token: outsider.token })).status).toBe(404);
    const outsiderList = await call(server.url, 'GET', '/scans', { token: outsider.token });
    expect(outsiderList.body.scans.map((s: any) => s.id)).not.toContain(id);
    const collaboratorList = await call(server.url, 'GET', '/scans', { token: collaborator.token });
    expect(collaboratorList.body.scans.map((s: any) => s.id)).toContain(id);
    // Seeing is not owning: the collaborator cannot cancel (role), an outsider cannot even see it.
    expect((await call(server.url, 'POST', `/scans/${id}/cancel`, { token: collaborator.token })).status).toBe(403);
    expect((await call(server.url, 'POST', `/scans/${id}/cancel`, { token: outsider.token })).status).toBe(404);
    // Sharing with a group one is not in is refused before anything is stored.
    const foreign = await call(server.url, 'POST', '/scans', { token: outsider.token, json: { planText: plan(2), groupId } });
    expect(foreign.status).toBe(400);
    expect(foreign.body.error.field).toBe('groupId');
    await waitForScan(server.url, id);
  });

  it('refuses a submission over the monthly quota before storing anything, and says what is left and when it resets', async () => {
    const user = await call(server.url, 'GET', '/auth/me', { token: outsider.token });
    expect(user.body.quota.usedPoints).toBe(0);
    const set = await call(server.url, 'PUT', `/admin/users/${outsider.id}/quota`, { token: server.adminToken, json: { monthlyPoints: 10, maxRunning: 5 } });
    expect(set.status).toBe(200);
    expect(set.body.quota).toEqual({ monthlyPoints: 10, maxRunning: 5, custom: true });
    expect((await call(server.url, 'POST', '/scans', { token: outsider.token, json: { planText: plan(6) } })).status).toBe(201);
    const before = (await call(server.url, 'GET', '/scans', { token: server.adminToken })).body.scans.length;
    const refused = await call(server.url, 'POST', '/scans', { token: outsider.token, json: { planText: plan(5) } });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('quota_exceeded');
    const nextMonth = new Date(Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth() + 1, 1)).toISOString().slice(0, 10);
    expect(refused.body.error.message).toBe(`this plan has 5 points but only 4 of your 10 monthly points are left; the quota resets on ${nextMonth} (ask an admin for more)`);
    expect((await call(server.url, 'GET', '/scans', { token: server.adminToken })).body.scans.length).toBe(before);
    const me = await call(server.url, 'GET', '/auth/me', { token: outsider.token });
    expect(me.body.quota).toMatchObject({ monthlyPoints: 10, usedPoints: 6, remainingPoints: 4, resetsAt: `${nextMonth}T00:00:00.000Z` });
  });

  it('limits the scans a user runs at once', async () => {
    await call(server.url, 'PUT', `/admin/users/${outsider.id}/quota`, { token: server.adminToken, json: { monthlyPoints: 100_000, maxRunning: 1 } });
    const first = await call(server.url, 'POST', '/scans', { token: outsider.token, json: { planText: plan(3000, 'long') } });
    expect(first.status).toBe(201);
    const second = await call(server.url, 'POST', '/scans', { token: outsider.token, json: { planText: plan(2) } });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('too_many_running');
    expect((await call(server.url, 'POST', `/scans/${first.body.id}/cancel`, { token: outsider.token })).status).toBe(200);
    expect((await call(server.url, 'POST', '/scans', { token: outsider.token, json: { planText: plan(2) } })).status).toBe(201);
  });

  it('shows the admin each user’s points and compute seconds for the month', async () => {
    const month = new Date().toISOString().slice(0, 7);
    const usage = await call(server.url, 'GET', `/admin/usage?month=${month}`, { token: server.adminToken });
    expect(usage.status).toBe(200);
    const otto = usage.body.users.find((u: any) => u.email === 'otto@accounts.test');
    expect(otto).toMatchObject({ scans: 3, pointsCharged: 6 + 3000 + 2 });
    const ria = usage.body.users.find((u: any) => u.email === 'ria@accounts.test');
    expect(ria.pointsComputed).toBe(4);
    expect(ria.computeSeconds).toBeGreaterThan(0);
    const bad = await call(server.url, 'GET', '/admin/usage?month=2026-13', { token: server.adminToken });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/month: must be a month as YYYY-MM/);
  });

  it('mails the owner when a scan finishes, with counts per outcome and a link', async () => {
    const mail = await smtp.waitFor((m) => m.to.includes('ria@accounts.test') && /shared/.test(m.subject), 20_000);
    expect(mail.text).toMatch(/\/scans\/\d+/);
    expect(mail.text).toMatch(/ok/);
  });

  it('resets a password by a single-use, expiring link; unknown e-mails get the same answer and no mail', async () => {
    const unknown = await call(server.url, 'POST', '/auth/password-reset', { json: { email: 'nobody@accounts.test' } });
    const known = await call(server.url, 'POST', '/auth/password-reset', { json: { email: 'cal@accounts.test' } });
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    expect(unknown.body).toEqual(known.body);
    const mail = await smtp.waitFor((m) => m.to.includes('cal@accounts.test') && /password/i.test(m.subject), 10_000);
    expect((await smtp.messages()).some((m) => m.to.includes('nobody@accounts.test'))).toBe(false);
    const secret = linkIn(mail.text);
    const info = await call(server.url, 'GET', `/auth/link/${secret}`);
    expect(info.body).toMatchObject({ purpose: 'password_reset', email: 'cal@accounts.test' });
    const short = await call(server.url, 'POST', '/auth/link', { json: { token: secret, password: 'short' } });
    expect(short.status).toBe(400);
    expect(short.body.error.field).toBe('password');
    expect((await call(server.url, 'POST', '/auth/link', { json: { token: secret, password: 'a brand new password' } })).status).toBe(200);
    // Single use: the same link again is gone; the old session ended with the password change.
    expect((await call(server.url, 'POST', '/auth/link', { json: { token: secret, password: 'yet another password' } })).status).toBe(404);
    expect((await call(server.url, 'GET', '/auth/me', { token: collaborator.token })).status).toBe(401);
    expect((await call(server.url, 'POST', '/auth/login', { json: { email: 'cal@accounts.test', password: 'a brand new password' } })).status).toBe(200);
    // An expired link is refused like a used one.
    await call(server.url, 'POST', '/auth/password-reset', { json: { email: 'ria@accounts.test' } });
    const resetMail = await smtp.waitFor((m) => m.to.includes('ria@accounts.test') && /password/i.test(m.subject), 10_000);
    await server.db.update(linkTokens).set({ expiresAt: new Date(Date.now() - 1000) });
    expect((await call(server.url, 'GET', `/auth/link/${linkIn(resetMail.text)}`)).status).toBe(404);
  });

  it('lets a researcher invite collaborators into their own groups only, and never an admin', async () => {
    const ok = await call(server.url, 'POST', '/invitations', { token: researcher.token, json: { email: 'new@accounts.test', groupId } });
    expect(ok.status).toBe(201);
    expect(ok.body.user.role).toBe('collaborator');
    const mail = await smtp.waitFor((m) => m.to.includes('new@accounts.test'), 10_000);
    expect(mail.html).not.toMatch(/src="http/);
    const asAdmin = await call(server.url, 'POST', '/invitations', { token: researcher.token, json: { email: 'boss@accounts.test', role: 'admin' } });
    expect(asAdmin.status).toBe(403);
    const foreign = await call(server.url, 'POST', '/invitations', { token: outsider.token, json: { email: 'x@accounts.test', groupId } });
    expect(foreign.status).toBe(400);
  });

  it('shows admins the compute workers with their heartbeats', async () => {
    const res = await call(server.url, 'GET', '/admin/workers', { token: server.adminToken });
    expect(res.status).toBe(200);
    expect(res.body.workers.length).toBeGreaterThanOrEqual(1);
    expect(res.body.workers[0]).toMatchObject({ status: 'active', concurrency: 2 });
  });

  it('keeps one active admin', async () => {
    const users = (await call(server.url, 'GET', '/admin/users', { token: server.adminToken })).body.users;
    const admin = users.find((u: any) => u.role === 'admin');
    const demote = await call(server.url, 'PATCH', `/admin/users/${admin.id}`, { token: server.adminToken, json: { role: 'researcher' } });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe('last_admin');
  });

  it('ends a disabled user’s sessions and tokens at once', async () => {
    const token = await call(server.url, 'POST', '/tokens', { token: outsider.token, json: { name: 'x', scopes: ['read'], expiresInDays: 1 } });
    expect((await call(server.url, 'PATCH', `/admin/users/${outsider.id}`, { token: server.adminToken, json: { disabled: true } })).status).toBe(200);
    expect((await call(server.url, 'GET', '/auth/me', { token: outsider.token })).status).toBe(401);
    expect((await call(server.url, 'GET', '/scans', { token: token.body.secret })).status).toBe(401);
    expect((await call(server.url, 'POST', '/auth/login', { json: { email: 'otto@accounts.test', password: outsider.password } })).status).toBe(401);
  });
});

describe('first start and sign-in limits', () => {
  it('prints a one-time set-up link when no admin is configured, and the link makes the admin', async () => {
    const config = loadConfig({ PORT: '0', HOST: '127.0.0.1', DATA_DIR: 'memory://', ROLLWAY_WORKERS: '1', LOG_LEVEL: 'silent', ROLLWAY_MAIL: 'off' });
    const server = await startServer(config, pino({ level: 'silent' }));
    try {
      expect(server.setupUrl).toMatch(new RegExp(`^${server.url}/link/`));
      const secret = linkIn(server.setupUrl!);
      expect((await call(server.url, 'GET', `/auth/link/${secret}`)).body.purpose).toBe('setup');
      const done = await call(server.url, 'POST', '/auth/link', { json: { token: secret, password: 'the first admin password', email: 'chief@setup.test', name: 'Chief' } });
      expect(done.status).toBe(200);
      expect(done.body.user).toMatchObject({ email: 'chief@setup.test', role: 'admin' });
      expect((await call(server.url, 'POST', '/auth/link', { json: { token: secret, password: 'the first admin password' } })).status).toBe(404);
      const login = await call(server.url, 'POST', '/auth/login', { json: { email: 'chief@setup.test', password: 'the first admin password', returnToken: true } });
      expect((await call(server.url, 'GET', '/admin/users', { token: login.body.token })).status).toBe(200);
    } finally {
      await server.stop();
    }
  });

  it('limits sign-in attempts per address', async () => {
    const { server, smtp } = await startServerWithMail({ ROLLWAY_LOGIN_LIMIT: '3' });
    try {
      // startTestServer signed in once already.
      const attempts = [];
      for (let i = 0; i < 3; i++) attempts.push((await call(server.url, 'POST', '/auth/login', { json: { email: 'a@b.test', password: 'wrong password' } })).status);
      expect(attempts).toEqual([401, 401, 429]);
      const limited = await call(server.url, 'POST', '/auth/login', { json: { email: 'a@b.test', password: 'wrong password' } });
      expect(limited.body.error.code).toBe('too_many_attempts');
    } finally {
      await server.stop();
      await smtp.close();
    }
  });
});
