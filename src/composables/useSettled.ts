import { onBeforeUnmount, shallowRef, watch, type Ref, type ShallowRef } from 'vue';

/**
 * A copy of `source` that follows it at once while `busy` is false; while `busy` is true it
 * follows only once `source` has held still for `settleMs` (with null, not until `busy` ends),
 * and it always catches up when `busy` ends. The editor uses it so that during a drag the DOM
 * panels (coefficients, status line; the Cp chart only after the drag) update when the pointer
 * pauses, while the canvas repaints on every solve: each DOM change costs the browser a repaint
 * of the page around it, which would otherwise compete with the canvas for the frame.
 */
export function useSettled<T>(source: Ref<T>, busy: Ref<boolean>, settleMs: number | null): ShallowRef<T> {
  const out = shallowRef(source.value) as ShallowRef<T>;
  let timer: ReturnType<typeof setTimeout> | null = null;

  const cancel = () => {
    if (timer) clearTimeout(timer);
    timer = null;
  };
  const follow = () => {
    cancel();
    out.value = source.value;
  };

  watch(source, () => {
    if (!busy.value) return follow();
    cancel();
    if (settleMs !== null) timer = setTimeout(follow, settleMs);
  });
  watch(busy, (b) => {
    if (!b && out.value !== source.value) follow();
  });
  onBeforeUnmount(cancel);
  return out;
}
