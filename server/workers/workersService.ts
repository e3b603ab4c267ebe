import type { WorkerView } from '../../shared/api/accounts.ts';
import type { Database } from '../db/client.ts';
import { SILENT_AFTER_SECONDS } from './heartbeat.ts';
import { listWorkers } from './workersRepository.ts';

type Listed = Awaited<ReturnType<typeof listWorkers>>[number];

/** active: reported within three heartbeats; silent: overdue (killed, hung or cut off); stopped: left the pool. */
export function workerStatus(worker: Pick<Listed, 'stoppedAt' | 'heartbeatAgeSeconds'>): WorkerView['status'] {
  if (worker.stoppedAt !== null) return 'stopped';
  return worker.heartbeatAgeSeconds <= SILENT_AFTER_SECONDS ? 'active' : 'silent';
}

export function toWorkerView(worker: Listed): WorkerView {
  return {
    id: worker.id, host: worker.host, pid: worker.pid, concurrency: worker.concurrency,
    pointsDone: worker.pointsDone, pointsPerSecond: worker.pointsPerSecond,
    startedAt: worker.startedAt.toISOString(), lastHeartbeatAt: worker.lastHeartbeatAt.toISOString(),
    stoppedAt: worker.stoppedAt?.toISOString() ?? null,
    status: workerStatus(worker),
  };
}

export function createWorkersService(db: Database) {
  return {
    list: async (): Promise<WorkerView[]> => (await listWorkers(db)).map(toWorkerView),
  };
}

export type WorkersService = ReturnType<typeof createWorkersService>;
