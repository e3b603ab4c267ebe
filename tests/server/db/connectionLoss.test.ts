import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openPool } from '../../../server/db/pgPool.ts';
import { startPostgres, type TestPostgres } from '../../helpers/postgres.ts';

// node-postgres emits 'error' on a client the pool has handed out when its connection ends
// between two queries (a transaction waiting on the application, a client held across steps);
// pg-pool listens only on idle clients, so without a listener of ours the process dies
// (node-postgres docs, "Pool – error event" and "Client – error event"; seen here as
// `rollway worker` exiting when PostgreSQL restarted mid-scan).
let postgres: TestPostgres;
beforeAll(async () => {
  postgres = await startPostgres();
}, 60_000);
afterAll(async () => {
  await postgres?.destroy();
});

describe('a pool whose server restarts', () => {
  it('survives a checked-out client losing its connection between queries, and reconnects', async () => {
    const lost: string[] = [];
    const pool = openPool(postgres.url, { name: 'rollway-test', max: 2 }, (error) => lost.push(error.message));
    try {
      const held = await pool.connect();
      await held.query('begin');

      await postgres.restart(300);
      // The only client is the held one: it learned of it through 'error', not through a query of its own.
      for (let i = 0; i < 50 && lost.length === 0; i++) await new Promise((r) => setTimeout(r, 20));
      expect(lost.length).toBeGreaterThan(0);
      await expect(held.query('select 1')).rejects.toThrow();
      held.release(); // not queryable: the pool drops it instead of handing it out again

      const { rows } = await pool.query<{ one: number }>('select 1 as one');
      expect(rows).toEqual([{ one: 1 }]);
    } finally {
      await pool.end();
    }
  }, 60_000);
});
