import { ref, shallowRef, watch, type Ref } from 'vue';
import { z } from 'zod';
import { api, ApiError } from '@/api/client';
import { sketchSummarySchema, type SketchSummary } from '@shared/model/sketchApi';

const listSchema = z.array(sketchSummarySchema);

/** The current team's sketches for the home table; reloads when the team changes. */
export function useTeamSketches(teamId: Ref<string | null>) {
  const data = shallowRef<SketchSummary[]>([]);
  const isLoading = ref(false);
  const error = ref<string | null>(null);
  let ticket = 0;

  async function refresh(): Promise<void> {
    const id = teamId.value;
    const mine = ++ticket;
    if (!id) {
      data.value = [];
      return;
    }
    isLoading.value = true;
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

  watch(teamId, () => void refresh(), { immediate: true });
  return { data, isLoading, error, refresh };
}
