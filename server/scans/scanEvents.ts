import { EventEmitter } from 'node:events';
import type { ScanView } from '../../shared/api/scans.ts';

/**
 * In-process bus for scan progress: the dispatcher publishes after each batch, the SSE route
 * subscribes per scan. The database stays the source of truth; this only saves clients polling.
 */
const ALL = Symbol('all scans');

export class ScanEvents {
  private readonly emitter = new EventEmitter().setMaxListeners(0);

  publish(view: ScanView): void {
    this.emitter.emit(String(view.id), view);
    this.emitter.emit(ALL, view);
  }

  /** Every scan's progress (mail notifications listen here). */
  subscribeAll(listener: (view: ScanView) => void): () => void {
    this.emitter.on(ALL, listener);
    return () => this.emitter.off(ALL, listener);
  }

  subscribe(scanId: number, listener: (view: ScanView) => void): () => void {
    const key = String(scanId);
    this.emitter.on(key, listener);
    return () => this.emitter.off(key, listener);
  }
}
