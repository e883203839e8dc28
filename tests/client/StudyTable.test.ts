/**
 * The study table shows a dash, with a tooltip and a footnote, where x_cp/c is undefined (normal
 * force near zero; the rule in shared/model/study.ts, tested in tests/shared/model/studyXcp.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { runStudy } from '@shared/flight/study';
import { studyDefinitionSchema, unpackStudyRows, XCP_UNDEFINED_NOTE } from '@shared/model/study';
import { sketchCase } from '@shared/model/sketch';
import { oneCondition } from '../helpers/documents';
import StudyTable from '@/components/StudyTable.vue';

/** The demo's fin root section: a 5 %-thick double wedge, ridge at 40 %. */
const FIN_ROOT: [number, number][] = [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]];
const finRoot = (flap: boolean) =>
  oneCondition({ section: { points: FIN_ROOT }, condition: { mach: 2.6, alphaDeg: 4, gamma: 1.4, altitudeM: null }, flap: flap ? { hingeXOverC: 0.75, deflectionDeg: 0 } : null });

describe('StudyTable', () => {
  it('x_cp/c: a dash with the reason where the normal force is near zero (4.309 c at cl ≈ 0), the number elsewhere', () => {
    // The fin root with a flap at x/c 0.75, δ −10°, M 1.5: cl crosses zero between α 2° and 3°.
    const outcome = runStudy(sketchCase(finRoot(true)), studyDefinitionSchema.parse({ mach: { kind: 'list', values: [1.5] }, alpha: { startDeg: 1, endDeg: 4, stepDeg: 1 }, flapDeg: [-10], altitudeM: null, friction: 'none' }));
    if (outcome.status !== 'done') throw new Error('study did not finish');
    const rows = unpackStudyRows(outcome.results);
    const w = mount(StudyTable, { props: { results: outcome.results, rows, hasFlap: true, units: 'si' } });
    const dashes = w.findAll('[data-testid="study-xcp-undefined"]');
    expect(dashes).toHaveLength(1);
    expect(dashes[0]!.text()).toBe('—');
    expect(dashes[0]!.attributes('title')).toBe(XCP_UNDEFINED_NOTE);
    expect(w.get('[data-testid="study-xcp-note"]').text()).toContain('undefined when the normal force is near zero');
    const text = w.text();
    expect(text).not.toContain('4.309');
    expect(text).toContain('−0.6952'); // α 3°: a clear normal force (cn ≈ 0.05), shown
    w.unmount();
  });

  it('no footnote when every x_cp/c is defined', () => {
    const outcome = runStudy(sketchCase(finRoot(false)), studyDefinitionSchema.parse({ mach: { kind: 'list', values: [2] }, alpha: { startDeg: 4, endDeg: 6, stepDeg: 1 }, altitudeM: null, friction: 'none' }));
    if (outcome.status !== 'done') throw new Error('study did not finish');
    const w = mount(StudyTable, { props: { results: outcome.results, rows: unpackStudyRows(outcome.results), hasFlap: false, units: 'si' } });
    expect(w.find('[data-testid="study-xcp-note"]').exists()).toBe(false);
    expect(w.find('[data-testid="study-xcp-undefined"]').exists()).toBe(false);
    w.unmount();
  });
});
