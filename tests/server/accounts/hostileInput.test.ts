import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { users } from '../../../server/db/schema/accounts.ts';
import { TEST_ADMIN } from '../../helpers/auth.ts';
import { call } from '../../helpers/accounts.ts';
import { startTestServer } from '../../helpers/server.ts';

/**
 * SQL injection and oversized input on every text field a client sends: always a 4xx (or the
 * text stored verbatim where any text is allowed), never a 500, and the database unharmed.
 * Injection strings are the classic ones (OWASP testing guide, common practice).
 */
const INJECTIONS = ["' OR '1'='1", "'; DROP TABLE users; --", 'x"); DELETE FROM scans; --', '\u0000nul', '%00', '${7*7}', '<script>alert(1)</script>'];
const HUGE = 'x'.repeat(1_100_000);

describe('hostile input on every text field', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>;
  let scanId: number;
  beforeAll(async () => {
    // Many sign-in attempts on purpose: the attempt limit is tested elsewhere.
    server = await startTestServer({ ROLLWAY_LOGIN_LIMIT: '100000' });
    const made = await call(server.url, 'POST', '/scans', { token: server.adminToken, json: { planText: 'title: t\npotential: { family: quadratic }\naxes:\n  - { name: pivotEfolds, values: [50, 60] }\n' } });
    scanId = made.body.id;
  });
  afterAll(async () => server?.stop());

  const fields: { label: string; send: (text: string) => Promise<{ status: number; body: any }> }[] = [
    { label: 'login email', send: (t) => call(server.url, 'POST', '/auth/login', { json: { email: t, password: 'whatever' } }) },
    { label: 'login password', send: (t) => call(server.url, 'POST', '/auth/login', { json: { email: TEST_ADMIN.email, password: t } }) },
    { label: 'reset email', send: (t) => call(server.url, 'POST', '/auth/password-reset', { json: { email: t } }) },
    { label: 'link token (body)', send: (t) => call(server.url, 'POST', '/auth/link', { json: { token: t, password: 'long enough password' } }) },
    { label: 'link token (path)', send: (t) => call(server.url, 'GET', `/auth/link/${encodeURIComponent(t.slice(0, 5000))}`) },
    { label: 'link name', send: (t) => call(server.url, 'POST', '/auth/link', { json: { token: 'nope', password: 'long enough password', name: t } }) },
    { label: 'token name', send: (t) => call(server.url, 'POST', '/tokens', { token: server.adminToken, json: { name: t, scopes: ['read'], expiresInDays: 1 } }) },
    { label: 'group name', send: (t) => call(server.url, 'POST', '/admin/groups', { token: server.adminToken, json: { name: t } }) },
    { label: 'invitation email', send: (t) => call(server.url, 'POST', '/admin/users', { token: server.adminToken, json: { email: t, role: 'collaborator' } }) },
    { label: 'invitation name', send: (t) => call(server.url, 'POST', '/admin/users', { token: server.adminToken, json: { email: `n${Math.random()}@x.test`.replace('0.', ''), name: t } }) },
    { label: 'user name', send: (t) => call(server.url, 'PATCH', '/admin/users/1', { token: server.adminToken, json: { name: t } }) },
    { label: 'usage month', send: (t) => call(server.url, 'GET', `/admin/usage?month=${encodeURIComponent(t.slice(0, 5000))}`, { token: server.adminToken }) },
    { label: 'scan plan text', send: (t) => call(server.url, 'POST', '/scans', { token: server.adminToken, json: { planText: t } }) },
    { label: 'scan title', send: (t) => call(server.url, 'POST', '/scans', { token: server.adminToken, json: { planText: `title: ${JSON.stringify(t)}\npotential: { family: quadratic }\naxes:\n  - { name: pivotEfolds, values: [50] }\n` } }) },
    { label: 'custom expression', send: (t) => call(server.url, 'POST', '/scans', { token: server.adminToken, json: { plan: { title: 'e', potential: { expression: t, parameters: {} }, axes: [{ name: 'pivotEfolds', values: [50] }] } } }) },
    { label: 'scan id (path)', send: (t) => call(server.url, 'GET', `/scans/${encodeURIComponent(t.slice(0, 5000))}`, { token: server.adminToken }) },
    { label: 'results sort', send: (t) => call(server.url, 'GET', `/scans/${scanId}/results?sort=${encodeURIComponent(t.slice(0, 5000))}`, { token: server.adminToken }) },
    { label: 'results filter key', send: (t) => call(server.url, 'GET', `/scans/${scanId}/results?${encodeURIComponent(t.slice(0, 5000))}.gt=1`, { token: server.adminToken }) },
    { label: 'results filter value', send: (t) => call(server.url, 'GET', `/scans/${scanId}/results?ns.gt=${encodeURIComponent(t.slice(0, 5000))}`, { token: server.adminToken }) },
    { label: 'results cursor', send: (t) => call(server.url, 'GET', `/scans/${scanId}/results?cursor=${encodeURIComponent(t.slice(0, 5000))}`, { token: server.adminToken }) },
    { label: 'heatmap axis', send: (t) => call(server.url, 'GET', `/scans/${scanId}/heatmap?x=${encodeURIComponent(t.slice(0, 5000))}&y=pivotEfolds&agg=count`, { token: server.adminToken }) },
    { label: 'download format', send: (t) => call(server.url, 'GET', `/scans/${scanId}/download?format=${encodeURIComponent(t.slice(0, 5000))}`, { token: server.adminToken }) },
    { label: 'bearer token', send: (t) => call(server.url, 'GET', '/scans', { token: t.replace(/\s|\u0000/g, 'x').slice(0, 5000) }) },
  ];

  it('never answers 500, whatever the text', async () => {
    const failures: string[] = [];
    for (const field of fields) {
      for (const text of [...INJECTIONS, HUGE]) {
        const res = await field.send(text);
        if (res.status >= 500) failures.push(`${field.label} with ${JSON.stringify(text.slice(0, 30))}: ${res.status} ${JSON.stringify(res.body).slice(0, 150)}`);
      }
    }
    expect(failures).toEqual([]);
  }, 120_000);

  it('refuses oversized text with a 4xx naming the field where it can', async () => {
    const name = await call(server.url, 'POST', '/tokens', { token: server.adminToken, json: { name: HUGE, scopes: ['read'], expiresInDays: 1 } });
    expect(name.status).toBe(400);
    expect(name.body.error.message).toMatch(/^name: must be at most 100 characters/);
    const plan = await call(server.url, 'POST', '/scans', { token: server.adminToken, json: { planText: 'y'.repeat(7_000_000) } });
    expect(plan.status).toBe(413);
  });

  it('stores injection text verbatim where any text is allowed, and the tables stay whole', async () => {
    const evil = "'; DROP TABLE users; --";
    const made = await call(server.url, 'POST', '/tokens', { token: server.adminToken, json: { name: evil, scopes: ['read'], expiresInDays: 1 } });
    expect(made.status).toBe(201);
    expect(made.body.token.name).toBe(evil);
    expect((await call(server.url, 'POST', '/auth/login', { json: { email: TEST_ADMIN.email, password: TEST_ADMIN.password } })).status).toBe(200);
    expect((await call(server.url, 'GET', '/scans', { token: server.adminToken })).body.scans.length).toBeGreaterThan(0);
  });

  it('stores passwords only as argon2id hashes', async () => {
    const [admin] = await server.db.select().from(users).where(eq(users.email, TEST_ADMIN.email));
    expect(admin!.passwordHash).toMatch(/^\$argon2id\$v=19\$[mtp]=\d+,[mtp]=\d+,[mtp]=\d+\$/);
    expect(admin!.passwordHash).not.toContain(TEST_ADMIN.password);
  });
});
