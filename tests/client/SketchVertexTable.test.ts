import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import { FIELD_CHANGES, type FieldChangeEvent, type FieldChangeFeed } from '@/composables/useFieldEdits';
import type { EditOp } from '@shared/protocol/messages';
import SketchVertexTable from '@/components/SketchVertexTable.vue';
import type { Point } from '@shared/model/sketch';
import type { ApplyOpResult, SketchOpDraft } from '@shared/model/ops';
import { applyOp, withOpId } from '@shared/model/ops';
import { defaultSketchDocument } from '@shared/model/sketch';
import { itemAt } from '@shared/util/invariant';

const wedge: [Point, Point, Point, Point] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];

function mountTable(props: Partial<{ points: Point[]; selection: number[]; readOnly: boolean; apply: (op: SketchOpDraft) => ApplyOpResult }> = {}) {
  const apply = props.apply ?? vi.fn((op: SketchOpDraft) => applyOp({ ...defaultSketchDocument(), section: { points: wedge } }, withOpId(op)));
  const wrapper = mount(SketchVertexTable, { props: { points: wedge, selection: [], readOnly: false, apply, ...props }, attachTo: document.body });
  return { wrapper, apply };
}

async function edit(wrapper: ReturnType<typeof mountTable>['wrapper'], testId: string, value: string, key = 'Enter') {
  const input = wrapper.get(`[data-testid="${testId}"]`);
  await input.trigger('focus');
  (input.element as HTMLInputElement).value = value;
  await input.trigger('input');
  await input.trigger('keydown', { key });
}

describe('SketchVertexTable', () => {
  it('lists every vertex with x and y and marks the nose and the tail', () => {
    const { wrapper } = mountTable();
    const rows = wrapper.findAll('tbody tr');
    expect(rows).toHaveLength(4);
    expect((wrapper.get('[data-testid="vertex-x-1"]').element as HTMLInputElement).value).toBe('0.5');
    expect((wrapper.get('[data-testid="vertex-y-3"]').element as HTMLInputElement).value).toBe('-0.025');
    expect(itemAt(rows, 0).text()).toContain('nose');
    expect(itemAt(rows, 2).text()).toContain('tail');
    wrapper.unmount();
  });

  it('[O5] an edited cell becomes one setVertexCoordinate op for that coordinate only', async () => {
    const { wrapper, apply } = mountTable();
    await edit(wrapper, 'vertex-y-1', '0.04');
    expect(apply).toHaveBeenCalledTimes(1);
    expect(apply).toHaveBeenCalledWith({ type: 'setVertexCoordinate', index: 1, axis: 'y', value: 0.04 });
    expect(wrapper.find('[data-testid="vertex-table-error"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('refuses text that is not a number, says which cell, and sends nothing', async () => {
    const { wrapper, apply } = mountTable();
    await edit(wrapper, 'vertex-x-2', '1,2');
    expect(apply).not.toHaveBeenCalled();
    expect(wrapper.get('[data-testid="vertex-table-error"]').text()).toBe('Vertex 2: x must be a number (got “1,2”).');
    expect(wrapper.get('[data-testid="vertex-x-2"]').classes()).toContain('is-invalid');
    wrapper.unmount();
  });

  it('shows the store’s reason when the op is refused and keeps the typed value', async () => {
    const reason = 'Moving vertex 0 there is not allowed: facet 3 (vertex 3 → 0) would cross or touch facet 1 (vertex 1 → 2). The section must stay a simple polygon.';
    const { wrapper, apply } = mountTable({ apply: vi.fn(() => ({ ok: false as const, reason })) });
    await edit(wrapper, 'vertex-x-0', '0.9');
    expect(apply).toHaveBeenCalledWith({ type: 'setVertexCoordinate', index: 0, axis: 'x', value: 0.9 });
    expect(wrapper.get('[data-testid="vertex-table-error"]').text()).toBe(reason);
    expect((wrapper.get('[data-testid="vertex-x-0"]').element as HTMLInputElement).value).toBe('0.9');
    // Escape gives the model value back.
    await wrapper.get('[data-testid="vertex-x-0"]').trigger('focus');
    await wrapper.get('[data-testid="vertex-x-0"]').trigger('keydown', { key: 'Escape' });
    expect((wrapper.get('[data-testid="vertex-x-0"]').element as HTMLInputElement).value).toBe('0');
    wrapper.unmount();
  });

  it('follows the canvas: new points and a new selection show at once', async () => {
    const { wrapper } = mountTable();
    await wrapper.setProps({ points: [[0, 0], [0.5, 0.05], [1, 0], [0.5, -0.025]], selection: [1, 3] });
    expect((wrapper.get('[data-testid="vertex-y-1"]').element as HTMLInputElement).value).toBe('0.05');
    expect(wrapper.findAll('tr.is-selected').map((r) => r.attributes('data-row'))).toEqual(['1', '3']);
    wrapper.unmount();
  });

  it('selects a vertex by clicking its row; Shift adds or removes', async () => {
    const { wrapper } = mountTable({ selection: [1] });
    await wrapper.get('[data-testid="vertex-row-2"]').trigger('click');
    await wrapper.get('[data-testid="vertex-row-3"]').trigger('click', { shiftKey: true });
    await wrapper.get('[data-testid="vertex-row-1"]').trigger('click', { shiftKey: true });
    expect(wrapper.emitted('select')).toEqual([[[2]], [[1, 3]], [[]]]);
    wrapper.unmount();
  });

  it('read-only: cells cannot be edited and there are no delete buttons', async () => {
    const { wrapper, apply } = mountTable({ readOnly: true });
    expect(wrapper.get('[data-testid="vertex-x-0"]').attributes('readonly')).toBeDefined();
    expect(wrapper.find('.vertex-table__delete').exists()).toBe(false);
    await edit(wrapper, 'vertex-x-0', '0.2');
    expect(apply).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('the delete button sends a deleteVertex op; it is disabled at 3 vertices', async () => {
    const { wrapper, apply } = mountTable();
    await itemAt(wrapper.findAll('.vertex-table__delete'), 1).trigger('click');
    expect(apply).toHaveBeenCalledWith({ type: 'deleteVertex', index: 1 });
    await wrapper.setProps({ points: wedge.slice(0, 3) });
    expect(wrapper.findAll('.vertex-table__delete').every((b) => (b.element as HTMLButtonElement).disabled)).toBe(true);
    wrapper.unmount();
  });
});

describe('SketchVertexTable: each cell is a field edit session', () => {
  /** A feed like SketchView's: tests announce colleagues' edits through it. */
  function feed() {
    const listeners = new Set<(e: FieldChangeEvent) => void>();
    const subscribe: FieldChangeFeed = (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    };
    return { subscribe, announce: (e: FieldChangeEvent) => listeners.forEach((l) => l(e)) };
  }
  function mountLive(points: Point[] = wedge) {
    const f = feed();
    const apply = vi.fn((_op: SketchOpDraft): ApplyOpResult => ({ ok: true, doc: { ...defaultSketchDocument(), section: { points } } }));
    const wrapper = mount(SketchVertexTable, { props: { points, selection: [], readOnly: false, apply }, attachTo: document.body, global: { provide: { [FIELD_CHANGES as symbol]: f.subscribe } } });
    return { wrapper, apply, ...f };
  }
  const cell = (w: VueWrapper, id: string) => w.get(`[data-testid="${id}"]`);
  const value = (w: VueWrapper, id: string) => (cell(w, id).element as HTMLInputElement).value;
  const colleague = (op: EditOp): FieldChangeEvent => ({ op, by: 'Tomasz Reyes' });

  it('[F1][F2] a cell opened and left without typing sends nothing, though a colleague changed it meanwhile; it showed their value and name', async () => {
    const { wrapper, apply, announce } = mountLive();
    await cell(wrapper, 'vertex-y-3').trigger('focus');
    expect(value(wrapper, 'vertex-y-3')).toBe('-0.025');
    // Tomasz sets vertex 3's y while the cell is open.
    announce(colleague({ type: 'setVertexCoordinate', opId: 'o1', index: 3, axis: 'y', value: -0.031 }));
    await wrapper.setProps({ points: [wedge[0], wedge[1], wedge[2], [0.5, -0.031]] });
    expect(value(wrapper, 'vertex-y-3')).toBe('-0.031');
    expect(wrapper.get('[data-testid="field-changed-note"]').text()).toBe('Tomasz Reyes changed vertex 3 y to -0.031 just now.');
    await cell(wrapper, 'vertex-y-3').trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(wrapper.find('[data-testid="field-changed-note"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('[F3] a colleague’s change under the typing keeps the typing, sends nothing on Enter or blur, and waits for a choice', async () => {
    const { wrapper, apply, announce } = mountLive();
    const input = cell(wrapper, 'vertex-y-1');
    await input.trigger('focus');
    (input.element as HTMLInputElement).value = '0.03';
    await input.trigger('input');
    announce(colleague({ type: 'setVertexCoordinate', opId: 'o1', index: 1, axis: 'y', value: 0.028 }));
    await wrapper.setProps({ points: [wedge[0], [0.5, 0.028], wedge[2], wedge[3]] });
    expect(value(wrapper, 'vertex-y-1')).toBe('0.03');
    expect(wrapper.get('[data-testid="field-conflict"]').text()).toContain('Tomasz Reyes changed vertex 1 y to 0.028 while you were typing 0.03');
    await input.trigger('keydown', { key: 'Enter' });
    await input.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(value(wrapper, 'vertex-y-1')).toBe('0.03');
    // Keeping mine sends exactly my coordinate.
    await wrapper.get('[data-testid="conflict-keep-mine"]').trigger('click');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setVertexCoordinate', index: 1, axis: 'y', value: 0.03 });
    expect(wrapper.find('[data-testid="field-conflict"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it('[F3] taking the colleague’s value drops the typing and sends nothing', async () => {
    const { wrapper, apply, announce } = mountLive();
    const input = cell(wrapper, 'vertex-x-2');
    await input.trigger('focus');
    (input.element as HTMLInputElement).value = '1.2';
    await input.trigger('input');
    announce(colleague({ type: 'moveVertices', opId: 'o1', indices: [2], to: [[1.1, 0]] }));
    await wrapper.setProps({ points: [wedge[0], wedge[1], [1.1, 0], wedge[3]] });
    await wrapper.get('[data-testid="conflict-take-theirs"]').trigger('click');
    await input.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(value(wrapper, 'vertex-x-2')).toBe('1.1');
    wrapper.unmount();
  });

  it('[F3] a colleague setting exactly the typed value ends the edit without a conflict or an op', async () => {
    const { wrapper, apply, announce } = mountLive();
    const input = cell(wrapper, 'vertex-y-1');
    await input.trigger('focus');
    (input.element as HTMLInputElement).value = '0.03';
    await input.trigger('input');
    announce(colleague({ type: 'setVertexCoordinate', opId: 'o1', index: 1, axis: 'y', value: 0.03 }));
    await wrapper.setProps({ points: [wedge[0], [0.5, 0.03], wedge[2], wedge[3]] });
    expect(wrapper.find('[data-testid="field-conflict"]').exists()).toBe(false);
    await input.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('[F5] the typing follows its vertex when a colleague inserts a vertex above, and is sent for that vertex', async () => {
    const { wrapper, apply, announce } = mountLive();
    const input = cell(wrapper, 'vertex-y-3');
    await input.trigger('focus');
    (input.element as HTMLInputElement).value = '-0.03';
    await input.trigger('input');
    announce(colleague({ type: 'insertVertex', opId: 'o1', index: 1, at: [0.25, 0.02] }));
    await wrapper.setProps({ points: [wedge[0], [0.25, 0.02], wedge[1], wedge[2], wedge[3]] });
    await flushPromises();
    // The typing moved with vertex 3 (now row 4) and the focus followed it.
    expect(value(wrapper, 'vertex-y-4')).toBe('-0.03');
    expect(value(wrapper, 'vertex-y-3')).toBe('0');
    expect(document.activeElement).toBe(cell(wrapper, 'vertex-y-4').element);
    await cell(wrapper, 'vertex-y-4').trigger('blur');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setVertexCoordinate', index: 4, axis: 'y', value: -0.03 });
    wrapper.unmount();
  });

  it('[F5] a vertex deleted under the typing leaves a conflict that can only be discarded', async () => {
    const { wrapper, apply, announce } = mountLive();
    const input = cell(wrapper, 'vertex-x-1');
    await input.trigger('focus');
    (input.element as HTMLInputElement).value = '0.45';
    await input.trigger('input');
    announce(colleague({ type: 'deleteVertex', opId: 'o1', index: 1 }));
    await wrapper.setProps({ points: [wedge[0], wedge[2], wedge[3]] });
    await input.trigger('blur');
    expect(wrapper.get('[data-testid="field-conflict"]').text()).toContain('Tomasz Reyes deleted vertex 1 x while you were typing 0.45');
    expect(wrapper.find('[data-testid="conflict-keep-mine"]').exists()).toBe(false);
    await wrapper.get('[data-testid="conflict-take-theirs"]').trigger('click');
    expect(wrapper.find('[data-testid="field-conflict"]').exists()).toBe(false);
    expect(apply).not.toHaveBeenCalled();
    wrapper.unmount();
  });
});
