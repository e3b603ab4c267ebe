import type { Database } from '../../../server/db/client.ts';
import { batches, scans, type Batch, type NewPointResultRow, type Scan } from '../../../server/db/schema/index.ts';

/** A scan with its points cut into batches of `batchSize`, as the scans service stores it. */
export async function seedScan(db: Database, pointCount: number, batchSize: number): Promise<{ scan: Scan; batches: Batch[] }> {
  const [scan] = await db
    .insert(scans)
    .values({ title: 'Plateau sweep', plan: { family: 'starobinsky' }, planText: 'family: starobinsky\n', planHash: 'h', physicsVersion: 'test', pointCount })
    .returning();
  const slices = [];
  for (let first = 0; first < pointCount; first += batchSize) {
    slices.push({ scanId: scan!.id, firstIndex: first, pointCount: Math.min(batchSize, pointCount - first) });
  }
  return { scan: scan!, batches: await db.insert(batches).values(slices).returning() };
}

/** A point result whose every column holds a distinct value, so a swapped column cannot pass. */
export function resultRow(scanId: number, pointIndex: number, overrides: Partial<NewPointResultRow> = {}): NewPointResultRow {
  const v = (k: number) => (pointIndex + 1) * Math.PI * 10 ** -k + k / 7;
  return {
    scanId, pointIndex,
    params: { alpha: 0.1 * (pointIndex + 1), nStar: 55 },
    status: 'ok', reason: '',
    nTotal: v(1), nPivot: v(2), phiStart: v(3), phiEnd: v(4), phiPivot: v(5), deltaPhi: v(6),
    eps1: v(7), eps2: v(8), eps3: v(9), ns: 0.96 + v(10), r: v(11), nt: -v(12), alphaS: -v(13),
    As: 2.1e-9 * v(1), amplitude: 1e-10 * v(2), energyScaleGeV: 1.6e16 * v(3), hubbleGeV: 3e13 * v(4),
    exactNs: 0.96 + v(14), exactR: v(15), exactNt: -v(16), exactAlphaS: -v(17), exactAs: 2.1e-9 * v(5), exactAmplitude: 1e-10 * v(6),
    chi2: v(18), region: 'inside95', computeMs: v(19), evaluations: 3700 + pointIndex, pointKey: `key-${pointIndex}`,
    ...overrides,
  };
}

/** A failed point as the physics core reports it: observables NaN (scored chi2 Infinity). */
export function failedRow(scanId: number, pointIndex: number): NewPointResultRow {
  const nan = Number.NaN;
  return resultRow(scanId, pointIndex, {
    status: 'too_few_efolds', reason: 'only 41.2 e-folds, the pivot needs 55',
    nPivot: nan, phiPivot: nan, deltaPhi: nan, eps1: nan, eps2: nan, eps3: nan, ns: nan, r: nan, nt: nan, alphaS: nan,
    As: Number.POSITIVE_INFINITY, amplitude: Number.NEGATIVE_INFINITY, energyScaleGeV: nan, hubbleGeV: nan,
    exactNs: null, exactR: null, exactNt: null, exactAlphaS: null, exactAs: null, exactAmplitude: null,
    chi2: Number.POSITIVE_INFINITY, region: 'outside',
  });
}
