import { shallowRef, type ShallowRef } from 'vue';
import { ApiError } from '../api/http.ts';

export interface Loader<T> {
  data: ShallowRef<T | undefined>;
  loading: ShallowRef<boolean>;
  error: ShallowRef<ApiError | undefined>;
  /** Runs the request again; a reload that fails keeps the data already shown. */
  reload: () => Promise<void>;
}

export const asApiError = (e: unknown): ApiError => (e instanceof ApiError ? e : new ApiError(0, 'unexpected', e instanceof Error ? e.message : String(e)));

/** The one owner of a page's loading and error state; answers that arrive out of order are dropped. */
export function useLoader<T>(load: () => Promise<T>, options: { immediate?: boolean } = {}): Loader<T> {
  const data = shallowRef<T>();
  const loading = shallowRef(false);
  const error = shallowRef<ApiError>();
  let generation = 0;
  async function reload(): Promise<void> {
    const mine = ++generation;
    loading.value = true;
    try {
      const value = await load();
      if (mine !== generation) return;
      data.value = value;
      error.value = undefined;
    } catch (e) {
      if (mine === generation) error.value = asApiError(e);
    } finally {
      if (mine === generation) loading.value = false;
    }
  }
  if (options.immediate !== false) void reload();
  return { data, loading, error, reload };
}
