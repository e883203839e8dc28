import { onBeforeUnmount, shallowRef, watch, type Ref, type ShallowRef } from 'vue';

/**
 * A copy of `source` that follows it at once while `busy` is false and at most every
 * `intervalMs` while it is true (always ending on the latest value); with `intervalMs` null it
 * holds still while busy. The editor uses it so that the DOM panels refresh a few times a
 * second during a drag (the Cp chart only when the drag ends) while the canvas repaints on
 * every solve: each DOM change costs the browser a repaint of the page around it.
 */
export function useThrottled<T>(source: Ref<T>, busy: Ref<boolean>, intervalMs: number | null): ShallowRef<T> {
  const out = shallowRef(source.value) as ShallowRef<T>;
  let last = 0;
  let timer: ReturnType<typeof setTimeout> | null = null;

  const flush = () => {
    timer = null;
    last = performance.now();
    out.value = source.value;
  };

  watch(source, () => {
    if (!busy.value) {
      if (timer) clearTimeout(timer);
      flush();
      return;
    }
    if (timer || intervalMs === null) return;
    const wait = Math.max(0, last + intervalMs - performance.now());
    timer = setTimeout(flush, wait);
  });
  // When the drag ends, catch up immediately.
  watch(busy, (b) => {
    if (!b && out.value !== source.value) {
      if (timer) clearTimeout(timer);
      flush();
    }
  });
  onBeforeUnmount(() => {
    if (timer) clearTimeout(timer);
  });
  return out;
}
