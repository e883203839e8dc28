import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { defaultSketchDocument, selectedPoint, type SketchDocument } from '@shared/model/sketch';
import type { Sketch } from '@shared/model/sketchApi';
import { AUTOSAVE_DEBOUNCE_MS } from '@/timing';
import { itemAt } from '@shared/util/invariant';

const apiMock = vi.hoisted(() => ({ get: vi.fn(), put: vi.fn(), patch: vi.fn(), post: vi.fn(), delete: vi.fn() }));
vi.mock('@/api/client', async (importOriginal) => {
  const real = await importOriginal<typeof import('@/api/client')>();
  return { ...real, api: apiMock };
});

const { useSketchStore } = await import('@/stores/sketch');
const { ApiError } = await import('@/api/client');

const ID = 'sketch_aaaaaaaaaaaaaaaaaaaa';

function sketch(document: SketchDocument, revision: number, extra: Partial<Sketch> = {}): Sketch {
  return {
    id: ID,
    teamId: 'team_aaaaaaaaaaaaaaaaaaaa',
    title: 'Tern fin root',
    revision,
    document,
    lastSolveStatus: null,
    lastResult: null,
    createdAt: '2030-01-01T00:00:00.000Z',
    updatedAt: '2030-01-01T00:00:00.000Z',
    updatedByName: 'Ines Marlow',
    reviewStatus: 'draft',
    approval: null,
    reviewState: 'draft',
    ...extra,
  };
}

async function openDemo() {
  const store = useSketchStore();
  apiMock.get.mockResolvedValueOnce(sketch(defaultSketchDocument(), 3));
  await store.open(ID);
  return store;
}

const move = (i: number, x: number, y: number) => ({ type: 'moveVertices' as const, indices: [i], to: [[x, y] as [number, number]] });

describe('sketch store: undo and redo', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.useFakeTimers();
    Object.values(apiMock).forEach((m) => m.mockReset());
  });
  afterEach(() => {
    vi.useRealTimers();
  });

  it('undoes and redoes a sequence of edits in order', async () => {
    // Arrange
    const store = await openDemo();
    const original = store.document!;
    // Act
    store.dispatch(move(1, 0.5, 0.04));
    store.dispatch({ type: 'setCondition', field: 'mach', value: 3 });
    store.dispatch({ type: 'insertVertex', index: 1, at: [0.25, 0.03] });
    // Assert
    expect(store.document!.section.points).toHaveLength(5);
    expect(store.canUndo).toBe(true);
    expect(store.undo()).toBe(true);
    expect(store.document!.section.points).toHaveLength(4);
    expect(store.undo()).toBe(true);
    expect(selectedPoint(store.document!).condition.mach).toBe(2);
    expect(store.undo()).toBe(true);
    expect(store.document).toEqual(original);
    expect(store.undo()).toBe(false);
    expect(store.canRedo).toBe(true);
    expect(store.redo()).toBe(true);
    expect(store.redo()).toBe(true);
    expect(store.redo()).toBe(true);
    expect(store.redo()).toBe(false);
    expect(store.document!.section.points[2]).toEqual([0.5, 0.04]);
    expect(selectedPoint(store.document!).condition.mach).toBe(3);
  });

  it('a new edit after undo clears the redo stack', async () => {
    const store = await openDemo();
    store.dispatch(move(1, 0.5, 0.04));
    store.undo();
    expect(store.canRedo).toBe(true);
    store.dispatch(move(3, 0.5, -0.05));
    expect(store.canRedo).toBe(false);
    expect(store.undoStack).toHaveLength(1);
  });

  it('a refused edit changes nothing, is not recorded and says why', async () => {
    const store = await openDemo();
    const before = store.document;
    const r = store.dispatch(move(0, 0.75, 0.05)); // the nose across the upper ridge: crossing facets
    expect(r.ok).toBe(false);
    expect(store.document).toBe(before);
    expect(store.canUndo).toBe(false);
    expect(store.lastRejection).toMatch(/simple polygon/);
    expect(store.saveState).toBe('saved');
  });

  it('keeps the selection on the same vertices across inserts, deletes and their undo', async () => {
    const store = await openDemo();
    store.setSelection([2, 3]);
    store.dispatch({ type: 'insertVertex', index: 1, at: [0.25, 0.03] });
    expect(store.selection).toEqual([3, 4]);
    store.dispatch({ type: 'deleteVertex', index: 3 });
    expect(store.selection).toEqual([3]);
    store.undo();
    store.undo();
    expect(store.document!.section.points).toHaveLength(4);
  });

  it('a read-only store refuses edits, undo and redo', async () => {
    const store = await openDemo();
    store.dispatch(move(1, 0.5, 0.04));
    store.readOnly = true;
    expect(store.dispatch(move(1, 0.5, 0.05)).ok).toBe(false);
    expect(store.undo()).toBe(false);
    expect(store.document!.section.points[1]).toEqual([0.5, 0.04]);
  });

  it('uses a fresh op id for every application of an op', async () => {
    const store = await openDemo();
    store.dispatch(move(1, 0.5, 0.04));
    const first = itemAt(store.undoStack, 0).op.opId;
    store.undo();
    store.redo();
    expect(itemAt(store.undoStack, 0).op.opId).toBe(first); // the recorded op keeps its id…
    expect(itemAt(store.undoStack, 0).inverse.opId).not.toBe(first); // …its inverse has its own
  });
});

describe('sketch store: autosave', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.useFakeTimers();
    Object.values(apiMock).forEach((m) => m.mockReset());
  });
  afterEach(() => {
    vi.useRealTimers();
  });

  it('saves once after a quiet period, with the base revision, then reads saved', async () => {
    const store = await openDemo();
    apiMock.put.mockImplementation(async (_url: string, body: { document: SketchDocument; baseRevision: number }) => sketch(body.document, body.baseRevision + 1));
    store.dispatch(move(1, 0.5, 0.04));
    store.dispatch(move(1, 0.5, 0.045));
    expect(store.saveState).toBe('unsaved');
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DEBOUNCE_MS - 10);
    expect(apiMock.put).not.toHaveBeenCalled();
    await vi.advanceTimersByTimeAsync(20);
    expect(apiMock.put).toHaveBeenCalledTimes(1);
    const [url, body] = itemAt(apiMock.put.mock.calls, 0);
    expect(url).toBe(`/api/sketches/${ID}/document`);
    expect(body.baseRevision).toBe(3);
    expect(body.document.section.points[1]).toEqual([0.5, 0.045]);
    expect(store.saveState).toBe('saved');
    expect(store.revision).toBe(4);
  });

  it('on a revision conflict reloads, re-applies unsaved edits on top and tells the user', async () => {
    const store = await openDemo();
    const base = defaultSketchDocument();
    const theirs = { ...base, designPoints: [{ ...itemAt(base.designPoints, 0), condition: { ...itemAt(base.designPoints, 0).condition, mach: 2.6 } }] };
    apiMock.put.mockRejectedValueOnce(new ApiError(409, 'revision_conflict', 'The sketch changed since revision 3 (now at 5).'));
    apiMock.get.mockResolvedValueOnce(sketch(theirs, 5, { updatedByName: 'Tomasz Reyes' }));
    store.dispatch(move(1, 0.5, 0.04));
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DEBOUNCE_MS + 10);
    expect(store.revision).toBe(5);
    expect(selectedPoint(store.document!).condition.mach).toBe(2.6); // their edit
    expect(store.document!.section.points[1]).toEqual([0.5, 0.04]); // ours on top
    expect(store.notice?.kind).toBe('conflict');
    expect(store.notice?.message).toMatch(/^Tomasz Reyes saved this sketch while you were editing \(now revision 5\); it was reloaded\. Your 1 unsaved edit was re-applied on top\./);
    expect(store.canUndo).toBe(false);
    expect(store.saveState).toBe('unsaved');
    // The re-applied edit is saved against the new revision.
    apiMock.put.mockImplementation(async (_url: string, body: { document: SketchDocument; baseRevision: number }) => sketch(body.document, body.baseRevision + 1));
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DEBOUNCE_MS + 10);
    expect(apiMock.put.mock.calls.at(-1)![1].baseRevision).toBe(5);
    expect(store.saveState).toBe('saved');
  });

  it('edits made while a save is in flight are saved next', async () => {
    const store = await openDemo();
    let release: (v: Sketch) => void = () => {};
    apiMock.put.mockImplementationOnce((_url: string, body: { document: SketchDocument; baseRevision: number }) => new Promise<Sketch>((res) => (release = () => res(sketch(body.document, 4)))));
    store.dispatch(move(1, 0.5, 0.04));
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DEBOUNCE_MS + 10);
    expect(store.saveState).toBe('saving');
    store.dispatch(move(3, 0.5, -0.04));
    release(sketch(defaultSketchDocument(), 4));
    await vi.advanceTimersByTimeAsync(0);
    expect(store.saveState).toBe('unsaved');
    apiMock.put.mockImplementation(async (_url: string, body: { document: SketchDocument; baseRevision: number }) => sketch(body.document, body.baseRevision + 1));
    await vi.advanceTimersByTimeAsync(AUTOSAVE_DEBOUNCE_MS + 10);
    expect(apiMock.put).toHaveBeenCalledTimes(2);
    expect(itemAt(apiMock.put.mock.calls, 1)[1]).toMatchObject({ baseRevision: 4 });
    expect(itemAt(apiMock.put.mock.calls, 1)[1].document.section.points[3]).toEqual([0.5, -0.04]);
    expect(store.saveState).toBe('saved');
  });
});
