import { onBeforeUnmount, shallowRef, watch, type Ref } from 'vue';
import type { ScanDetail, ScanView } from '../../../shared/api/scans.ts';
import { scanViewSchema, TERMINAL_STATES } from '../../../shared/api/scans.ts';
import { scansApi } from '../api/scans.ts';
import { useLoader } from './useLoader.ts';

/**
 * One scan with live progress: the detail once, then the server-sent `progress` events (one per
 * stored batch) merged into it until the scan stops. The server ends the stream at a final state;
 * EventSource would reconnect on its own, so the stream is closed here first.
 */
export function useScanLive(id: Ref<number>) {
  const loader = useLoader(() => scansApi.get(id.value), { immediate: false });
  const live = shallowRef(false);
  let source: EventSource | undefined;

  function close(): void {
    source?.close();
    source = undefined;
    live.value = false;
  }
  function merge(view: ScanView): void {
    const current = loader.data.value;
    if (current && current.id === view.id) loader.data.value = { ...current, ...view } satisfies ScanDetail;
  }
  function listen(scan: ScanDetail): void {
    close();
    if (TERMINAL_STATES.has(scan.state) || typeof EventSource === 'undefined') return;
    source = new EventSource(scansApi.eventsUrl(scan.id));
    live.value = true;
    source.addEventListener('progress', (event) => {
      const parsed = scanViewSchema.safeParse(JSON.parse((event as MessageEvent<string>).data));
      if (!parsed.success) return;
      merge(parsed.data);
      if (TERMINAL_STATES.has(parsed.data.state)) close();
    });
    // Dropped connections are retried by EventSource itself; only show that the view is not live.
    source.addEventListener('error', () => (live.value = source?.readyState === EventSource.OPEN));
    source.addEventListener('open', () => (live.value = true));
  }

  watch(id, async () => {
    close();
    loader.data.value = undefined;
    await loader.reload();
    if (loader.data.value) listen(loader.data.value);
  }, { immediate: true });
  onBeforeUnmount(close);

  /** After cancel: the answer is the new state; the stream ends by itself. */
  return { ...loader, live, merge };
}
