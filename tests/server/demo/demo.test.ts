import { readdir } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_GROUP } from '../../../server/demo/demoAccounts.ts';
import { call } from '../../helpers/accounts.ts';
import { startTestServer } from '../../helpers/server.ts';

/** What `npm run demo` does, with the default limits: every example queued, the accounts usable. */
describe('demo mode', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>;
  beforeAll(async () => {
    server = await startTestServer({ ROLLWAY_WORKERS: '1' }, { demo: true });
  });
  afterAll(async () => server?.stop());

  it('queues every example plan as the researcher’s scans, shared with the demo group', async () => {
    const examples = (await readdir(new URL('../../../examples/', import.meta.url))).filter((f) => /\.ya?ml$/.test(f));
    expect(server.demoSubmitted.sort()).toEqual(examples.sort());
    const [, researcher, collaborator] = DEMO_ACCOUNTS;
    const login = await call(server.url, 'POST', '/auth/login', { json: { email: collaborator!.email, password: collaborator!.password, returnToken: true } });
    expect(login.status).toBe(200);
    const scans = (await call(server.url, 'GET', '/scans', { token: login.body.token })).body.scans;
    expect(scans).toHaveLength(examples.length);
    for (const scan of scans) {
      expect(scan.owner.email).toBe(researcher!.email);
      expect(scan.group.name).toBe(DEMO_GROUP);
    }
  });
});
