import { and, eq, inArray } from 'drizzle-orm';
import type { PointSource } from '../../shared/plan/expandPlan.ts';
import type { Database } from '../db/client.ts';
import type { Batch } from '../db/schema/batches.ts';
import { pointResults, type NewPointResultRow } from '../db/schema/pointResults.ts';
import { pointKey } from './pointKey.ts';

/**
 * For a scan derived from another (re-run with changed settings, or an axis extended): copies
 * the batch's points whose computation the source scan already has, and says which are left to
 * compute. Matching is by point key, so changed tolerances or pivots recompute, unchanged points
 * do not.
 */
export async function reuseResults(db: Database, source: PointSource, batch: Batch, basedOnScanId: number): Promise<{ copied: NewPointResultRow[]; remaining: number[] }> {
  const wanted = new Map<string, number>();
  for (let index = batch.firstIndex; index < batch.firstIndex + batch.pointCount; index++) {
    wanted.set(pointKey(source.requestAt(index)), index);
  }
  const found = await db.select().from(pointResults)
    .where(and(eq(pointResults.scanId, basedOnScanId), inArray(pointResults.pointKey, [...wanted.keys()])));
  const copied: NewPointResultRow[] = [];
  for (const row of found) {
    const index = wanted.get(row.pointKey!);
    if (index === undefined) continue;
    wanted.delete(row.pointKey!);
    copied.push({ ...row, scanId: batch.scanId, pointIndex: index, computeMs: 0 });
  }
  return { copied, remaining: [...wanted.values()].sort((a, b) => a - b) };
}
