import { describe, expect, it, vi } from 'vitest';
import { mount, flushPromises, type VueWrapper } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { FIELD_CHANGES, type FieldChangeEvent, type FieldChangeFeed } from '@/composables/useFieldEdits';
import { analyseDesignPoints } from '@shared/flight/designPoints';
import { applyOp, withOpId, type ApplyOpResult, type SketchOpDraft } from '@shared/model/ops';
import { defaultSketchDocument, type DesignPoint, type SketchDocument } from '@shared/model/sketch';
import SketchDesignPoints from '@/components/SketchDesignPoints.vue';
import SketchDesignPointsTable from '@/components/SketchDesignPointsTable.vue';
import { itemAt } from '@shared/util/invariant';

const point = (id: string, name: string, mach: number, alphaDeg: number, altitudeM: number | null, flapDeflectionDeg = 0): DesignPoint => ({
  id,
  name,
  condition: { mach, alphaDeg, gamma: 1.4, altitudeM },
  flapDeflectionDeg,
});

/** Our own 5 % fin with a flap and three points (invented): cruise, pull-up, max q. */
function fin(): SketchDocument {
  return {
    ...defaultSketchDocument(),
    flap: { hingeXOverC: 0.75 },
    loads: { chordM: 0.32, spanM: 0.18, friction: 'turbulent' },
    designPoints: [point('point_cruise00000000000000', 'Cruise', 2.6, 2, 12_000), point('point_pullup00000000000000', 'Pull-up', 2.2, 9, 9_000, 6), point('point_maxq0000000000000000', 'Max q', 2.9, 1, 5_000)],
    selectedPointId: 'point_cruise00000000000000',
  };
}

function setup(options: { readOnly?: boolean; doc?: SketchDocument } = {}) {
  setActivePinia(createPinia());
  let doc = options.doc ?? fin();
  const listeners = new Set<(e: FieldChangeEvent) => void>();
  const feed: FieldChangeFeed = (l) => {
    listeners.add(l);
    return () => listeners.delete(l);
  };
  const apply = vi.fn((draft: SketchOpDraft): ApplyOpResult => {
    const r = applyOp(doc, withOpId(draft));
    if (r.ok) doc = r.doc;
    return r;
  });
  const w = mount(SketchDesignPoints, {
    props: { document: doc, shownPointId: doc.selectedPointId, readOnly: options.readOnly ?? false, apply, analysis: analyseDesignPoints(doc), units: 'si' },
    attachTo: document.body,
    global: { provide: { [FIELD_CHANGES as symbol]: feed } },
  });
  /** Hands the component the document the edits produced (what the store does). */
  const sync = async () => {
    await w.setProps({ document: doc, shownPointId: doc.selectedPointId, analysis: analyseDesignPoints(doc) });
    await flushPromises();
  };
  return { w, apply, sync, doc: () => doc, announce: (e: FieldChangeEvent) => listeners.forEach((l) => l(e)) };
}
const names = (w: VueWrapper) => w.findAll('[data-testid="design-point-name"]').map((n) => n.text());

describe('SketchDesignPoints', () => {
  it('lists each point with its condition and its solver status; the shown one is marked', () => {
    const { w } = setup();
    expect(names(w)).toEqual(['Cruise', 'Pull-up', 'Max q']);
    expect(w.get('[data-testid="design-point-1"]').text()).toContain('M 2.2 · α 9° · 9,000 m · δ 6°');
    expect(w.get('[data-testid="design-point-status-0"]').text()).toBe('ok');
    expect(w.get('[data-testid="design-point-0"]').attributes('aria-selected')).toBe('true');
    w.unmount();
  });

  it('an editor’s click selects the point for everyone (one undoable edit)', async () => {
    const { w, apply, sync } = setup();
    await w.get('[data-testid="design-point-2"]').trigger('click');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'selectDesignPoint', pointId: 'point_maxq0000000000000000' });
    await sync();
    expect(w.get('[data-testid="design-point-2"]').attributes('aria-selected')).toBe('true');
    w.unmount();
  });

  it('a reader’s click picks the point for their own view and edits nothing', async () => {
    const { w, apply } = setup({ readOnly: true });
    expect(w.find('[data-testid="design-point-add"]').exists()).toBe(false);
    await w.get('[data-testid="design-point-1"]').trigger('click');
    expect(apply).not.toHaveBeenCalled();
    expect(w.emitted('view')).toEqual([['point_pullup00000000000000']]);
    w.unmount();
  });

  it('Add copies the shown point right after it under a free name, selects it and opens its name', async () => {
    const { w, apply, sync, doc } = setup();
    await w.get('[data-testid="design-point-add"]').trigger('click');
    const op = itemAt(apply.mock.calls, 0)[0] as Extract<SketchOpDraft, { type: 'addDesignPoint' }>;
    expect(itemAt(apply.mock.results, 0).value).toMatchObject({ ok: true });
    expect(op).toMatchObject({ type: 'addDesignPoint', index: 1, select: true, point: { name: 'Design point 4', condition: itemAt(fin().designPoints, 0).condition, flapDeflectionDeg: 0 } });
    expect(op.point.id).toMatch(/^point_[a-z0-9]{20}$/);
    await sync();
    // The new point's name is open for typing (the others show theirs); Enter renames it.
    expect(names(w)).toEqual(['Cruise', 'Pull-up', 'Max q']);
    expect(w.findAll('[data-point-id]').map((r) => r.attributes('data-point-id'))).toEqual(['point_cruise00000000000000', op.point.id, 'point_pullup00000000000000', 'point_maxq0000000000000000']);
    const input = w.get('[data-testid="design-point-name-input"]');
    expect((input.element as HTMLInputElement).value).toBe('Design point 4');
    await input.setValue('Dash');
    await input.trigger('keydown', { key: 'Enter' });
    expect(apply).toHaveBeenLastCalledWith({ type: 'renameDesignPoint', pointId: op.point.id, name: 'Dash' });
    await sync();
    expect(names(w)).toEqual(['Cruise', 'Dash', 'Pull-up', 'Max q']);
    expect(doc().selectedPointId).toBe(op.point.id);
    w.unmount();
  });

  it('a name another point has is refused with the reason and stays in the field [F4]', async () => {
    const { w, apply } = setup();
    await w.get('[data-testid="design-point-rename"]').trigger('click');
    const input = w.get('[data-testid="design-point-name-input"]');
    await input.setValue('max Q');
    await input.trigger('keydown', { key: 'Enter' });
    expect(apply).toHaveBeenCalledTimes(1);
    expect(w.text()).toContain('There is already a design point named “Max q”.');
    expect((w.get('[data-testid="design-point-name-input"]').element as HTMLInputElement).value).toBe('max Q');
    w.unmount();
  });

  it('an empty name is refused plainly, as the sketch title is, and the old name stays shown [F4]', async () => {
    const { w, apply } = setup();
    await w.get('[data-testid="design-point-rename"]').trigger('click');
    const input = w.get('[data-testid="design-point-name-input"]');
    await input.setValue('   ');
    await input.trigger('keydown', { key: 'Enter' });
    expect(apply).not.toHaveBeenCalled();
    expect(w.get('[data-testid="design-point-name-error"]').text()).toBe('The name must not be empty.');
    expect(w.text()).not.toContain('malformed');
    // The typing stays (it is the person's to correct), with the name it would replace in view.
    const still = w.get('[data-testid="design-point-name-input"]').element as HTMLInputElement;
    expect(still.value).toBe('   ');
    expect(still.placeholder).toBe('Cruise');
    await w.get('[data-testid="design-point-name-input"]').trigger('keydown', { key: 'Escape' });
    expect(names(w)).toEqual(['Cruise', 'Pull-up', 'Max q']);
    w.unmount();
  });

  it('[F3] a colleague renaming the point under the typing opens a conflict; nothing is sent until a choice', async () => {
    const { w, apply, announce } = setup();
    await w.get('[data-testid="design-point-rename"]').trigger('click');
    const input = w.get('[data-testid="design-point-name-input"]');
    await input.setValue('Cruise M2.6');
    announce({ op: { type: 'renameDesignPoint', opId: 'x', pointId: 'point_cruise00000000000000', name: 'Burnout' }, by: 'Ines Marlow' });
    const renamed = fin();
    renamed.designPoints[0] = { ...itemAt(renamed.designPoints, 0), name: 'Burnout' };
    await w.setProps({ document: renamed });
    await flushPromises();
    await input.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(w.get('[data-testid="field-conflict"]').text()).toContain('Ines Marlow changed the name to Burnout while you were typing Cruise M2.6');
    w.unmount();
  });

  it('moves the shown point up and down; the first cannot go up', async () => {
    const { w, apply, sync } = setup();
    expect(w.get('[data-testid="design-point-up"]').attributes('disabled')).toBeDefined();
    await w.get('[data-testid="design-point-down"]').trigger('click');
    expect(apply).toHaveBeenLastCalledWith({ type: 'moveDesignPoint', pointId: 'point_cruise00000000000000', index: 1 });
    await sync();
    expect(names(w)).toEqual(['Pull-up', 'Cruise', 'Max q']);
    w.unmount();
  });
});

describe('SketchDesignPointsTable', () => {
  it('puts every point side by side: condition, status, coefficients and loads in the person’s units', async () => {
    const doc = fin();
    const all = analyseDesignPoints(doc);
    const w = mount(SketchDesignPointsTable, { props: { document: doc, analysis: all, shownPointId: 'point_cruise00000000000000', units: 'us' } });
    expect(w.findAll('thead th').map((t) => t.text())).toEqual(['', 'Cruise', 'Pull-up', 'Max q']);
    expect(w.get('[data-testid="dp-flap-1"]').text()).toBe('6');
    expect(w.get('[data-testid="dp-altitude-0"]').text()).toBe('39,370'); // 12 000 m / 0.3048 m/ft
    const cl = itemAt(all.points, 1).analysis.result!.coefficients!.cl;
    expect(w.get('[data-testid="dp-cl-1"]').text()).toBe(cl.toPrecision(4).replace(/0+$/, ''));
    // Lift per span in lbf/ft: N/m ÷ (4.4482216152605 N/lbf ÷ 0.3048 m/ft), exact factors.
    const liftNPerM = itemAt(all.points, 1).analysis.loads!.perSpan.liftNPerM;
    expect(Number(w.get('[data-testid="dp-lift-1"]').text().replace(/,/g, ''))).toBeCloseTo(liftNPerM / (4.4482216152605 / 0.3048), -1);
    expect(w.text()).toContain('Lift / span, lbf/ft');
    await w.get('[data-testid="dp-col-2"]').trigger('click');
    expect(w.emitted('pick')).toEqual([['point_maxq0000000000000000']]);
    w.unmount();
  });

  it('lists each point’s first limit under the table', () => {
    const doc = fin();
    doc.designPoints[1] = { ...itemAt(doc.designPoints, 1), condition: { ...itemAt(doc.designPoints, 1).condition, mach: 1.2, alphaDeg: 20 } };
    const w = mount(SketchDesignPointsTable, { props: { document: doc, analysis: analyseDesignPoints(doc), shownPointId: 'point_cruise00000000000000', units: 'si' } });
    expect(w.get('[data-testid="dp-status-1"]').text()).toBe('detached');
    expect(w.get('[data-testid="design-points-notes"]').text()).toMatch(/^Pull-up: /);
    w.unmount();
  });
});
