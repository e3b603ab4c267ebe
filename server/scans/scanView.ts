import type { ScanDetail, ScanView } from '../../shared/api/scans.ts';
import type { Scan } from '../db/schema/scans.ts';

const iso = (d: Date | null): string | null => (d === null ? null : d.toISOString());

/** The API's view of a stored scan, with rate and ETA derived rather than stored. */
/** Owner and group names joined in by the repository; absent for rows read without them. */
export interface ScanNames {
  owner?: { id: number; name: string; email: string } | null;
  group?: { id: number; name: string } | null;
}

export function toScanView(scan: Scan & ScanNames, now = Date.now()): ScanView {
  const elapsed = scan.startedAt ? ((scan.finishedAt ?? new Date(now)).getTime() - scan.startedAt.getTime()) / 1000 : 0;
  const rate = scan.startedAt && elapsed > 0 && scan.pointsDone > 0 ? scan.pointsDone / elapsed : null;
  const remaining = scan.pointCount - scan.pointsDone;
  const active = scan.state === 'running' || scan.state === 'queued';
  return {
    id: scan.id,
    title: scan.title,
    notes: scan.notes,
    state: scan.state,
    pointCount: scan.pointCount,
    pointsDone: scan.pointsDone,
    pointsFailed: scan.pointsFailed,
    pointsPerSecond: rate,
    etaSeconds: active && rate ? remaining / rate : null,
    planHash: scan.planHash,
    physicsVersion: scan.physicsVersion,
    basedOnScanId: scan.basedOnScanId,
    owner: scan.owner ?? null,
    group: scan.group ?? null,
    computeSeconds: scan.computeSeconds,
    error: scan.error,
    createdAt: scan.createdAt.toISOString(),
    startedAt: iso(scan.startedAt),
    finishedAt: iso(scan.finishedAt),
  };
}

export function toScanDetail(scan: Scan & ScanNames): ScanDetail {
  return { ...toScanView(scan), plan: scan.plan, planText: scan.planText };
}
