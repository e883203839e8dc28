import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { mount, flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { analyseSketch } from '@shared/flight/analyseSketch';
import { RESULTS_CAUTION } from '@shared/model/caution';
import { sketchCase, type SketchDocument } from '@shared/model/sketch';
import { oneCondition } from '../helpers/documents';
import type { ApplyOpResult, SketchOpDraft } from '@shared/model/ops';
import { FIELD_CHANGES, type FieldChangeEvent, type FieldChangeFeed } from '@/composables/useFieldEdits';
import { itemAt } from '@shared/util/invariant';

const apiMock = vi.hoisted(() => ({ get: vi.fn(), patch: vi.fn(), post: vi.fn(), put: vi.fn(), delete: vi.fn() }));
vi.mock('@/api/client', async (importOriginal) => {
  const real = await importOriginal<typeof import('@/api/client')>();
  return { ...real, api: apiMock };
});

const { default: SketchLoadsPanel } = await import('@/components/SketchLoadsPanel.vue');
const { usePreferencesStore } = await import('@/stores/preferences');

/** Our own fin at 11 km geometric: q∞ = ½γp∞M² with p∞ = 22 700 Pa, T∞ = 216.77 K (1976 standard atmosphere, geometric-altitude table, from memory). */
const FIN_FIELDS = {
  section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] as [number, number][] },
  condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: 11_000 },
  flap: { hingeXOverC: 0.75, deflectionDeg: 4 },
  loads: { chordM: 0.5, spanM: 0.4, friction: 'turbulent' as const },
};
const FIN: SketchDocument = oneCondition(FIN_FIELDS);

function mountPanel(props: Partial<{ readOnly: boolean; document: SketchDocument; apply: (op: SketchOpDraft) => ApplyOpResult }> = {}) {
  const doc = props.document ?? FIN;
  return mount(SketchLoadsPanel, { props: { analysis: analyseSketch(sketchCase(doc)), settings: doc.loads, readOnly: props.readOnly ?? false, apply: props.apply }, attachTo: document.body });
}

const text = (w: ReturnType<typeof mountPanel>, id: string) => w.get(`[data-testid="${id}"]`).text();

describe('SketchLoadsPanel', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    apiMock.get.mockResolvedValue({ unitSystem: 'si' });
    apiMock.patch.mockImplementation(async (_url: string, body: { unitSystem: string }) => body);
  });
  afterEach(() => vi.clearAllMocks());

  it('shows q∞, the free stream and the loads with SI unit labels, and the caution', async () => {
    const w = mountPanel();
    await flushPromises();
    // q∞ = 0.7 × 22 700 Pa × 4 = 63 560 Pa (four significant figures).
    expect(text(w, 'fs-q')).toBe('63,560 Pa');
    expect(text(w, 'fs-t')).toBe('216.8 K');
    expect(text(w, 'force-lift-span')).toMatch(/^[\d,.]+ N\/m$/);
    expect(text(w, 'force-lift-total')).toMatch(/^[\d,.]+ N$/);
    expect(text(w, 'force-hinge-span')).toMatch(/^−?[\d,.]+ N·m\/m$/);
    expect(w.text()).toContain(RESULTS_CAUTION);
    w.unmount();
  });

  it('switches to US customary through the preference store (saved on the server) and relabels everything', async () => {
    const w = mountPanel();
    await flushPromises();
    await itemAt(w.get('[data-testid="units-switch"]').findAll('input'), 1).setValue(true);
    await flushPromises();
    expect(apiMock.patch).toHaveBeenCalledWith('/api/preferences', { unitSystem: 'us' }, expect.anything());
    expect(usePreferencesStore().unitSystem).toBe('us');
    // 63 560 Pa / 47.880 26 Pa per lbf/ft² = 1 327 lbf/ft² (exact factors, shared/flight/units.ts).
    expect(text(w, 'fs-q')).toBe('1,327 lbf/ft²');
    expect(text(w, 'fs-t')).toBe('390.2 °R');
    expect(text(w, 'force-lift-span')).toMatch(/ lbf\/ft$/);
    expect(text(w, 'force-hinge-total')).toMatch(/ lbf·ft$/);
    w.unmount();
  });

  it('[F1] a committed chord typed in feet is sent in SI as one setField op; the untouched span sends nothing', async () => {
    setActivePinia(createPinia());
    apiMock.get.mockResolvedValue({ unitSystem: 'us' });
    const apply = vi.fn((_op: SketchOpDraft): ApplyOpResult => ({ ok: true, doc: FIN }));
    const w = mountPanel({ apply });
    await flushPromises();
    const chord = w.get('[data-testid="loads-chord"]');
    expect((chord.element as HTMLInputElement).value).toBe('1.64042'); // 0.5 m in feet
    await chord.trigger('focus');
    await chord.setValue('2');
    await chord.trigger('blur');
    expect(apply.mock.calls).toEqual([[{ type: 'setField', field: 'loads.chordM', value: 0.6096 }]]);
    // The span was opened and left as shown: its stored value is not touched (no round trip through feet).
    const span = w.get('[data-testid="loads-span"]');
    await span.trigger('focus');
    await span.trigger('blur');
    // Once the parent has applied it, committing the same value again is not an edit.
    await w.setProps({ settings: { chordM: 0.6096, spanM: 0.4, friction: 'turbulent' } });
    expect(Number((chord.element as HTMLInputElement).value)).toBe(2);
    await chord.trigger('focus');
    await chord.trigger('blur');
    expect(apply).toHaveBeenCalledTimes(1);
    w.unmount();
  });

  it('[F4] a chord beyond the schema\'s range (0 < chord ≤ 1000 m, shared/model/sketch.ts) is refused with the limit in the person\'s unit, never clamped', async () => {
    const apply = vi.fn((_op: SketchOpDraft): ApplyOpResult => ({ ok: true, doc: FIN }));
    const w = mountPanel({ apply });
    await flushPromises();
    const chord = w.get('[data-testid="loads-chord"]');
    await chord.trigger('focus');
    await chord.setValue('1e30');
    await chord.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(text(w, 'loads-error-chord')).toBe('Chord must be at most 1000 m.');
    expect(Number((chord.element as HTMLInputElement).value)).toBe(1e30);
    await chord.setValue('-1');
    await chord.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(text(w, 'loads-error-chord')).toBe('Chord must be a positive length.');
    // In US units the limit is said in feet: 1000 m / 0.3048 m per ft = 3280.839… ft (exact factor), said as 3280.83 so it stays within 1000 m.
    usePreferencesStore().unitSystem = 'us';
    await flushPromises();
    const span = w.get('[data-testid="loads-span"]');
    await span.trigger('focus');
    await span.setValue('5000');
    await span.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(text(w, 'loads-error-span')).toBe('Span must be at most 3280.83 ft.');
    w.unmount();
  });

  it('[F3] a colleague’s span under the typing is a conflict, not overwritten; Keep mine sends exactly the span', async () => {
    const listeners = new Set<(e: FieldChangeEvent) => void>();
    const feed: FieldChangeFeed = (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    };
    const apply = vi.fn((_op: SketchOpDraft): ApplyOpResult => ({ ok: true, doc: FIN }));
    const w = mount(SketchLoadsPanel, { props: { analysis: analyseSketch(sketchCase(FIN)), settings: FIN.loads, apply }, attachTo: document.body, global: { provide: { [FIELD_CHANGES as symbol]: feed } } });
    await flushPromises();
    const span = w.get('[data-testid="loads-span"]');
    await span.trigger('focus');
    await span.setValue('0.5');
    listeners.forEach((l) => l({ op: { type: 'setField', opId: 'o', field: 'loads.spanM', value: 0.45 }, by: 'Priya Anand' }));
    await w.setProps({ settings: { ...FIN.loads, spanM: 0.45 } });
    await span.trigger('blur');
    expect(apply).not.toHaveBeenCalled();
    expect(w.get('[data-testid="field-conflict"]').text()).toContain('Priya Anand changed the span to 0.45 m while you were typing 0.5 m');
    await w.get('[data-testid="conflict-keep-mine"]').trigger('click');
    expect(apply).toHaveBeenCalledExactlyOnceWith({ type: 'setField', field: 'loads.spanM', value: 0.5 });
    w.unmount();
  });

  it('read-only: the form is disabled and emits nothing; no altitude: says why there are no loads', async () => {
    const w = mountPanel({ readOnly: true, document: oneCondition({ ...FIN_FIELDS, condition: { ...FIN_FIELDS.condition, altitudeM: null } }) });
    await flushPromises();
    const chord = w.get('[data-testid="loads-chord"]');
    expect((chord.element as HTMLInputElement).disabled).toBe(true);
    await chord.trigger('blur');
    expect(w.emitted()).not.toHaveProperty('update:loads');
    expect(text(w, 'loads-note')).toBe('Give an altitude to see loads, friction drag and the free-stream state.');
    w.unmount();
  });

  it('says which gas model the loads use and shows a∞ at the condition\'s γ (γ 1.3: a = √(1.3·287.05·216.77) = 284.4 m/s)', async () => {
    const w = mountPanel({ document: oneCondition({ ...FIN_FIELDS, condition: { ...FIN_FIELDS.condition, gamma: 1.3 } }) });
    await flushPromises();
    // R = 8314.32/28.9644 J/(kg·K); T at 11 km geometric = 288.15 − 0.0065·H with the
    // geopotential H = r0·Z/(r0 + Z) (1976 standard, eqs. 18 and 23): √(1.3·R·T), 4 figures.
    const h = (6_356_766 * 11_000) / (6_356_766 + 11_000);
    const a = Math.sqrt(1.3 * (8314.32 / 28.9644) * (288.15 - 0.0065 * h));
    expect(text(w, 'fs-a')).toBe(`${Number(a.toPrecision(4))} m/s`);
    expect(text(w, 'gas-model')).toMatch(/perfect gas with R = 287\.05 J\/\(kg·K\) and the condition’s γ.*Here γ = 1\.3,/);
    w.unmount();
  });

  it('mixed friction: offers the transition Reynolds number, sends it as one setField op, and shows the laws\' range flags (86 km: Re ≈ 230 on a 0.5 m chord)', async () => {
    const doc: SketchDocument = oneCondition({ ...FIN_FIELDS, condition: { ...FIN_FIELDS.condition, mach: 3, altitudeM: 86_000 }, loads: { ...FIN_FIELDS.loads, friction: 'mixed' } });
    const apply = vi.fn((_op: SketchOpDraft): ApplyOpResult => ({ ok: true, doc }));
    const w = mountPanel({ document: doc, apply });
    await flushPromises();
    expect(text(w, 'friction-flags')).toMatch(/Upper surface: Re \d\d\d is below 1,000/);
    expect(text(w, 'friction-model')).toMatch(/mixed laminar\/turbulent flow with transition at Re 500,000/);
    expect(text(w, 'cd-cdFriction')).not.toBe('0');
    const t = w.get('[data-testid="loads-transition"]');
    await t.trigger('focus');
    await t.setValue('1000000');
    await t.trigger('blur');
    expect(apply.mock.calls).toEqual([[{ type: 'setField', field: 'loads.transitionReynolds', value: 1e6 }]]);
    w.unmount();
  });
});
