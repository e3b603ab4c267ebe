import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MIGRATIONS_FOLDER, openDatabase } from '../../../server/db/client.ts';
import { insertPointResults } from '../../../server/db/resultsWriter.ts';
import { pointResults, scans } from '../../../server/db/schema/index.ts';
import { resultRow, seedScan } from './fixtures.ts';

const journal = JSON.parse(await readFile(join(MIGRATIONS_FOLDER, 'meta', '_journal.json'), 'utf8')) as { entries: unknown[] };
const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((d) => rm(d, { recursive: true, force: true }))));

async function appliedMigrations(handle: Awaited<ReturnType<typeof openDatabase>>): Promise<number> {
  const result = await handle.pglite!.query<{ n: number }>('select count(*)::int as n from drizzle.__drizzle_migrations');
  return result.rows[0]!.n;
}

describe('openDatabase on PGlite', () => {
  let memory: Awaited<ReturnType<typeof openDatabase>>;
  beforeAll(async () => {
    memory = await openDatabase({ dataDir: 'memory://' });
  }, 60_000);
  afterAll(async () => memory.close());

  it('applies every migration to a fresh in-memory database', async () => {
    const tables = await memory.pglite!.query<{ table_name: string }>(
      "select table_name from information_schema.tables where table_schema = 'public' order by table_name",
    );
    expect(tables.rows.map((r) => r.table_name)).toEqual(['api_tokens', 'batches', 'group_members', 'groups', 'link_tokens', 'point_results', 'scan_usage', 'scans', 'sessions', 'users', 'workers']);
    expect(await appliedMigrations(memory)).toBe(journal.entries.length);
  });

  it('keeps a file database across close and open, and migrates it only once', async () => {
    const root = await mkdtemp(join(tmpdir(), 'rollway-db-'));
    dirs.push(root);
    const dataDir = join(root, 'nested', 'data');
    const first = await openDatabase({ dataDir }); // creates the missing directories
    const { scan, batches } = await seedScan(first.db, 3, 3);
    await insertPointResults(first.db, batches[0]!, [0, 1, 2].map((i) => resultRow(scan.id, i)));
    await first.close();

    const second = await openDatabase({ dataDir }); // re-running the migrations would fail on CREATE TABLE
    expect(await appliedMigrations(second)).toBe(journal.entries.length);
    const [stored] = await second.db.select().from(scans);
    expect(stored).toMatchObject({ id: scan.id, title: scan.title, pointsDone: 3 });
    expect(await second.db.$count(pointResults)).toBe(3);
    await second.close();
  });

  it('rejects a scan or batch state outside the allowed values', async () => {
    const { scan } = await seedScan(memory.db, 1, 1);
    await expect(memory.pglite!.query(`update scans set state = 'paused' where id = $1`, [scan.id])).rejects.toThrow(/scans_state_check/);
    await expect(memory.pglite!.query(`update batches set state = 'lost'`)).rejects.toThrow(/batches_state_check/);
  });
});
