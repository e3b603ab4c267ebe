import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type DatabaseHandle } from '../../../server/db/client.ts';
import { encodeRows } from '../../../server/db/copyBinary.ts';
import { RESULT_COLUMNS } from '../../../server/db/resultColumns.ts';
import { insertEncodedResults, insertPointResults, type WriteMethod } from '../../../server/db/resultsWriter.ts';
import { batches, pointResults, scans, type NewPointResultRow } from '../../../server/db/schema/index.ts';
import { startPostgres, type TestPostgres } from '../../helpers/postgres.ts';
import { failedRow, resultRow, seedScan } from './fixtures.ts';

// One database per engine for the file (opening one costs seconds); every test works in its own
// scan. PGlite is the embedded default, a real PostgreSQL server the scale-out path.
const engines: Record<'pglite' | 'postgres', DatabaseHandle> = {} as never;
let postgres: TestPostgres;
beforeAll(async () => {
  postgres = await startPostgres();
  [engines.pglite, engines.postgres] = await Promise.all([openDatabase(), openDatabase({ databaseUrl: postgres.url })]);
}, 60_000);
afterAll(async () => {
  await Promise.all(Object.values(engines).map((h) => h.close()));
  await postgres.destroy();
});
let handle: DatabaseHandle;

const nonFiniteToNull = (row: NewPointResultRow) =>
  Object.fromEntries(Object.entries(row).map(([k, v]) => [k, typeof v === 'number' && !Number.isFinite(v) ? null : v]));

const selectResults = (scanId: number) =>
  handle.db.select().from(pointResults).where(eq(pointResults.scanId, scanId)).orderBy(pointResults.pointIndex);

// Both writers on both engines: 'copy' (binary COPY, the default) and 'insert' (one JSON parameter).
const cases = (['pglite', 'postgres'] as const).flatMap((engine) => (['copy', 'insert'] as const).map((method): [string, WriteMethod] => [engine, method]));
describe.each(cases)('insertPointResults on %s via %s', (engine, method) => {
  beforeAll(() => {
    handle = engines[engine as keyof typeof engines];
  });

  it('round-trips every column bit for bit, storing NaN and ±Infinity as NULL', async () => {
    const { scan, batches: [batch] } = await seedScan(handle.db, 3, 3);
    const rows = [resultRow(scan.id, 0), failedRow(scan.id, 1), resultRow(scan.id, 2, { params: { 'mu²': 5e-324, q: 1e308 }, reason: 'quote " comma , ü' })];
    await insertPointResults(handle.db, batch!, rows, { method });
    expect(await selectResults(scan.id)).toEqual(rows.map(nonFiniteToNull));
  });

  it('counts a retried batch once and marks it done', async () => {
    const { scan, batches: [batch] } = await seedScan(handle.db, 4, 4);
    const rows = [resultRow(scan.id, 0), failedRow(scan.id, 1), resultRow(scan.id, 2), failedRow(scan.id, 3)];
    const first = await insertPointResults(handle.db, batch!, rows, { method });
    const again = await insertPointResults(handle.db, batch!, rows, { method });
    expect(first).toEqual({ inserted: 4, failed: 2, pointsDone: 4, pointCount: 4 });
    expect(again).toEqual({ inserted: 0, failed: 0, pointsDone: 4, pointCount: 4 });
    const [stored] = await handle.db.select().from(scans).where(eq(scans.id, scan.id));
    expect(stored).toMatchObject({ pointsDone: 4, pointsFailed: 2 });
    const seconds = rows.reduce((s, r) => s + r.computeMs, 0) / 1000;
    expect(stored!.computeSeconds).toBeCloseTo(seconds, 12);
    const [done] = await handle.db.select().from(batches).where(eq(batches.id, batch!.id));
    expect(done).toMatchObject({ state: 'done', leasedUntil: null });
    expect(done!.finishedAt).toBeInstanceOf(Date);
    expect(await selectResults(scan.id)).toHaveLength(4);
  });

  it('counts only the new rows when a retry overlaps what is stored', async () => {
    const { scan, batches: [batch] } = await seedScan(handle.db, 3, 3);
    await insertPointResults(handle.db, batch!, [resultRow(scan.id, 0)], { method });
    const changed = resultRow(scan.id, 0, { ns: 0.5 });
    const outcome = await insertPointResults(handle.db, batch!, [changed, failedRow(scan.id, 1), resultRow(scan.id, 2)], { method });
    expect(outcome).toEqual({ inserted: 2, failed: 1, pointsDone: 3, pointCount: 3 });
    const stored = await selectResults(scan.id);
    expect(stored[0]!.ns).toBe(resultRow(scan.id, 0).ns); // the first write wins
  });

  it('stores a batch written by two workers at once exactly once', async () => {
    // Two workers holding the same batch (a lease ran out while the first was still writing).
    const { scan, batches: [batch] } = await seedScan(handle.db, 200, 200);
    const rows = Array.from({ length: 200 }, (_, i) => (i % 7 === 0 ? failedRow(scan.id, i) : resultRow(scan.id, i)));
    const outcomes = await Promise.all([insertPointResults(handle.db, batch!, rows, { method }), insertPointResults(handle.db, batch!, rows, { method })]);
    expect(outcomes.map((o) => o.inserted).sort((a, b) => a - b)).toEqual([0, 200]);
    expect(outcomes.reduce((sum, o) => sum + o.failed, 0)).toBe(29);
    const [stored] = await handle.db.select().from(scans).where(eq(scans.id, scan.id));
    expect(stored).toMatchObject({ pointsDone: 200, pointsFailed: 29 });
    expect(await selectResults(scan.id)).toEqual(rows.map(nonFiniteToNull));
  });

  it('rolls back and throws for a batch that is not the scan’s', async () => {
    const a = await seedScan(handle.db, 2, 2);
    const b = await seedScan(handle.db, 2, 2);
    const wrong = { id: b.batches[0]!.id, scanId: a.scan.id };
    await expect(insertPointResults(handle.db, wrong, [resultRow(a.scan.id, 0)], { method })).rejects.toThrow(/does not exist/);
    expect(await selectResults(a.scan.id)).toHaveLength(0);
    const [stored] = await handle.db.select().from(scans).where(eq(scans.id, a.scan.id));
    expect(stored!.pointsDone).toBe(0);
  });

  it('rejects rows of another scan before writing anything', async () => {
    const { scan, batches: [batch] } = await seedScan(handle.db, 2, 2);
    await expect(insertPointResults(handle.db, batch!, [resultRow(scan.id + 1, 0)], { method })).rejects.toThrow(/belongs to scan/);
  });

  it('marks an empty batch done without touching the counters', async () => {
    const { batches: [batch] } = await seedScan(handle.db, 1, 1);
    expect(await insertPointResults(handle.db, batch!, [], { method })).toEqual({ inserted: 0, failed: 0, pointsDone: 0, pointCount: 1 });
    const [done] = await handle.db.select().from(batches).where(eq(batches.id, batch!.id));
    expect(done!.state).toBe('done');
  });
});

// Compute threads encode their rows themselves (encodeRows) and the main thread writes the bytes.
describe.each(['pglite', 'postgres'] as const)('insertEncodedResults on %s', (engine) => {
  beforeAll(() => {
    handle = engines[engine];
  });

  it('stores what insertPointResults stores, and a retried batch once', async () => {
    const { scan, batches: [batch] } = await seedScan(handle.db, 3, 3);
    const rows = [resultRow(scan.id, 0), failedRow(scan.id, 1), resultRow(scan.id, 2, { reason: 'ü , "' })];
    const encoded = encodeRows(RESULT_COLUMNS, scan.id, rows);
    expect(await insertEncodedResults(handle.db, batch!, encoded)).toEqual({ inserted: 3, failed: 1, pointsDone: 3, pointCount: 3 });
    expect(await insertEncodedResults(handle.db, batch!, encoded)).toEqual({ inserted: 0, failed: 0, pointsDone: 3, pointCount: 3 });
    expect(await selectResults(scan.id)).toEqual(rows.map(nonFiniteToNull));
  });

  it('refuses rows encoded for another scan, and encoding refuses a row of another scan', async () => {
    const { scan, batches: [batch] } = await seedScan(handle.db, 1, 1);
    await expect(insertEncodedResults(handle.db, batch!, encodeRows(RESULT_COLUMNS, scan.id + 1, [resultRow(scan.id + 1, 0)]))).rejects.toThrow(/do not belong to batch/);
    expect(() => encodeRows(RESULT_COLUMNS, scan.id, [resultRow(scan.id + 1, 0)])).toThrow(/belongs to scan/);
    expect(await selectResults(scan.id)).toEqual([]);
  });
});

describe('insertPointResults', () => {
  beforeAll(() => {
    handle = engines.pglite;
  });

  it('writes a 1000-point batch in one call and sorts NULL observables last', async () => {
    const { scan, batches: [batch] } = await seedScan(handle.db, 1000, 1000);
    const rows = Array.from({ length: 1000 }, (_, i) => (i % 10 === 0 ? failedRow(scan.id, i) : resultRow(scan.id, i)));
    expect(await insertPointResults(handle.db, batch!, rows)).toMatchObject({ inserted: 1000, failed: 100 });
    const top = await handle.db.select({ ns: pointResults.ns }).from(pointResults)
      .where(eq(pointResults.scanId, scan.id)).orderBy(pointResults.ns).limit(901);
    expect(top.at(-1)!.ns).toBeNull();
    expect(top.at(-2)!.ns).not.toBeNull();
  });

  it('refuses the copy method on a database that is neither PGlite nor a node-postgres pool', async () => {
    const { batches: [batch] } = await seedScan(handle.db, 1, 1);
    const neither = Object.create(handle.db, { $client: { value: {} } }) as typeof handle.db;
    await expect(insertPointResults(neither, batch!, [], { method: 'copy' })).rejects.toThrow(/needs PGlite or a node-postgres pool/);
  });

  it('deletes a scan’s batches and results with the scan', async () => {
    const kept = await seedScan(handle.db, 2, 1);
    const gone = await seedScan(handle.db, 2, 1);
    for (const s of [kept, gone]) {
      for (const b of s.batches) await insertPointResults(handle.db, b, [resultRow(s.scan.id, b.firstIndex)]);
    }
    await handle.db.delete(scans).where(eq(scans.id, gone.scan.id));
    expect(await handle.db.$count(batches, eq(batches.scanId, gone.scan.id))).toBe(0);
    expect(await handle.db.$count(pointResults, eq(pointResults.scanId, gone.scan.id))).toBe(0);
    expect(await handle.db.$count(batches, eq(batches.scanId, kept.scan.id))).toBe(2);
    expect(await handle.db.$count(pointResults, eq(pointResults.scanId, kept.scan.id))).toBe(2);
  });
});
