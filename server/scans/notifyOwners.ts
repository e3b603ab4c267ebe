import { eq, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { PointStatus } from '../../shared/physics/point/types.ts';
import { POINT_STATUSES } from '../../shared/api/results.ts';
import type { Database } from '../db/client.ts';
import { pointResults } from '../db/schema/pointResults.ts';
import type { ScanEvents } from './scanEvents.ts';
import { listScansWithNames } from './scansRepository.ts';
import { toScanView } from './scanView.ts';
import type { Mailer } from '../mail/mailer.ts';
import { scanFailedMail, scanFinishedMail } from '../mail/templates.ts';

/**
 * Mails a scan's owner when it completes or fails (a cancelled scan was the user's own doing).
 * Listens to the in-process progress bus; each scan is mailed once per server run.
 */
export function notifyScanOwners(deps: { db: Database; events: ScanEvents; mailer: Mailer; publicUrl: string; logger: Logger }): () => void {
  const { db, events, mailer, publicUrl, logger } = deps;
  const mailed = new Set<number>();
  const notify = async (id: number, state: 'completed' | 'failed') => {
    const [scan] = await listScansWithNames(db, undefined, id);
    if (!scan?.owner) return;
    const view = toScanView(scan);
    const link = `${publicUrl}/scans/${id}`;
    if (state === 'failed') {
      await mailer.send(scanFailedMail({ to: scan.owner.email, scan: view, error: scan.error ?? 'unknown error', link }));
      return;
    }
    const rows = await db.select({ status: pointResults.status, n: sql<number>`count(*)::int` }).from(pointResults)
      .where(eq(pointResults.scanId, id)).groupBy(pointResults.status);
    const byStatus = Object.fromEntries(POINT_STATUSES.map((s) => [s, 0])) as Record<PointStatus, number>;
    for (const r of rows) byStatus[r.status as PointStatus] = r.n;
    await mailer.send(scanFinishedMail({ to: scan.owner.email, scan: view, byStatus, link }));
  };
  return events.subscribeAll((view) => {
    if ((view.state !== 'completed' && view.state !== 'failed') || mailed.has(view.id)) return;
    mailed.add(view.id);
    notify(view.id, view.state).catch((err: unknown) => logger.error({ err, scanId: view.id }, 'scan notification mail failed'));
  });
}
