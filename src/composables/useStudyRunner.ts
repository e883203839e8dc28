import { onBeforeUnmount, ref, shallowRef } from 'vue';
import type { SketchCase } from '@shared/model/sketch';
import type { StudyDefinition, StudyResults } from '@shared/model/study';
import type { StudyRequest, StudyResponse } from '@/workers/studyProtocol';

/**
 * Runs studies in the study worker: `run` starts one (cancelling any still running), `cancel`
 * stops it between points. `progress` is 0…1; `results` holds the last finished run.
 */
export function useStudyRunner() {
  const running = ref(false);
  const progress = ref(0);
  const done = ref(0);
  const total = ref(0);
  const results = shallowRef<StudyResults | null>(null);
  const elapsedMs = ref<number | null>(null);
  const error = ref<string | null>(null);
  const cancelledAt = ref<number | null>(null);

  let worker: Worker | null = null;
  let current = 0;
  let seq = 0;

  function ensureWorker(): Worker {
    if (worker) return worker;
    worker = new Worker(new URL('../workers/study.worker.ts', import.meta.url), { type: 'module', name: 'shockwright-study' });
    worker.onmessage = (event: MessageEvent<StudyResponse>) => {
      const msg = event.data;
      if (msg.id !== current) return; // an answer to a run that was replaced
      if (msg.type === 'progress') {
        done.value = msg.done;
        total.value = msg.total;
        progress.value = msg.total ? msg.done / msg.total : 0;
        return;
      }
      running.value = false;
      if (msg.type === 'done') {
        results.value = msg.results;
        elapsedMs.value = msg.elapsedMs;
        progress.value = 1;
      } else if (msg.type === 'cancelled') {
        cancelledAt.value = msg.done;
      } else {
        error.value = msg.message;
      }
    };
    worker.onerror = (e) => {
      running.value = false;
      error.value = `The study worker stopped: ${e.message}`;
    };
    return worker;
  }

  function run(document: SketchCase, definition: StudyDefinition): void {
    const w = ensureWorker();
    if (running.value) w.postMessage({ type: 'cancel', id: current } satisfies StudyRequest);
    current = ++seq;
    running.value = true;
    progress.value = 0;
    done.value = 0;
    total.value = 0;
    error.value = null;
    cancelledAt.value = null;
    // Plain data only: a reactive proxy cannot be cloned into the worker.
    w.postMessage({ type: 'run', id: current, document: JSON.parse(JSON.stringify(document)), definition: JSON.parse(JSON.stringify(definition)) } satisfies StudyRequest);
  }

  function cancel(): void {
    if (running.value && worker) worker.postMessage({ type: 'cancel', id: current } satisfies StudyRequest);
  }

  /** Shows results that did not come from the worker (a saved study). */
  function show(next: StudyResults | null, ms: number | null = null): void {
    cancel();
    current = ++seq; // late answers of the cancelled run are ignored
    running.value = false;
    results.value = next;
    elapsedMs.value = ms;
    progress.value = next ? 1 : 0;
  }

  onBeforeUnmount(() => {
    worker?.terminate();
    worker = null;
  });

  return { running, progress, done, total, results, elapsedMs, error, cancelledAt, run, cancel, show };
}
