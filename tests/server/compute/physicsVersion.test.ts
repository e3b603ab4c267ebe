import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import { afterAll, expect, it } from 'vitest';
import { openDatabase } from '../../../server/db/client.ts';
import { openEmbedded } from '../../../server/embedded.ts';
import { PHYSICS_VERSION } from '../../../shared/physics/version.ts';
import { waitForScan } from '../../scaleout/cluster.ts';
import { seedScan } from '../db/fixtures.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((d) => rm(d, { recursive: true, force: true }))));

it('fails a scan stored by another physics version instead of mixing rows of two releases', async () => {
  const dataDir = await mkdtemp(join(tmpdir(), 'rollway-version-'));
  dirs.push(dataDir);
  // As a scan left unfinished by an older release: stored, with batches pending (seedScan's version is 'test').
  const old = await openDatabase({ dataDir });
  const { scan } = await seedScan(old.db, 4, 2);
  await old.close();
  expect(scan.physicsVersion).not.toBe(PHYSICS_VERSION);

  const core = await openEmbedded({ dataDir, workers: 1, batchSize: 2, logger: pino({ level: 'silent' }) });
  try {
    const done = await waitForScan(core, scan.id, 30_000);
    expect(done.state).toBe('failed');
    expect(done.error).toContain(`physics version test stored this scan, but this process computes with ${PHYSICS_VERSION}: run the same Rollway release on every machine, or clone the scan to compute it again with this one`);
    expect(done.pointsDone).toBe(0);
  } finally {
    await core.close();
  }
}, 60_000);
