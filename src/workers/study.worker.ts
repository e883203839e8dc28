/// <reference lib="webworker" />
import { runStudySliced } from '@shared/flight/study';
import type { StudyRequest, StudyResponse } from './studyProtocol';

/**
 * Studies in a Web Worker, with the engine the server uses (shared/flight/study.ts). The run is
 * cut into slices of SLICE_MS; between slices the worker yields through a MessageChannel (no
 * timer clamping), which is when a cancel message gets in. Progress goes out after every slice.
 */
const scope = self as unknown as DedicatedWorkerGlobalScope;
const SLICE_MS = 30;
const cancelled = new Set<number>();

const channel = new MessageChannel();
const waiting: (() => void)[] = [];
channel.port1.onmessage = () => waiting.shift()?.();
const pause = () =>
  new Promise<void>((resolve) => {
    waiting.push(resolve);
    channel.port2.postMessage(null);
  });

const send = (msg: StudyResponse) => scope.postMessage(msg);

scope.onmessage = async (event: MessageEvent<StudyRequest>) => {
  const msg = event.data;
  if (msg.type === 'cancel') {
    cancelled.add(msg.id);
    return;
  }
  const { id } = msg;
  try {
    const outcome = await runStudySliced(msg.document, msg.definition, {
      pause,
      sliceMs: SLICE_MS,
      isCancelled: () => cancelled.has(id),
      onProgress: (p) => send({ type: 'progress', id, done: p.done, total: p.total }),
    });
    if (outcome.status === 'done') send({ type: 'done', id, results: outcome.results, elapsedMs: outcome.elapsedMs });
    else if (outcome.status === 'cancelled') send({ type: 'cancelled', id, done: outcome.done, total: outcome.total });
    else send({ type: 'failed', id, message: outcome.reason });
  } catch (err) {
    // The engine throws only for programmer errors; say so rather than going silent.
    send({ type: 'failed', id, message: `The study failed unexpectedly: ${(err as Error).message}` });
  } finally {
    cancelled.delete(id);
  }
};
