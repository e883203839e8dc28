import { computed, ref, watch, type WatchSource } from 'vue';
import { useApiData } from './useApiData';

export interface Page<T> {
  items: T[];
  total: number;
  limit: number;
  offset: number;
}

/**
 * A paginated list from the API (`?limit=&offset=` → `{ items, total, limit, offset }`) on top
 * of `useApiData`: `{ items, total, page, pageSize, isLoading, error, refresh, setPage }`.
 * Changing a dependency (a filter, the sketch) goes back to page 1; a page left empty by a
 * change elsewhere (the last item resolved away) steps back to the last page that has items.
 */
export function usePagedList<T>(load: (query: { limit: number; offset: number }) => Promise<Page<T>>, deps: WatchSource[] = [], pageSize = 10) {
  const page = ref(1);
  const data = useApiData(() => load({ limit: pageSize, offset: (page.value - 1) * pageSize }), [page]);

  watch(deps, () => {
    if (page.value !== 1) page.value = 1;
    else void data.refresh();
  });

  watch(data.data, (d) => {
    if (d && d.items.length === 0 && d.total > 0 && page.value > 1) page.value = Math.max(1, Math.ceil(d.total / pageSize));
  });

  const items = computed<T[]>(() => data.data.value?.items ?? []);
  const total = computed(() => data.data.value?.total ?? 0);

  function setPage(p: number) {
    page.value = Math.max(1, Math.floor(p));
  }

  return { items, total, page, pageSize, isLoading: data.isLoading, error: data.error, refresh: data.refresh, setPage };
}
