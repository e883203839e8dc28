import { describe, expect, it, vi } from 'vitest';
import { mount } from '@vue/test-utils';
import SketchSectionCommands from '@/components/SketchSectionCommands.vue';
import { applyOp, withOpId, type ApplyOpResult, type SketchOpDraft } from '@shared/model/ops';
import { defaultSketchDocument, type Point } from '@shared/model/sketch';
import { sectionShape } from '@shared/model/sectionShape';
import { expectClose } from '../helpers/expectClose';

// The fictional Tern fin root: a double wedge 5 % thick with its ridge at 40 %.
const wedge: Point[] = [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]];

function mountCommands(points: Point[] = wedge, apply?: (op: SketchOpDraft) => ApplyOpResult) {
  const doc = { ...defaultSketchDocument(), section: { points } };
  const applied: Point[][] = [];
  const spy = vi.fn(
    apply ??
      ((op: SketchOpDraft) => {
        const r = applyOp(doc, withOpId(op));
        if (r.ok) applied.push(r.doc.section.points);
        return r;
      }),
  );
  const wrapper = mount(SketchSectionCommands, { props: { points, readOnly: false, apply: spy }, attachTo: document.body });
  return { wrapper, apply: spy, applied };
}

async function fill(wrapper: ReturnType<typeof mountCommands>['wrapper'], testId: string, value: string) {
  await wrapper.get(`[data-testid="${testId}"]`).setValue(value);
}

async function open(wrapper: ReturnType<typeof mountCommands>['wrapper']) {
  const details = wrapper.get('[data-testid="section-commands"]');
  (details.element as HTMLDetailsElement).open = true;
  await details.trigger('toggle');
}

describe('SketchSectionCommands', () => {
  it('shows the section\'s t/c, ridge and camber, and opens with them as the starting values', async () => {
    const { wrapper } = mountCommands();
    expect(wrapper.get('[data-testid="section-shape"]').text()).toBe('t/c 5 % · ridge 40 % · camber 0 %');
    await open(wrapper);
    expect((wrapper.get('[data-testid="cmd-tc-input"]').element as HTMLInputElement).value).toBe('5');
    expect((wrapper.get('[data-testid="cmd-ridge-input"]').element as HTMLInputElement).value).toBe('40');
    wrapper.unmount();
  });

  it('set t/c 4 %: one moveVertices op (vertex indices kept), and the result is 4 % thick (by hand: y = ±0.02 at the ridge)', async () => {
    const { wrapper, apply, applied } = mountCommands();
    await open(wrapper);
    await fill(wrapper, 'cmd-tc-input', '4');
    await wrapper.get('[data-testid="cmd-tc"]').trigger('submit');
    expect(apply).toHaveBeenCalledTimes(1);
    expect(apply.mock.calls[0]![0]).toEqual({ type: 'moveVertices', indices: [1, 3], to: [[0.4, 0.02], [0.4, -0.02]] });
    expectClose(sectionShape(applied[0]!).thicknessRatio, 0.04, 1e-12);
    expect(wrapper.get('[data-testid="cmd-message-tc"]').text()).toBe('Thickness ratio set. Undo takes it back.');
    wrapper.unmount();
  });

  it('every command reaches `apply` as an op: scale, ridge, mirror, camber, rotate about a point, normalise', async () => {
    const { wrapper, apply } = mountCommands();
    await open(wrapper);
    await fill(wrapper, 'cmd-factor-input', '1.2');
    await wrapper.get('[data-testid="cmd-factor"]').trigger('submit');
    await fill(wrapper, 'cmd-ridge-input', '50');
    await wrapper.get('[data-testid="cmd-ridge"]').trigger('submit');
    await fill(wrapper, 'cmd-camber-input', '2');
    await fill(wrapper, 'cmd-camber-at', '40');
    await wrapper.get('[data-testid="cmd-camber"]').trigger('submit');
    await fill(wrapper, 'cmd-rotate-input', '3');
    await fill(wrapper, 'cmd-rotate-x', '0.25');
    await fill(wrapper, 'cmd-rotate-y', '0');
    await wrapper.get('[data-testid="cmd-rotate"]').trigger('submit');
    const types = apply.mock.calls.map((c) => c[0].type);
    expect(types).toEqual(['moveVertices', 'moveVertices', 'moveVertices', 'moveVertices']);
    // The ridge moved to x = 0.5 on both surfaces (props are not updated here: each command starts from the wedge).
    expect(apply.mock.calls[1]![0]).toEqual({ type: 'moveVertices', indices: [1, 3], to: [[0.5, 0.025], [0.5, -0.025]] });
    await wrapper.get('[data-testid="cmd-mirror-upper"]').trigger('click');
    // Already symmetric: nothing to send.
    expect(apply).toHaveBeenCalledTimes(4);
    expect(wrapper.get('[data-testid="cmd-message-mirror"]').text()).toBe('Nothing to change: the section is already so.');
    wrapper.unmount();
  });

  it('a field that is not a number is refused by name and nothing is sent; a command\'s own refusal is shown', async () => {
    const { wrapper, apply } = mountCommands();
    await open(wrapper);
    await fill(wrapper, 'cmd-tc-input', 'five');
    await wrapper.get('[data-testid="cmd-tc"]').trigger('submit');
    expect(wrapper.get('[data-testid="cmd-message-tc"]').text()).toBe('Thickness ratio must be a number (got “five”).');
    await fill(wrapper, 'cmd-ridge-input', '');
    await wrapper.get('[data-testid="cmd-ridge"]').trigger('submit');
    expect(wrapper.get('[data-testid="cmd-message-ridge"]').text()).toBe('Ridge position: enter a number.');
    await fill(wrapper, 'cmd-ridge-input', '120');
    await wrapper.get('[data-testid="cmd-ridge"]').trigger('submit');
    expect(wrapper.get('[data-testid="cmd-message-ridge"]').text()).toBe('The ridge position must be between the nose and the tail (above 0 and below 1 x/c).');
    expect(apply).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('an op the document refuses shows the reason from `apply`', async () => {
    const reason = 'That section is not allowed: facet 0 would cross facet 2. The section must stay a simple polygon.';
    const { wrapper } = mountCommands(wedge, () => ({ ok: false, reason }));
    await open(wrapper);
    await fill(wrapper, 'cmd-tc-input', '8');
    await wrapper.get('[data-testid="cmd-tc"]').trigger('submit');
    expect(wrapper.get('[data-testid="cmd-message-tc"]').text()).toBe(reason);
    wrapper.unmount();
  });
});
