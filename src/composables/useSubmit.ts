import { ref } from 'vue';
import { ApiError } from '@/api/client';

/**
 * A form's submit action with its state: `submitting` while it runs, `failure` with the server's
 * message (or `fallback`) when it fails, after `prefix` when one is given ("Not reset: "). Used by
 * every account form and the review dialogs.
 */
export function useSubmit(action: () => Promise<void>, fallback: string, prefix = '') {
  const submitting = ref(false);
  const failure = ref<string | null>(null);
  async function submit(): Promise<void> {
    submitting.value = true;
    failure.value = null;
    try {
      await action();
    } catch (err) {
      failure.value = prefix + (err instanceof ApiError ? err.message : fallback);
    } finally {
      submitting.value = false;
    }
  }
  return { submitting, failure, submit };
}

/** An ant-design-vue form rule: the field must equal `other()` (repeat-the-password fields). */
export function sameAs(other: () => string, message = 'The two passwords differ') {
  return {
    validator: async (_rule: unknown, value: string) => {
      if (value !== other()) throw new Error(message);
    },
  };
}
