import { ref, shallowRef, watch, type Ref, type WatchSource } from 'vue';
import { ApiError } from '@/api/client';

/**
 * Data fetching for a view: `{ data, isLoading, error, refresh }`. Re-fetches when any `deps`
 * change; a response that arrives after a newer request started is dropped.
 */
export function useApiData<T>(load: () => Promise<T>, deps: WatchSource[] = []) {
  const data = shallowRef<T | null>(null) as Ref<T | null>;
  const isLoading = ref(false);
  const error = ref<ApiError | null>(null);
  let generation = 0;

  async function refresh(): Promise<void> {
    const mine = ++generation;
    isLoading.value = true;
    error.value = null;
    try {
      const value = await load();
      if (mine === generation) data.value = value;
    } catch (err) {
      if (mine === generation) error.value = err instanceof ApiError ? err : new ApiError(0, 'client', (err as Error).message);
    } finally {
      if (mine === generation) isLoading.value = false;
    }
  }

  watch(deps, () => void refresh(), { immediate: true });
  return { data, isLoading, error, refresh };
}
