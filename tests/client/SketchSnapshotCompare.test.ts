import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { analyseSketch } from '@shared/flight/analyseSketch';
import { analyseDesignPoints } from '@shared/flight/designPoints';
import { RESULTS_CAUTION } from '@shared/model/caution';
import type { SnapshotDetail } from '@shared/model/review';
import { sketchCase, type SketchDocument } from '@shared/model/sketch';
import { oneCondition } from '../helpers/documents';
import SketchSnapshotCompare from '@/components/SketchSnapshotCompare.vue';
import { compareCoefficients, difference, formatDifference, sideOfSketch, sideOfSnapshot } from '@/components/snapshotCompare';
import { outlineOnto } from '@/canvas/renderReview';
import { formatNumber } from '@shared/format/number';
import { expectClose } from '../helpers/expectClose';
import { itemAt } from '@shared/util/invariant';
import { XCP_UNDEFINED_NOTE } from '@shared/flight/xcp';

/** Our own 5 % double wedge, ridge at mid-chord. */
function doc(alphaDeg: number, mach = 2, halfThickness = 0.025): SketchDocument {
  return oneCondition({ section: { points: [[0, 0], [0.5, halfThickness], [1, 0], [0.5, -halfThickness]] }, condition: { mach, alphaDeg, gamma: 1.4, altitudeM: null } });
}

function snapshot(id: string, name: string, revision: number, document: SketchDocument, stored = true): SnapshotDetail {
  return {
    id,
    sketchId: 'sketch_aaaaaaaaaaaaaaaaaaaa',
    name,
    note: '',
    kind: 'manual',
    revision,
    createdByName: 'Ines Marlow',
    createdAt: '2030-03-04T09:15:00.000Z',
    title: 'Tern fin root',
    document,
    result: stored ? analyseDesignPoints(document) : null,
  };
}

const cell = (w: ReturnType<typeof mount>, id: string) => w.get(`[data-testid="${id}"]`).text();

describe('SketchSnapshotCompare', () => {
  it('tabulates A, B and B − A of cl, cd, cm, x_cp/c and L/D for all three theories, with the caution', () => {
    const a = snapshot('snap_a', 'Cruise', 4, doc(2));
    const b = snapshot('snap_b', 'Pull-up', 9, doc(4));
    const w = mount(SketchSnapshotCompare, { props: { a: sideOfSnapshot(a), b: sideOfSnapshot(b) } });
    const ra = analyseSketch(sketchCase(a.document)).result!;
    const rb = analyseSketch(sketchCase(b.document)).result!;

    // Linear (Ackeret) cl ≈ 4α/√(M²−1) = 0.0806 at α 2°, M 2 and twice that at 4° (common
    // practice); the solver projects the forces exactly, so thickness moves it by ~0.3 %.
    expectClose(Number(cell(w, 'compare-linear-cl-a')), 0.0806, 0.0806 * 0.005);
    expectClose(Number(cell(w, 'compare-linear-cl-b')), 0.1612, 0.1612 * 0.005);
    expect(cell(w, 'compare-linear-cl-a')).toBe(formatNumber(ra.theories!.linear.cl, 4));
    expect(cell(w, 'compare-exact-cl-a')).toBe(formatNumber(ra.coefficients!.cl, 4));
    expect(cell(w, 'compare-exact-cl-diff')).toBe(`+${formatNumber(rb.coefficients!.cl - ra.coefficients!.cl, 3)}`);
    expect(cell(w, 'compare-secondOrder-cd-diff')).toBe(formatDifference(rb.theories!.secondOrder.cd - ra.theories!.secondOrder.cd));
    for (const t of ['exact', 'linear', 'secondOrder']) {
      for (const q of ['cl', 'cd', 'cm', 'xcpOverC', 'liftToDrag']) {
        expect(cell(w, `compare-${t}-${q}-a`)).not.toBe('');
        expect(cell(w, `compare-${t}-${q}-diff`)).not.toBe('');
      }
    }
    expect(cell(w, 'compare-a')).toContain('Cruise');
    expect(cell(w, 'compare-a')).toContain('revision 4');
    expect(cell(w, 'compare-b')).toContain('Pull-up');
    expect(w.get('[data-testid="compare-condition"]').text()).toMatch(/α, °\s*2\s*4/);
    expect(w.get('[data-testid="results-caution"]').text()).toBe(RESULTS_CAUTION);
    w.unmount();
  });

  it('a detached snapshot has no exact coefficients: its cells and the differences read —, and the table says why', () => {
    // A 12 % wedge at M 1.4, α 5°: the nose shock detaches (as the demo booster fin).
    const a = snapshot('snap_a', 'Thin', 1, doc(5, 1.4, 0.01));
    const b = snapshot('snap_b', 'Thick', 2, doc(5, 1.4, 0.06));
    expect(analyseSketch(sketchCase(b.document)).status).toBe('detached');
    const w = mount(SketchSnapshotCompare, { props: { a: sideOfSnapshot(a), b: sideOfSnapshot(b) } });
    expect(cell(w, 'compare-exact-cl-b')).toBe('—');
    expect(cell(w, 'compare-exact-cl-diff')).toBe('—');
    // The thin-section theories ignore the limit and still give numbers.
    expect(cell(w, 'compare-linear-cl-b')).not.toBe('—');
    expect(cell(w, 'compare-linear-cl-diff')).toMatch(/^[+−]?\d/);
    expect(w.find('[data-testid="compare-exact-note"]').exists()).toBe(true);
    w.unmount();
  });

  it('a snapshot without a stored result shows — everywhere on its side', () => {
    const w = mount(SketchSnapshotCompare, { props: { a: sideOfSnapshot(snapshot('snap_a', 'Old', 1, doc(2), false)), b: sideOfSnapshot(snapshot('snap_b', 'New', 2, doc(3))) } });
    expect(cell(w, 'compare-linear-cm-a')).toBe('—');
    expect(w.get('[data-testid="compare-condition"]').text()).toContain('not stored');
    w.unmount();
  });
});

describe('comparing with another sketch of the team', () => {
  it('takes each sketch as stored (its selected design point) and says B’s outline is fitted onto A’s nose and chord', () => {
    const mine = doc(2);
    // Another sketch drawn at a 0.3 chord and moved aft: its shape, not its place, is compared.
    const theirs = oneCondition({ section: { points: [[2, 1], [2.15, 1.0075], [2.3, 1], [2.15, 0.9925]] }, condition: { mach: 2, alphaDeg: 2 } });
    const sketch = (id: string, title: string, document: SketchDocument) => ({
      id,
      teamId: 'team_aaaaaaaaaaaaaaaaaaaa',
      title,
      revision: 7,
      document,
      lastSolveStatus: 'ok',
      lastResult: analyseDesignPoints(document),
      createdAt: '2030-03-01T10:00:00.000Z',
      updatedAt: '2030-03-04T09:15:00.000Z',
      updatedByName: 'Tomasz Reyes',
      reviewStatus: 'draft' as const,
    });
    const a = sideOfSketch(sketch('sketch_aaaaaaaaaaaaaaaaaaaa', 'Tern fin root', mine) as never);
    const b = sideOfSketch(sketch('sketch_bbbbbbbbbbbbbbbbbbbb', 'Tern fin tip', theirs) as never);
    const w = mount(SketchSnapshotCompare, { props: { a, b, fitted: true } });
    expect(cell(w, 'compare-b')).toContain('Tern fin tip');
    expect(cell(w, 'compare-b')).toContain('sketch as stored · revision 7');
    expect(w.get('[data-testid="compare-fitted"]').text()).toContain('B’s outline is drawn on A’s nose and chord');
    // The same 5 % double wedge, scaled: the coefficients are the same, B − A is 0.
    expect(cell(w, 'compare-exact-cl-diff')).toBe('0');
    w.unmount();
    // The outline put on A's nose and chord: (2, 1)…(2.3, 1) → (0, 0)…(1, 0).
    const onto = outlineOnto(mine.section.points, theirs.section.points);
    expect(onto.fitted).toBe(true);
    const expected: [number, number][] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];
    expect(onto.points).toHaveLength(expected.length);
    onto.points.forEach((p, i) => {
      const [x, y] = itemAt(expected, i);
      expect(p[0]).toBeCloseTo(x, 12);
      expect(p[1]).toBeCloseTo(y, 12);
    });
    expect(outlineOnto(mine.section.points, mine.section.points).fitted).toBe(false);
  });
});

describe('coefficient differences', () => {
  it('B − A is exact, identical results give 0 (not binary noise), and a missing side gives null', () => {
    expect(difference(0.1, 0.3)).toBeCloseTo(0.2, 15);
    expect(difference(0.1 + 0.2, 0.3)).toBe(0);
    expect(difference(null, 0.3)).toBeNull();
    const same = analyseSketch(sketchCase(doc(2)));
    const t = compareCoefficients(same, same);
    expect(t.exact.cl.diff).toBe(0);
    expect(t.secondOrder.liftToDrag.diff).toBe(0);
    expect(formatDifference(-0.01234)).toBe('−0.0123');
    expect(formatDifference(0)).toBe('0');
  });

  it('x_cp/c where one side\'s normal force is near zero: a dash with the reason, no difference, a note', () => {
    // The demo fin root with a flap at x/c 0.75, δ −10°, M 1.5, α 2.233°: cn ≈ −2.3e-5 and the
    // solver's x_cp ≈ 2515 c (rule in shared/flight/xcp.ts); B at α 4°, δ 0 has x_cp 0.4649 c.
    const FIN_ROOT: [number, number][] = [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]];
    const fin = (alphaDeg: number, deflectionDeg: number) =>
      oneCondition({ section: { points: FIN_ROOT }, condition: { mach: 1.5, alphaDeg, gamma: 1.4, altitudeM: null }, flap: { hingeXOverC: 0.75, deflectionDeg } });
    const w = mount(SketchSnapshotCompare, { props: { a: sideOfSnapshot(snapshot('snap_a', 'Trim', 4, fin(2.233, -10))), b: sideOfSnapshot(snapshot('snap_b', 'Climb', 5, fin(4, 0))) } });
    expect(cell(w, 'compare-exact-xcpOverC-a')).toBe('—');
    expect(w.get('[data-testid="compare-exact-xcpOverC-a"]').attributes('title')).toBe(XCP_UNDEFINED_NOTE);
    expect(cell(w, 'compare-exact-xcpOverC-b')).toBe('0.4649');
    expect(w.get('[data-testid="compare-exact-xcpOverC-b"]').attributes('title')).toBeUndefined();
    expect(cell(w, 'compare-exact-xcpOverC-diff')).toBe(formatDifference(null));
    expect(w.get('[data-testid="compare-xcp-note"]').text()).toContain(XCP_UNDEFINED_NOTE);
    w.unmount();
  });
});
