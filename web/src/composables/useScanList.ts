import { onBeforeUnmount, watch } from 'vue';
import { TERMINAL_STATES } from '../../../shared/api/scans.ts';
import { scansApi } from '../api/scans.ts';
import { useLoader } from './useLoader.ts';

/**
 * The scans list, refreshed every few seconds while any scan is waiting or computing. A list can
 * hold many running scans; one event stream each would use up the browser's six connections per
 * server (HTTP/1.1) and stall every other request, so the list polls and the scan page streams.
 * Polling pauses while the tab is hidden.
 */
export function useScanList(intervalMs = 3000) {
  const loader = useLoader(() => scansApi.list());
  let timer: ReturnType<typeof setTimeout> | undefined;
  const active = () => loader.data.value?.some((s) => !TERMINAL_STATES.has(s.state)) ?? false;

  function schedule(): void {
    clearTimeout(timer);
    timer = undefined;
    if (!active()) return;
    timer = setTimeout(async () => {
      if (globalThis.document?.visibilityState !== 'hidden') await loader.reload();
      schedule();
    }, intervalMs);
  }
  watch(loader.data, schedule);
  onBeforeUnmount(() => clearTimeout(timer));
  return loader;
}
