import { computed, onBeforeUnmount, onMounted, ref, watch, type Ref } from 'vue';
import type { Point } from '@shared/model/sketch';
import { gridStepFor } from './grid';
import { boundsOf, fitView, MAX_SCALE, MIN_SCALE, panBy, scaleY, toWorld, withExaggeration, zoomAt, type Size, type View } from './view';

/**
 * The canvas's view state (SketchCanvas.vue): size, zoom and pan, fit, the host's page
 * position, and panning with the middle button or Space-drag. Pure view maths is in view.ts.
 */
export function useCanvasView(host: Readonly<Ref<HTMLDivElement | null>>, points: () => readonly Point[], exaggeration: () => number = () => 1) {
  const size = ref<Size>({ width: 800, height: 500 });
  const view = ref<View>({ scale: 400, originX: 200, originY: 250 });
  const gridStep = computed(() => gridStepFor(view.value));
  /** Once the user pans or zooms, a resize no longer re-fits the section. */
  let userMovedView = false;
  let fitted = false;

  function fit() {
    const pts = points();
    if (pts.length === 0) return;
    view.value = fitView(boundsOf(pts), size.value, 0.18, exaggeration());
  }

  // A new vertical exaggeration keeps x and the middle row of the canvas where they are.
  watch(exaggeration, (ex) => {
    view.value = withExaggeration(view.value, ex, size.value.height / 2);
  });

  function zoomBy(factor: number) {
    view.value = zoomAt(view.value, factor, [size.value.width / 2, size.value.height / 2]);
  }

  /** Shows the section with `centre` at the middle of the canvas at `zoom` pixels per chord (walkthrough). */
  function showView(centre: Point, zoom: number) {
    const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, zoom));
    const next: View = { ...view.value, scale, originX: size.value.width / 2 - centre[0] * scale };
    view.value = { ...next, originY: size.value.height / 2 + centre[1] * scaleY(next) };
  }

  /** The centre of the canvas in section coordinates (what a walkthrough shares). */
  function centre(): Point {
    return toWorld(view.value, [size.value.width / 2, size.value.height / 2]);
  }

  // The first time there is a section, fit it.
  watch(
    () => points().length > 0,
    (has) => {
      if (has && !fitted) {
        fitted = true;
        fit();
      }
    },
    { immediate: true },
  );

  /**
   * The canvas's page position, read at press time and on resize (not per move: reading layout
   * during a drag would force the browser to lay out the page each time).
   */
  let hostRect: { left: number; top: number } = { left: 0, top: 0 };
  function measureHost() {
    const r = host.value?.getBoundingClientRect();
    if (r) hostRect = { left: r.left, top: r.top };
  }
  /** Pixels on the canvas of a pointer event. */
  function screenOf(e: { clientX: number; clientY: number }): [number, number] {
    return [e.clientX - hostRect.left, e.clientY - hostRect.top];
  }

  let resizeObserver: ResizeObserver | null = null;
  onMounted(() => {
    if (!host.value) return;
    const measure = () => {
      if (!host.value) return;
      const r = host.value.getBoundingClientRect();
      const next = { width: Math.max(50, Math.floor(r.width)), height: Math.max(50, Math.floor(r.height)) };
      const first = size.value.width !== next.width || size.value.height !== next.height;
      size.value = next;
      hostRect = { left: r.left, top: r.top };
      if (first && points().length > 0 && !userMovedView) fit();
    };
    measure();
    resizeObserver = new ResizeObserver(measure);
    resizeObserver.observe(host.value);
  });
  onBeforeUnmount(() => resizeObserver?.disconnect());

  // ---- pan (middle button, or Space held with the left button) and wheel zoom ----
  let panning: { x: number; y: number; view: View } | null = null;

  function startPan(e: { clientX: number; clientY: number }) {
    panning = { x: e.clientX, y: e.clientY, view: view.value };
  }
  /** Follows a pan in progress; false when there is none. */
  function panTo(e: { clientX: number; clientY: number }): boolean {
    if (!panning) return false;
    userMovedView = true;
    view.value = panBy(panning.view, e.clientX - panning.x, e.clientY - panning.y);
    return true;
  }
  /** Ends a pan; false when there was none. */
  function endPan(): boolean {
    const was = panning !== null;
    panning = null;
    return was;
  }
  const isPanning = () => panning !== null;

  function onWheel(e: WheelEvent) {
    const r = host.value!.getBoundingClientRect();
    const factor = Math.exp(-e.deltaY * (e.deltaMode === 1 ? 0.05 : 0.0015));
    userMovedView = true;
    view.value = zoomAt(view.value, factor, [e.clientX - r.left, e.clientY - r.top]);
  }

  return { size, view, gridStep, fit, zoomBy, showView, centre, measureHost, screenOf, startPan, panTo, endPan, isPanning, onWheel };
}

export type CanvasView = ReturnType<typeof useCanvasView>;
