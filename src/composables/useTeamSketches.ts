import { ref, shallowRef, watch, type Ref } from 'vue';
import { z } from 'zod';
import { api, ApiError } from '@/api/client';
import { sketchSummarySchema, type SketchSummary } from '@shared/model/sketchApi';

const listSchema = z.array(sketchSummarySchema);

/**
 * The current team's sketches for the home table; reloads when the team changes and, through
 * the home page's live channel (`useTeamChannel`), whenever the team's list changes — then
 * quietly (`{ quiet: true }`: no loading state, the table stays as it is until the answer).
 */
export function useTeamSketches(teamId: Ref<string | null>) {
  const data = shallowRef<SketchSummary[]>([]);
  const isLoading = ref(false);
  const error = ref<string | null>(null);
  let ticket = 0;

  async function refresh(options: { quiet?: boolean } = {}): Promise<void> {
    const id = teamId.value;
    const mine = ++ticket;
    if (!id) {
      data.value = [];
      isLoading.value = false;
      return;
    }
    if (!options.quiet) isLoading.value = true;
    error.value = null;
    try {
      const rows = await api.get(`/api/teams/${id}/sketches`, listSchema);
      if (mine === ticket) data.value = rows;
    } catch (err) {
      if (mine === ticket) error.value = err instanceof ApiError ? err.message : 'The sketches could not be loaded.';
    } finally {
      if (mine === ticket) isLoading.value = false;
    }
  }

  /** Shows no rows at once (my membership ended while the page was open) [T3]. */
  function clear(): void {
    ++ticket;
    data.value = [];
    isLoading.value = false;
  }

  watch(teamId, () => void refresh(), { immediate: true });
  return { data, isLoading, error, refresh, clear };
}
