import { describe, expect, it, vi } from 'vitest';
import { mount, flushPromises, type VueWrapper } from '@vue/test-utils';
import { FIELD_CHANGES, type FieldChangeEvent, type FieldChangeFeed } from '@/composables/useFieldEdits';
import { createPinia, setActivePinia } from 'pinia';
import type { SketchDocument } from '@shared/model/sketch';
import { oneCondition } from '../helpers/documents';
import type { SketchOpDraft } from '@shared/model/ops';

const { default: SketchConditionPanel } = await import('@/components/SketchConditionPanel.vue');
const { usePreferencesStore } = await import('@/stores/preferences');

const DOC: SketchDocument = oneCondition({ condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: 3048 } });

/** `doc` with the selected point's Mach set (what a colleague's edit does to the document). */
function withMach(doc: SketchDocument, mach: number, pointId = doc.selectedPointId): SketchDocument {
  return { ...doc, designPoints: doc.designPoints.map((p) => (p.id === pointId ? { ...p, condition: { ...p.condition, mach } } : p)) };
}

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
    expect(apply).toHaveBeenCalledWith({ type: 'setCondition', pointId: DOC.selectedPointId, field: 'altitudeM', value: 6096 });
    w.unmount();
  });

  it('[F4] an altitude outside 0…86 km (conditionSchema) is refused in the person\'s unit: feet for a US-customary user', async () => {
    setActivePinia(createPinia());
    usePreferencesStore().unitSystem = 'us';
    const apply = vi.fn((_op: SketchOpDraft) => ({ ok: true as const, doc: DOC }));
    const w = mount(SketchConditionPanel, { props: { document: DOC, readOnly: false, apply }, attachTo: document.body });
    await flushPromises();
    const input = w.get('input#condition-altitudeM');
    await input.trigger('focus');
    await input.setValue('-5000');
    await input.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(w.get('[data-testid="condition-error-altitudeM"]').text()).toBe('Altitude must be at least 0 ft.');
    // 86 km / 0.3048 m per ft = 282 152.2 ft (exact factor), said in whole feet within the limit.
    await input.setValue('300000');
    await input.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(w.get('[data-testid="condition-error-altitudeM"]').text()).toBe('Altitude must be at most 282152 ft.');
    w.unmount();
  });
});

describe('SketchConditionPanel: fields are edit sessions', () => {
  function setup(doc: SketchDocument = DOC) {
    setActivePinia(createPinia());
    const listeners = new Set<(e: FieldChangeEvent) => void>();
    const feed: FieldChangeFeed = (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    };
    const apply = vi.fn((_op: SketchOpDraft) => ({ ok: true as const, doc }));
    const w = mount(SketchConditionPanel, { props: { document: doc, readOnly: false, apply }, attachTo: document.body, global: { provide: { [FIELD_CHANGES as symbol]: feed } } });
    return { w, apply, announce: (e: FieldChangeEvent) => listeners.forEach((l) => l(e)) };
  }
  const inputOf = (w: VueWrapper, key: string) => w.get(`input#condition-${key}`);

  it('[F3] typing Mach without Enter survives a colleague moving a vertex, and only Mach is sent', async () => {
    const { w, apply, announce } = setup();
    const mach = inputOf(w, 'mach');
    await mach.trigger('focus');
    await mach.setValue('3.4');
    // Ines moves a vertex: the document changes under the typing.
    const moved: SketchDocument = { ...DOC, section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.025]] } };
    announce({ op: { type: 'setVertexCoordinate', opId: 'o', index: 1, axis: 'y', value: 0.03 }, by: 'Ines Marlow' });
    await w.setProps({ document: moved });
    await flushPromises();
    expect((mach.element as HTMLInputElement).value).toBe('3.4');
    expect(w.find('[data-testid="field-conflict"]').exists()).toBe(false);
    await mach.trigger('blur');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setCondition', pointId: DOC.selectedPointId, field: 'mach', value: 3.4 });
    w.unmount();
  });

  it('[F3] a colleague setting Mach under the typing opens a conflict with their name; nothing is sent until a choice', async () => {
    const { w, apply, announce } = setup();
    const mach = inputOf(w, 'mach');
    await mach.trigger('focus');
    await mach.setValue('3.4');
    announce({ op: { type: 'setCondition', opId: 'o', pointId: DOC.selectedPointId, field: 'mach', value: 2.6 }, by: 'Ines Marlow' });
    await w.setProps({ document: withMach(DOC, 2.6) });
    await flushPromises();
    expect((mach.element as HTMLInputElement).value).toBe('3.4');
    expect(w.get('[data-testid="field-conflict"]').text()).toContain('Ines Marlow changed Mach to 2.6 while you were typing 3.4');
    await mach.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    await w.get('[data-testid="conflict-keep-mine"]').trigger('click');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setCondition', pointId: DOC.selectedPointId, field: 'mach', value: 3.4 });
    w.unmount();
  });

  it('[F1][O5] the flap hinge sends only the hinge; a field opened and left sends nothing', async () => {
    const flapped: SketchDocument = { ...DOC, flap: { hingeXOverC: 0.75 } };
    const { w, apply } = setup(flapped);
    const deflection = inputOf(w, 'flapDeflectionDeg');
    await deflection.trigger('focus');
    await deflection.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    const hinge = inputOf(w, 'hinge');
    await hinge.trigger('focus');
    await hinge.setValue('0.7');
    await hinge.trigger('blur');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setField', field: 'flap.hingeXOverC', value: 0.7 });
    w.unmount();
  });

  it('[F4] a refused value stays with the store’s reason', async () => {
    const { w } = setup();
    const reason = 'Mach number must be above 1 (supersonic).';
    await w.setProps({ apply: vi.fn(() => ({ ok: false as const, reason })) });
    const mach = inputOf(w, 'mach');
    await mach.trigger('focus');
    await mach.setValue('0.8');
    await mach.trigger('blur');
    expect(w.get('[data-testid="condition-error-mach"]').text()).toBe(reason);
    expect((mach.element as HTMLInputElement).value).toBe('0.8');
    w.unmount();
  });
});

describe('SketchConditionPanel: design points', () => {
  const CRUISE = { id: 'point_cruise00000000000000', name: 'Cruise', condition: { mach: 2, alphaDeg: 1, gamma: 1.4, altitudeM: null }, flapDeflectionDeg: 0 };
  const PULLUP = { id: 'point_pullup00000000000000', name: 'Pull-up', condition: { mach: 1.8, alphaDeg: 8, gamma: 1.4, altitudeM: 6000 }, flapDeflectionDeg: 6 };
  const TWO: SketchDocument = { ...DOC, flap: { hingeXOverC: 0.75 }, designPoints: [CRUISE, PULLUP], selectedPointId: 'point_cruise00000000000000' };

  function setup(doc: SketchDocument = TWO) {
    setActivePinia(createPinia());
    const listeners = new Set<(e: FieldChangeEvent) => void>();
    const feed: FieldChangeFeed = (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    };
    const apply = vi.fn((_op: SketchOpDraft) => ({ ok: true as const, doc }));
    const w = mount(SketchConditionPanel, { props: { document: doc, readOnly: false, apply }, attachTo: document.body, global: { provide: { [FIELD_CHANGES as symbol]: feed } } });
    return { w, apply, announce: (e: FieldChangeEvent) => listeners.forEach((l) => l(e)) };
  }
  const valueOf = (w: VueWrapper, key: string) => (w.get(`input#condition-${key}`).element as HTMLInputElement).value;

  it('shows the selected point and its own flap deflection; an edit names that point', async () => {
    const { w, apply } = setup({ ...TWO, selectedPointId: 'point_pullup00000000000000' });
    expect(w.get('[data-testid="condition-point"]').text()).toBe('Pull-up');
    expect(valueOf(w, 'mach')).toBe('1.8');
    expect(valueOf(w, 'flapDeflectionDeg')).toBe('6');
    const deflection = w.get('input#condition-flapDeflectionDeg');
    await deflection.trigger('focus');
    await deflection.setValue('-4');
    await deflection.trigger('blur');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setCondition', pointId: 'point_pullup00000000000000', field: 'flapDeflectionDeg', value: -4 });
    w.unmount();
  });

  it('[F3] typing for one point while someone selects another: the panel stays on the typed-for point, says so, and sends there', async () => {
    const { w, apply, announce } = setup();
    const mach = w.get('input#condition-mach');
    await mach.trigger('focus');
    await mach.setValue('2.7');
    announce({ op: { type: 'selectDesignPoint', opId: 's', pointId: 'point_pullup00000000000000' }, by: 'Ines Marlow' });
    await w.setProps({ document: { ...TWO, selectedPointId: 'point_pullup00000000000000' } });
    await flushPromises();
    expect(w.get('[data-testid="condition-point"]').text()).toBe('Cruise');
    expect(w.get('[data-testid="condition-held"]').text()).toContain('Still showing Cruise while you edit it');
    expect(valueOf(w, 'mach')).toBe('2.7');
    expect(Number(valueOf(w, 'alphaDeg'))).toBe(1);
    await mach.trigger('blur');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setCondition', pointId: 'point_cruise00000000000000', field: 'mach', value: 2.7 });
    await flushPromises();
    // Decided: the panel follows the sketch's selection again.
    expect(w.get('[data-testid="condition-point"]').text()).toBe('Pull-up');
    expect(w.find('[data-testid="condition-held"]').exists()).toBe(false);
    expect(valueOf(w, 'mach')).toBe('1.8');
    w.unmount();
  });

  it('[F5] typing for a point someone removes is kept aside with their name until discarded; nothing is sent', async () => {
    const { w, apply, announce } = setup();
    const alpha = w.get('input#condition-alphaDeg');
    await alpha.trigger('focus');
    await alpha.setValue('3.5');
    announce({ op: { type: 'removeDesignPoint', opId: 'r', pointId: 'point_cruise00000000000000' }, by: 'Tomasz Reyes' });
    await w.setProps({ document: { ...TWO, designPoints: [PULLUP], selectedPointId: 'point_pullup00000000000000' } });
    await flushPromises();
    expect(w.get('[data-testid="condition-point"]').text()).toBe('Pull-up');
    expect(w.get('[data-testid="condition-orphan"]').text()).toContain('Tomasz Reyes removed the design point you were typing Incidence α = 3.5 for.');
    await alpha.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    await w.get('[data-testid="condition-orphan"] button').trigger('click');
    expect(w.find('[data-testid="condition-orphan"]').exists()).toBe(false);
    w.unmount();
  });
});
