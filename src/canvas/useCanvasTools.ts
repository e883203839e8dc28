import { computed, onBeforeUnmount, onMounted, ref, shallowRef, watch, type Ref } from 'vue';
import type { SketchOpDraft } from '@shared/model/ops';
import type { Point } from '@shared/model/sketch';
import type { Rect, SnapSettings } from './geometry';
import { snapSteps, type CanvasSnap } from './snap';
import { noteHandlerStart } from './paintTiming';
import { TOOLS, type KeyInput, type PointerInput, type ToolContext, type ToolId, type ToolStep } from './tools';
import { boundsOf, toWorld } from './view';
import type { CanvasHover } from './useCanvasHover';
import type { CanvasView } from './useCanvasView';

/** What the tools read from the canvas's props. */
export interface ToolSource {
  tool: ToolId;
  committedPoints: readonly Point[];
  selection: readonly number[];
  snap: CanvasSnap;
  readOnly: boolean;
}

/** What the tools tell the canvas's parent (the component turns these into its emits). */
export interface ToolSink {
  preview(points: Point[] | null, eventTime: number): void;
  commit(op: SketchOpDraft, select: number[] | undefined): void;
  select(indices: number[]): void;
  hint(text: string | null): void;
  tool(id: ToolId): void;
  pointer(world: Point | null): void;
  /** A press the review layer may take (a pin's head, pin mode); true when it did. */
  reviewClick(input: PointerInput): boolean;
  /**
   * A pointer move's effects are all applied: what they queued for the solver worker (the
   * preview's solve, the scene state) may go now, before the page's own rendering.
   */
  moved(): void;
}

/**
 * Tool dispatch for SketchCanvas.vue: pointer and key events become PointerInput/KeyInput for
 * the current tool (a pure state machine in tools/), and the effects it returns become emits
 * or transient canvas state (marquee, the draw tool's path, the insert ghost). Panning (middle
 * button, Space-drag) and the view keys (F, +, −, tool shortcuts) are handled here too.
 */
export function useCanvasTools(host: Readonly<Ref<HTMLDivElement | null>>, source: () => ToolSource, canvas: CanvasView, hover: CanvasHover, sink: ToolSink) {
  // Tool state is opaque to the canvas; tools are pure state machines (src/canvas/tools).
  let toolState: unknown = TOOLS[source().tool].initial();
  const cursor = ref('default');
  const marquee = shallowRef<Rect | null>(null);
  const drawPath = shallowRef<{ points: Point[]; cursor: Point | null } | null>(null);
  const ghost = shallowRef<Point | null>(null);
  /** The vertex the drag readout (t/c, ridge x/c, its position) sits beside; null = hidden. */
  const readout = ref<number | null>(null);
  const spaceHeld = ref(false);
  let pointerDown = false;

  /**
   * Chord and height of the committed section: the automatic snap steps follow them. The height
   * of its box stands in for the thickness (equal for a symmetric section at zero incidence,
   * larger otherwise, which only makes the step a little coarser).
   */
  const snapScale = computed(() => {
    const pts = source().committedPoints;
    if (pts.length < 3) return null;
    const b = boundsOf(pts);
    return { chord: b.maxX - b.minX, thickness: b.maxY - b.minY };
  });
  const snapSettings = computed<SnapSettings>(() => {
    const snap = source().snap;
    return { grid: snap.grid, ...snapSteps(snap, canvas.view.value, snapScale.value), angleStepDeg: snap.angleStepDeg };
  });

  function toolContext(): ToolContext {
    const s = source();
    return { points: s.committedPoints, selection: s.selection, view: canvas.view.value, snap: snapSettings.value, readOnly: s.readOnly };
  }

  watch(
    () => source().tool,
    (next, prev) => {
      if (prev) apply(TOOLS[prev].cancel(toolState), performance.now());
      toolState = TOOLS[next].initial();
      cursor.value = next === 'draw' ? 'crosshair' : 'default';
    },
  );

  function apply(step: ToolStep<unknown>, eventTime: number) {
    toolState = step.state;
    if (step.cursor) cursor.value = step.cursor;
    for (const e of step.effects) {
      switch (e.kind) {
        case 'preview':
          sink.preview(e.points, eventTime);
          break;
        case 'select':
          sink.select(e.indices);
          break;
        case 'commit':
          sink.commit(e.op, e.select);
          break;
        case 'marquee':
          marquee.value = e.rect;
          break;
        case 'path':
          drawPath.value = e.points ? { points: e.points, cursor: e.cursor } : null;
          break;
        case 'ghost':
          ghost.value = e.at;
          break;
        case 'hint':
          sink.hint(e.text);
          break;
        case 'tool':
          sink.tool(e.id);
          break;
        case 'readout':
          readout.value = e.vertex;
          break;
      }
    }
  }

  const current = () => TOOLS[source().tool];

  function pointerInput(e: PointerEvent | MouseEvent): PointerInput {
    const screen = canvas.screenOf(e);
    return { world: toWorld(canvas.view.value, screen), screen, shift: e.shiftKey, alt: e.altKey };
  }

  function onPointerDown(e: PointerEvent) {
    canvas.measureHost();
    host.value?.focus({ preventScroll: true });
    if (e.button === 1 || (e.button === 0 && spaceHeld.value)) {
      e.preventDefault();
      canvas.startPan(e);
      cursor.value = 'grabbing';
      host.value?.setPointerCapture(e.pointerId);
      return;
    }
    if (e.button !== 0) return;
    if (sink.reviewClick(pointerInput(e))) return;
    pointerDown = true;
    host.value?.setPointerCapture(e.pointerId);
    hover.clearHover();
    apply(current().down(toolState, toolContext(), pointerInput(e)), e.timeStamp);
  }

  /**
   * Chromium delivers `pointermove` aligned to the next animation frame; `pointerrawupdate`
   * arrives as soon as the pointer moves. While dragging we take the raw events (when the
   * browser has them), so the solve starts up to a frame earlier; hover keeps `pointermove`.
   */
  const RAW_UPDATES = typeof window !== 'undefined' && 'onpointerrawupdate' in window;

  function onPointerRawUpdate(e: Event) {
    if (pointerDown && !canvas.isPanning()) handleMove(e as PointerEvent);
  }

  function onPointerMove(e: PointerEvent) {
    if (RAW_UPDATES && pointerDown && !canvas.isPanning()) return;
    handleMove(e);
  }

  function handleMove(e: PointerEvent) {
    noteHandlerStart();
    if (canvas.panTo(e)) return;
    const input = pointerInput(e);
    if (pointerDown) {
      // A drag: the preview's solve goes to the worker as soon as the move's effects are
      // applied, before the page re-renders for it; the cursor for the status line and the
      // people watching (a socket message) follows.
      apply(current().move(toolState, toolContext(), input), e.timeStamp);
      sink.moved();
      queueMicrotask(() => sink.pointer(input.world));
      return;
    }
    sink.pointer(input.world);
    apply(current().move(toolState, toolContext(), input), e.timeStamp);
    hover.updateHover(input.world, input.screen);
    sink.moved();
  }

  function onPointerUp(e: PointerEvent) {
    if (host.value?.hasPointerCapture(e.pointerId)) host.value.releasePointerCapture(e.pointerId);
    if (canvas.endPan()) {
      cursor.value = spaceHeld.value ? 'grab' : 'default';
      return;
    }
    if (!pointerDown) return;
    pointerDown = false;
    apply(current().up(toolState, toolContext(), pointerInput(e)), e.timeStamp);
  }

  function onPointerCancel() {
    pointerDown = false;
    canvas.endPan();
    apply(current().cancel(toolState), performance.now());
  }

  function onPointerLeave() {
    sink.pointer(null);
    if (!pointerDown) hover.clearHover();
  }

  function onPointerEnter() {
    canvas.measureHost();
  }

  /** Keys while the editor (not an input field) has focus; true when the canvas used the key. */
  function handleKey(e: KeyboardEvent): boolean {
    if (e.key === ' ') {
      if (!spaceHeld.value) {
        spaceHeld.value = true;
        if (!pointerDown) cursor.value = 'grab';
      }
      return true;
    }
    const k: KeyInput = { key: e.key, shift: e.shiftKey, alt: e.altKey, ctrl: e.ctrlKey || e.metaKey };
    const step = current().key(toolState, toolContext(), k);
    if (step) {
      apply(step, e.timeStamp);
      return true;
    }
    if (k.ctrl || k.alt) return false;
    const lower = e.key.toLowerCase();
    const tool = (Object.keys(TOOLS) as ToolId[]).find((id) => TOOLS[id].shortcut === lower);
    if (tool) {
      sink.tool(tool);
      return true;
    }
    if (lower === 'f') {
      canvas.fit();
      return true;
    }
    if (e.key === '+' || e.key === '=') {
      canvas.zoomBy(1.25);
      return true;
    }
    if (e.key === '-') {
      canvas.zoomBy(0.8);
      return true;
    }
    return false;
  }

  function onKeyUp(e: KeyboardEvent) {
    if (e.key === ' ') {
      spaceHeld.value = false;
      if (!canvas.isPanning()) cursor.value = 'default';
    }
  }

  onMounted(() => {
    window.addEventListener('keyup', onKeyUp);
    if (RAW_UPDATES) host.value?.addEventListener('pointerrawupdate', onPointerRawUpdate);
  });
  onBeforeUnmount(() => {
    window.removeEventListener('keyup', onKeyUp);
    host.value?.removeEventListener('pointerrawupdate', onPointerRawUpdate);
  });

  return {
    cursor,
    marquee,
    drawPath,
    ghost,
    readout,
    snapSettings,
    handleKey,
    onPointerDown,
    onPointerMove,
    onPointerUp,
    onPointerCancel,
    onPointerLeave,
    onPointerEnter,
  };
}

export type CanvasTools = ReturnType<typeof useCanvasTools>;
