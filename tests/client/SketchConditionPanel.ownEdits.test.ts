import { describe, expect, it } from 'vitest';
import { defineComponent, h, shallowRef } from 'vue';
import { mount, flushPromises, type VueWrapper } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { FIELD_CHANGES, type FieldChangeEvent, type FieldChangeFeed } from '@/composables/useFieldEdits';
import { applyOp, withOpId, type SketchOpDraft } from '@shared/model/ops';
import type { SketchDocument } from '@shared/model/sketch';
import type { EditOp } from '@shared/protocol/messages';
import { oneCondition } from '../helpers/documents';

const { default: SketchConditionPanel } = await import('@/components/SketchConditionPanel.vue');

const DOC: SketchDocument = oneCondition({ condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: null } });

/**
 * The panel as the editor holds it: the document lives in the parent (the store, in the app) and
 * reaches the panel as a prop at the parent's next render. `apply` changes it and announces the
 * edit as the person's own at once (origin local, by null), as the store does; a colleague's
 * edit is announced with their name, then shown.
 */
function mountInEditor() {
  setActivePinia(createPinia());
  const doc = shallowRef<SketchDocument>(DOC);
  const listeners = new Set<(e: FieldChangeEvent) => void>();
  const feed: FieldChangeFeed = (l) => {
    listeners.add(l);
    return () => listeners.delete(l);
  };
  const announce = (e: FieldChangeEvent) => [...listeners].forEach((l) => l(e));
  const sent: SketchOpDraft[] = [];
  function apply(draft: SketchOpDraft) {
    sent.push(draft);
    const op = withOpId(draft);
    const r = applyOp(doc.value, op);
    if (!r.ok) return r;
    doc.value = r.doc;
    announce({ op, by: null });
    return r;
  }
  const Editor = defineComponent({ setup: () => () => h(SketchConditionPanel, { document: doc.value, readOnly: false, apply }) });
  const w = mount(Editor, { attachTo: document.body, global: { provide: { [FIELD_CHANGES as symbol]: feed } } });
  async function colleague(draft: SketchOpDraft, name: string) {
    const op = withOpId(draft) as EditOp;
    const r = applyOp(doc.value, withOpId(draft));
    if (!r.ok) throw new Error(r.reason);
    announce({ op, by: name });
    doc.value = r.doc;
    await flushPromises();
  }
  return { w, sent, colleague, doc };
}

const alphaOp = (value: number): SketchOpDraft => ({ type: 'setCondition', pointId: DOC.selectedPointId, field: 'alphaDeg', value });
const alphaInput = (w: VueWrapper) => w.get('input#condition-alphaDeg');
const note = (w: VueWrapper) => w.find('[data-testid="field-changed-note"]');
const conflict = (w: VueWrapper) => w.find('[data-testid="field-conflict"]');

describe('SketchConditionPanel: the person’s own edits are never credited to someone else [F2]', () => {
  it('Enter (the field stays open): no note for one’s own value; a colleague’s later change is named', async () => {
    const { w, sent, colleague, doc } = mountInEditor();
    const alpha = alphaInput(w);
    await alpha.trigger('focus');
    await alpha.setValue('3');
    await alpha.trigger('keydown', { key: 'Enter', keyCode: 13, which: 13 });
    expect(sent).toEqual([alphaOp(3)]);
    await flushPromises();
    expect(doc.value.designPoints[0]!.condition.alphaDeg).toBe(3);
    expect(Number((alpha.element as HTMLInputElement).value)).toBe(3);
    expect(note(w).exists()).toBe(false);
    expect(conflict(w).exists()).toBe(false);
    // Still open and untouched: a colleague's change shows at once, with their name.
    await colleague(alphaOp(5), 'Ines Marlow');
    expect(Number((alpha.element as HTMLInputElement).value)).toBe(5);
    expect(note(w).text()).toBe('Ines Marlow changed Incidence α to 5 just now.');
    // Typing again, then the colleague changes it under the typing: a conflict with their name.
    await alpha.setValue('6');
    expect(note(w).exists()).toBe(false);
    await colleague(alphaOp(8), 'Ines Marlow');
    expect(conflict(w).text()).toContain('Ines Marlow changed Incidence α to 8 while you were typing 6');
    w.unmount();
  });

  it('Enter twice in a row: the second own value is not credited to anyone either', async () => {
    const { w, sent } = mountInEditor();
    const alpha = alphaInput(w);
    await alpha.trigger('focus');
    await alpha.setValue('3');
    await alpha.trigger('keydown', { key: 'Enter', keyCode: 13, which: 13 });
    await flushPromises();
    await alpha.setValue('4');
    await alpha.trigger('keydown', { key: 'Enter', keyCode: 13, which: 13 });
    await flushPromises();
    expect(sent).toEqual([alphaOp(3), alphaOp(4)]);
    expect(Number((alpha.element as HTMLInputElement).value)).toBe(4);
    expect(note(w).exists()).toBe(false);
    w.unmount();
  });

  it('Keep mine: the kept value goes in without a note or a conflict', async () => {
    const { w, sent, colleague } = mountInEditor();
    const alpha = alphaInput(w);
    await alpha.trigger('focus');
    await alpha.setValue('7');
    await colleague(alphaOp(4), 'Ines Marlow');
    expect(conflict(w).text()).toContain('Ines Marlow changed Incidence α to 4 while you were typing 7');
    await w.get('[data-testid="conflict-keep-mine"]').trigger('click');
    expect(sent).toEqual([alphaOp(7)]);
    await flushPromises();
    expect(Number((alpha.element as HTMLInputElement).value)).toBe(7);
    expect(conflict(w).exists()).toBe(false);
    expect(note(w).exists()).toBe(false);
    w.unmount();
  });

  it('Tab or blur, then back into the field: no note for one’s own value', async () => {
    const { w, sent } = mountInEditor();
    const alpha = alphaInput(w);
    await alpha.trigger('focus');
    await alpha.setValue('3');
    await alpha.trigger('blur');
    await alpha.trigger('focus');
    await flushPromises();
    expect(sent).toEqual([alphaOp(3)]);
    expect(Number((alpha.element as HTMLInputElement).value)).toBe(3);
    expect(note(w).exists()).toBe(false);
    w.unmount();
  });
});
