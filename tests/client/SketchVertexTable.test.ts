import { describe, expect, it, vi } from 'vitest';
import { mount } from '@vue/test-utils';
import SketchVertexTable from '@/components/SketchVertexTable.vue';
import type { Point } from '@shared/model/sketch';
import type { ApplyOpResult, SketchOpDraft } from '@shared/model/ops';
import { applyOp, withOpId } from '@shared/model/ops';
import { defaultSketchDocument } from '@shared/model/sketch';

const wedge: Point[] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];

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
    expect(rows[0].text()).toContain('nose');
    expect(rows[2].text()).toContain('tail');
    wrapper.unmount();
  });

  it('an edited cell becomes one moveVertices op for that vertex', async () => {
    const { wrapper, apply } = mountTable();
    await edit(wrapper, 'vertex-y-1', '0.04');
    expect(apply).toHaveBeenCalledTimes(1);
    expect(apply).toHaveBeenCalledWith({ type: 'moveVertices', indices: [1], to: [[0.5, 0.04]] });
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
    expect(apply).toHaveBeenCalledWith({ type: 'moveVertices', indices: [0], to: [[0.9, 0]] });
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
    await wrapper.findAll('.vertex-table__delete')[1].trigger('click');
    expect(apply).toHaveBeenCalledWith({ type: 'deleteVertex', index: 1 });
    await wrapper.setProps({ points: wedge.slice(0, 3) });
    expect(wrapper.findAll('.vertex-table__delete').every((b) => (b.element as HTMLButtonElement).disabled)).toBe(true);
    wrapper.unmount();
  });
});
