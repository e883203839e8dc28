/**
 * The study table shows a dash, with a tooltip and a footnote, where x_cp/c is undefined (normal
 * force near zero; the rule in shared/model/study.ts, tested in tests/shared/model/studyXcp.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { runStudy } from '@shared/flight/study';
import { studyDefinitionSchema, unpackStudyRows, XCP_UNDEFINED_NOTE } from '@shared/model/study';
import { sketchCase } from '@shared/model/sketch';
import { DEMO_SKETCHES } from '../../server/db/seed';
import StudyTable from '@/components/StudyTable.vue';

describe('StudyTable', () => {
  it('x_cp/c: a dash with the reason where the normal force is near zero (4.309 c at cl ≈ 0), the number elsewhere', () => {
    // The fin root with a flap at x/c 0.75, δ −10°, M 1.5: cl crosses zero between α 2° and 3°.
    const root = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern fin root'))!;
    const doc = { ...structuredClone(root.document), flap: { hingeXOverC: 0.75 } };
    const outcome = runStudy(sketchCase(doc), studyDefinitionSchema.parse({ mach: { kind: 'list', values: [1.5] }, alpha: { startDeg: 1, endDeg: 4, stepDeg: 1 }, flapDeg: [-10], altitudeM: null, friction: 'none' }));
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
    const root = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern fin root'))!;
    const outcome = runStudy(sketchCase(root.document), studyDefinitionSchema.parse({ mach: { kind: 'list', values: [2] }, alpha: { startDeg: 4, endDeg: 6, stepDeg: 1 }, altitudeM: null, friction: 'none' }));
    if (outcome.status !== 'done') throw new Error('study did not finish');
    const w = mount(StudyTable, { props: { results: outcome.results, rows: unpackStudyRows(outcome.results), hasFlap: false, units: 'si' } });
    expect(w.find('[data-testid="study-xcp-note"]').exists()).toBe(false);
    expect(w.find('[data-testid="study-xcp-undefined"]').exists()).toBe(false);
    w.unmount();
  });
});
