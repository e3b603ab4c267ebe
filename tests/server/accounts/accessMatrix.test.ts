import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FakeSmtp } from '../../../server/mail/fakeSmtp.ts';
import { ACCESS_RULES } from '../../../server/auth/accessRules.ts';
import { call, inviteAndJoin, startServerWithMail, type TestServer } from '../../helpers/accounts.ts';

/**
 * Every API route × every role × anonymous × every token scope: allowed, or 401 / 403. The policy
 * is written here independently of server/auth/accessRules.ts, from what the accounts issue asks:
 * collaborators read and download but never submit, tokens act within their scopes and never as
 * admin, admin routes and credential management need a signed-in session.
 */
type Policy = 'public' | 'anyCredential' | 'reader' | 'submitter' | 'sessionOnly' | 'inviter' | 'admin';
const POLICY: Record<string, Policy> = {
  'GET /health': 'public', 'GET /ready': 'public',
  'POST /auth/login': 'public', 'POST /auth/password-reset': 'public', 'GET /auth/link/:token': 'public', 'POST /auth/link': 'public',
  'POST /auth/logout': 'sessionOnly', 'GET /auth/me': 'anyCredential',
  'GET /tokens': 'sessionOnly', 'POST /tokens': 'sessionOnly', 'DELETE /tokens/:id': 'sessionOnly',
  'GET /groups': 'reader', 'POST /invitations': 'inviter',
  'GET /scans': 'reader', 'POST /scans': 'submitter', 'GET /scans/:id': 'reader', 'GET /scans/:id/events': 'reader',
  'POST /scans/:id/cancel': 'submitter', 'POST /scans/:id/clone': 'submitter', 'DELETE /scans/:id': 'submitter',
  'GET /scans/:id/results': 'reader', 'GET /scans/:id/summary': 'reader', 'GET /scans/:id/heatmap': 'reader',
  'GET /scans/:id/download': 'reader', 'GET /scans/:id/plane': 'reader', 'GET /scans/:id/points/:index': 'reader',
  'GET /admin/users': 'admin', 'POST /admin/users': 'admin', 'PATCH /admin/users/:id': 'admin', 'PUT /admin/users/:id/quota': 'admin',
  'POST /admin/groups': 'admin', 'POST /admin/groups/:id/members': 'admin', 'DELETE /admin/groups/:id/members/:userId': 'admin',
  'GET /admin/usage': 'admin', 'GET /admin/workers': 'admin',
};

type Role = 'admin' | 'researcher' | 'collaborator';
interface Identity { label: string; role?: Role; scopes?: ('read' | 'submit')[]; token: string }

function expected(policy: Policy, who: Identity): 'allowed' | 401 | 403 {
  if (policy === 'public') return 'allowed';
  if (!who.role) return 401;
  const viaToken = who.scopes !== undefined;
  // A token never grants admin rights: an admin's token counts as a researcher's.
  const role = viaToken && who.role === 'admin' ? 'researcher' : who.role;
  const roleOk = { anyCredential: true, reader: true, sessionOnly: true, submitter: role !== 'collaborator', inviter: role !== 'collaborator', admin: role === 'admin' }[policy];
  if (!roleOk) return 403;
  if (!viaToken) return 'allowed';
  const scopeOk = { anyCredential: true, reader: who.scopes!.includes('read'), submitter: who.scopes!.includes('submit'), sessionOnly: false, inviter: false, admin: false }[policy];
  return scopeOk ? 'allowed' : 403;
}

const PLAN = 'title: matrix\npotential: { family: quadratic }\naxes:\n  - { name: pivotEfolds, values: [50, 55, 60] }\n';
const bodies: Record<string, unknown> = {
  'POST /scans': { planText: PLAN },
  'POST /tokens': { name: 'matrix', scopes: ['read'], expiresInDays: 1 },
  'POST /admin/groups': { name: 'matrix group' },
  'POST /admin/users': { email: 'someone@matrix.test', role: 'collaborator' },
  'POST /invitations': { email: 'someone-else@matrix.test' },
  'PATCH /admin/users/:id': { name: 'Renamed' },
  'PUT /admin/users/:id/quota': { monthlyPoints: null, maxRunning: null },
  'POST /admin/groups/:id/members': { userId: 1 },
};

describe('access matrix: every route × role × anonymous × token scope', () => {
  let server: TestServer;
  let smtp: FakeSmtp;
  const identities: Identity[] = [];
  let scanId = 0;
  let groupId = 0;
  let researcherId = 0;

  beforeAll(async () => {
    ({ server, smtp } = await startServerWithMail({ ROLLWAY_DEFAULT_MAX_RUNNING: '1000' }));
    const group = await call(server.url, 'POST', '/admin/groups', { token: server.adminToken, json: { name: 'Matrix group' } });
    groupId = group.body.id;
    const researcher = await inviteAndJoin(server, smtp, { email: 'r@matrix.test', role: 'researcher', groupId });
    const collaborator = await inviteAndJoin(server, smtp, { email: 'c@matrix.test', role: 'collaborator', groupId });
    researcherId = researcher.id;
    const sessions: Record<Role, string> = { admin: server.adminToken, researcher: researcher.token, collaborator: collaborator.token };
    // The scan every :id route names: the researcher's, shared with the group, so each role can see it.
    const scan = await call(server.url, 'POST', '/scans', { token: researcher.token, json: { planText: PLAN, groupId } });
    expect(scan.status, JSON.stringify(scan.body)).toBe(201);
    scanId = scan.body.id;
    identities.push({ label: 'anonymous', token: '' });
    for (const role of ['admin', 'researcher', 'collaborator'] as const) {
      identities.push({ label: `${role} session`, role, token: sessions[role] });
      for (const scopes of [['read'], ['submit'], ['read', 'submit']] as ('read' | 'submit')[][]) {
        const made = await call(server.url, 'POST', '/tokens', { token: sessions[role], json: { name: `${role} ${scopes.join('+')}`, scopes, expiresInDays: 1 } });
        expect(made.status).toBe(201);
        identities.push({ label: `${role} token [${scopes.join(',')}]`, role, scopes, token: made.body.secret });
      }
    }
  }, 120_000);

  afterAll(async () => {
    await server?.stop();
    await smtp?.close();
  });

  it('has a policy for exactly the routes the server has rules for', () => {
    expect(Object.keys(POLICY).sort()).toEqual(ACCESS_RULES.map((r) => `${r.method} ${r.path}`).sort());
  });

  it('answers every call as the policy says', async () => {
    const wrong: string[] = [];
    // Logout ends the session it is called with, so it goes last.
    const rules = [...ACCESS_RULES].sort((a, b) => Number(a.path === '/auth/logout') - Number(b.path === '/auth/logout'));
    for (const rule of rules) {
      const key = `${rule.method} ${rule.path}`;
      const path = rule.path.replace(':index', '0').replace(':token', 'not-a-link').replace(':userId', String(researcherId))
        .replace('/admin/groups/:id', `/admin/groups/${groupId}`).replace('/admin/users/:id', `/admin/users/${researcherId}`)
        .replace('/tokens/:id', '/tokens/999999').replace(':id', String(scanId));
      for (const who of identities) {
        const json = bodies[key];
        const res = await call(server.url, rule.method, path + (rule.path.endsWith('/heatmap') ? '?x=pivotEfolds&y=pivotEfolds&agg=count' : ''), { token: who.token, ...(json === undefined ? {} : { json }) });
        if (rule.path.endsWith('/events')) await res.body; // the stream ends on its own for a finished scan
        const want = expected(POLICY[key]!, who);
        const got = res.status === 401 || res.status === 403 ? res.status : 'allowed';
        if (got !== want) wrong.push(`${key} as ${who.label}: expected ${want}, got ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`);
      }
    }
    expect(wrong).toEqual([]);
  }, 120_000);
});
