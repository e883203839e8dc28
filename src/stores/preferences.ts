import { defineStore } from 'pinia';
import { ref } from 'vue';
import { api } from '@/api/client';
import { DEFAULT_PREFERENCES, preferencesSchema } from '@shared/model/preferences';
import type { UnitSystem } from '@shared/flight/units';

/**
 * The signed-in person's own settings, kept on the server (GET/PATCH /api/preferences). Display
 * units switch at once; the server is told in the background and the choice reverts if it says no.
 */
export const usePreferencesStore = defineStore('preferences', () => {
  const unitSystem = ref<UnitSystem>(DEFAULT_PREFERENCES.unitSystem);
  const loaded = ref(false);
  const error = ref<string | null>(null);
  let loading: Promise<void> | null = null;

  function load(): Promise<void> {
    loading ??= api
      .get('/api/preferences', preferencesSchema)
      .then((p) => {
        unitSystem.value = p.unitSystem;
        loaded.value = true;
      })
      .catch((err: Error) => {
        error.value = err.message;
        loading = null;
      });
    return loading;
  }

  async function setUnitSystem(next: UnitSystem): Promise<void> {
    const before = unitSystem.value;
    unitSystem.value = next;
    error.value = null;
    try {
      unitSystem.value = (await api.patch('/api/preferences', { unitSystem: next }, preferencesSchema)).unitSystem;
    } catch (err) {
      unitSystem.value = before;
      error.value = `Units not saved: ${(err as Error).message}`;
    }
  }

  return { unitSystem, loaded, error, load, setUnitSystem };
});
