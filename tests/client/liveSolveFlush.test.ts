import { afterEach, describe, expect, it, vi } from 'vitest';
import { defineComponent, h, nextTick, ref, shallowRef } from 'vue';
import { mount } from '@vue/test-utils';
import { defaultSketchDocument, type SketchDocument } from '@shared/model/sketch';
import { useLiveSolve } from '@/composables/useLiveSolve';
import type { WorkerRequest } from '@/workers/solverProtocol';

/** A stand-in for the solver worker that records what the page posts to it. */
class RecordingWorker {
  static posted: WorkerRequest[] = [];
  onmessage: ((e: MessageEvent) => void) | null = null;
  onerror: ((e: ErrorEvent) => void) | null = null;
  postMessage(msg: WorkerRequest) {
    RecordingWorker.posted.push(msg);
  }
  terminate() {}
}

afterEach(() => {
  vi.unstubAllGlobals();
  RecordingWorker.posted = [];
});

describe('useLiveSolve: what goes to the solver worker, and when', () => {
  it('a drag\'s preview is posted when the canvas says the move is applied (scene.flush), before the end of the task; nothing twice', async () => {
    vi.stubGlobal('Worker', RecordingWorker);
    const doc = shallowRef<SketchDocument | null>(defaultSketchDocument());
    const dragging = ref(false);
    let live: ReturnType<typeof useLiveSolve> | null = null;
    const wrapper = mount(defineComponent({
      setup() {
        live = useLiveSolve(doc, { selectedOnly: dragging });
        return () => h('div');
      },
    }));
    await nextTick();
    const solves = () => RecordingWorker.posted.filter((m) => m.type === 'solve');
    expect(solves()).toHaveLength(1); // the first document
    // A move of a drag: the preview and the scene state of the same moment.
    dragging.value = true;
    const base = defaultSketchDocument();
    doc.value = { ...base, section: { points: base.section.points.map((p, i) => (i === 1 ? [p[0], p[1] + 0.01] : p)) } };
    live!.scene.update({ size: { width: 800, height: 500 }, pixelRatio: 1, view: { scale: 400, originX: 100, originY: 250 }, layers: {} as never, selection: [1], hoverVertex: null, hoverFacet: null, showVertices: true, marquee: null, drawPath: null, ghost: null, readoutVertex: 1 });
    // Queued, not yet sent: the page's other work of this task would come first.
    expect(solves()).toHaveLength(1);
    live!.scene.flush();
    expect(solves()).toHaveLength(2);
    const sent = solves()[1] as Extract<WorkerRequest, { type: 'solve' }>;
    expect(sent.selectedOnly).toBe(true);
    expect(sent.document.section.points[1]![1]).toBeCloseTo(base.section.points[1]![1] + 0.01, 12);
    expect(sent.scene?.readoutVertex).toBe(1);
    // The task's end sends nothing more; a flush with nothing queued sends nothing.
    await Promise.resolve();
    await nextTick();
    live!.scene.flush();
    expect(RecordingWorker.posted.filter((m) => m.type === 'solve' || m.type === 'scene')).toHaveLength(2);
    wrapper.unmount();
  });
});
