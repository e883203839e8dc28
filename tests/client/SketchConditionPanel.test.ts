import { describe, expect, it, vi } from 'vitest';
import { mount, flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { defaultSketchDocument, type SketchDocument } from '@shared/model/sketch';
import type { SketchOpDraft } from '@shared/model/ops';

const { default: SketchConditionPanel } = await import('@/components/SketchConditionPanel.vue');
const { usePreferencesStore } = await import('@/stores/preferences');

const DOC: SketchDocument = { ...defaultSketchDocument(), condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: 3048 } };

describe('SketchConditionPanel altitude units', () => {
  it('shows the altitude in feet for a US-customary user and stores what is typed in metres (1 ft = 0.3048 m exactly)', async () => {
    setActivePinia(createPinia());
    usePreferencesStore().unitSystem = 'us';
    const apply = vi.fn((_op: SketchOpDraft) => ({ ok: true as const, doc: DOC }));
    const w = mount(SketchConditionPanel, { props: { document: DOC, readOnly: false, apply }, attachTo: document.body });
    await flushPromises();
    expect(w.get('[data-testid="condition-label-altitudeM"]').text()).toBe('Altitude\u00a0ft');
    const input = w.get('input#condition-altitudeM');
    expect((input.element as HTMLInputElement).value).toBe('10000');
    await input.setValue('20000');
    await input.trigger('blur');
    expect(apply).toHaveBeenCalledWith({ type: 'setCondition', field: 'altitudeM', value: 6096 });
    w.unmount();
  });
});
