import { reactive, watch, type WatchStopHandle } from 'vue';
import { NOTICE_TOPICS, type NoticeTopic } from '@shared/protocol/messages';

/**
 * What changed on the open sketch, as counters per topic. The realtime channel calls `bump`
 * when the server says `{ type: 'notice', topic }`; our own actions bump too, so every panel
 * showing that topic refreshes once. Panels call `watchTopic` inside their setup (the watcher
 * stops with the component). Counters only ever grow; nothing reads their values but watchers.
 */
export { NOTICE_TOPICS, type NoticeTopic };

/** Every review change also adds an entry to the activity feed. */
export const ACTIVITY_TOPICS: readonly NoticeTopic[] = ['pins', 'snapshots', 'status', 'activity'];

const counters = reactive(Object.fromEntries(NOTICE_TOPICS.map((t) => [t, 0])) as Record<NoticeTopic, number>);

/** Something about `topic` changed on the open sketch: panels showing it refresh. */
export function bump(...topics: NoticeTopic[]): void {
  for (const t of topics) counters[t] += 1;
}

/** For the realtime channel: bumps a topic named by the server; unknown topics are ignored. */
export function bumpTopic(topic: string): void {
  if ((NOTICE_TOPICS as readonly string[]).includes(topic)) bump(topic as NoticeTopic);
}

/** Calls `refresh` after any of `topics` is bumped (not immediately). */
export function watchTopic(topics: NoticeTopic | readonly NoticeTopic[], refresh: () => void): WatchStopHandle {
  const list = typeof topics === 'string' ? [topics] : [...topics];
  return watch(
    () => list.map((t) => counters[t]).join(' '),
    () => refresh(),
  );
}
