import { onScopeDispose, ref, shallowRef } from 'vue';
import type { PointRequestInput } from '../../../shared/plan/pointRequest.ts';
import type { PreviewReply, PreviewRequest } from '../workers/pointProtocol.ts';

export type { PreviewReply, PreviewRequest } from '../workers/pointProtocol.ts';

/** What the composable needs of a Worker (tests pass a fake that calls handlePreview). */
export interface PointWorkerLike {
  postMessage(message: PreviewRequest): void;
  onmessage: ((event: MessageEvent<PreviewReply>) => void) | null;
  onerror: ((event: ErrorEvent) => void) | null;
  terminate(): void;
}

const createWorker = (): PointWorkerLike =>
  new Worker(new URL('../workers/point.worker.ts', import.meta.url), { type: 'module' }) as unknown as PointWorkerLike;

/**
 * One point computed by the physics core in a Web Worker. Only the latest request matters: while
 * the worker is busy a newer request waits (replacing any older waiting one), and replies to
 * superseded requests are dropped. `reply` holds the last answer, `busy` whether one is coming.
 */
export function usePointWorker(factory: () => PointWorkerLike = createWorker) {
  const reply = shallowRef<PreviewReply | null>(null);
  const busy = ref(false);
  let worker: PointWorkerLike | null = null;
  let nextId = 1;
  let running: number | null = null;
  let waiting: PreviewRequest | null = null;

  function send(message: PreviewRequest): void {
    running = message.id;
    busy.value = true;
    ensureWorker().postMessage(message);
  }

  function ensureWorker(): PointWorkerLike {
    if (worker) return worker;
    const created = factory();
    created.onmessage = (event) => {
      const data = event.data;
      if (data.id !== running) return;
      running = null;
      if (waiting) {
        const next = waiting;
        waiting = null;
        send(next);
        return;
      }
      busy.value = false;
      reply.value = data;
    };
    created.onerror = (event) => {
      // A crashed worker cannot be trusted with the next request: start a fresh one.
      const id = running ?? 0;
      running = null;
      busy.value = false;
      worker?.terminate();
      worker = null;
      reply.value = { id, ok: false, error: { field: '', message: `the preview worker failed: ${event.message || 'unknown error'}` } };
    };
    worker = created;
    return created;
  }

  /** Asks for a preview of this point; returns the request's id. */
  function compute(request: PointRequestInput, options: Omit<PreviewRequest, 'id' | 'request'> = {}): number {
    // Plain data only: a reactive proxy cannot be cloned into the worker.
    const message: PreviewRequest = { id: nextId++, request: JSON.parse(JSON.stringify(request)) as PointRequestInput, ...options };
    if (running !== null) waiting = message;
    else send(message);
    return message.id;
  }

  function stop(): void {
    worker?.terminate();
    worker = null;
    running = null;
    waiting = null;
    busy.value = false;
  }

  onScopeDispose(stop);
  return { reply, busy, compute, stop };
}
