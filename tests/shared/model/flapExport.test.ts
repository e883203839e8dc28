import { describe, expect, it } from 'vitest';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';
import { analyseDesignPoints } from '../../../shared/flight/designPoints.ts';
import { loadsCsv } from '../../../shared/flight/loadsExport.ts';
import { pressureSignature } from '../../../shared/solver/pressureSignature.ts';
import { sketchCase, type SketchDocument } from '../../../shared/model/sketch.ts';
import { facetCsv, FACET_CSV_COLUMNS, resultJson, signatureCsv } from '../../../shared/model/sketchExport.ts';
import { DEMO_SKETCHES } from '../../../server/db/seed.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/**
 * Exports of a result solved with a flap: the rows are the deflected section's facets, so every
 * export whose numbers depend on the flap names it (deflection and hinge).
 *
 * The flapped section by hand: the 5 %-thick double wedge (0,0) (0.4,0.025) (1,0) (0.4,−0.025)
 * with a hinge at x/c 0.75 cuts the aft faces at y = ±0.025·0.25/0.6 = ±0.0104167, so the hinge
 * sits at (0.75, 0) and the vertices are 0 (0,0), 1 (0.4,0.025), 2 (0.75,0.0104167), 3 the tail,
 * 4 (0.75,−0.0104167), 5 (0.4,−0.025). Deflected 10° trailing edge down, the tail (1,0) turns
 * clockwise about the hinge: it moves by (0.25·(cos10°−1), −0.25·sin10°) = (−0.0037981, −0.0434120),
 * to (0.9962019, −0.0434120). Computed by hand (rotation of a point about another).
 */
const ROOT = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern fin root'))!;
function flapped(deflectionDeg = 10): SketchDocument {
  const d = structuredClone(ROOT.document);
  return { ...d, flap: { hingeXOverC: 0.75 }, designPoints: d.designPoints.map((p) => ({ ...p, flapDeflectionDeg: deflectionDeg })) };
}
const D10 = (10 * Math.PI) / 180;
const TAIL: [number, number] = [0.75 + 0.25 * Math.cos(D10), -0.25 * Math.sin(D10)];
const HINGE_Y = (0.025 * 0.25) / 0.6;

describe('exports of a flapped result', () => {
  const doc = flapped();
  const point = itemAt(doc.designPoints, 0);
  const analysis = analyseSketch(sketchCase(doc, point.id));
  const result = analysis.result!;
  const flap = analysis.flap!;

  it('the analysis is of the hand-computed flapped section', () => {
    expect(TAIL[0] - 1).toBeCloseTo(-0.0037981, 7);
    expect(TAIL[1]).toBeCloseTo(-0.043412, 6);
    const want: [number, number][] = [[0, 0], [0.4, 0.025], [0.75, HINGE_Y], TAIL, [0.75, -HINGE_Y], [0.4, -0.025]];
    expect(analysis.solvedPoints).toHaveLength(6);
    analysis.solvedPoints.forEach((p, i) => {
      expect(p[0]).toBeCloseTo(itemAt(want, i)[0], 9);
      expect(p[1]).toBeCloseTo(itemAt(want, i)[1], 9);
    });
  });

  it('the facet CSV names the flap (deflection and hinge) and its rows are the deflected facets', () => {
    const csv = facetCsv('Demo', result, flap).trimEnd().split('\n');
    expect(csv[1]).toBe('# M 2.6, alpha 4 deg, gamma 1.4; flap 10 deg (trailing edge down +) about a hinge at x/c 0.75; facets and coordinates are the deflected section\'s, the hinge a vertex of both surfaces; status ok');
    const rows = csv.slice(5).map((l) => l.split(','));
    expect(rows.map((r) => `${r[0]} ${r[1]}`)).toEqual(['"upper" 0', '"upper" 1', '"upper" 2', '"lower" 5', '"lower" 4', '"lower" 3']);
    const col = (r: string[], name: (typeof FACET_CSV_COLUMNS)[number]) => Number(r[FACET_CSV_COLUMNS.indexOf(name)]);
    const upper1 = itemAt(rows, 1);
    expect([col(upper1, 'x_from'), col(upper1, 'x_to')]).toEqual([0.4, 0.75]);
    expect(col(upper1, 'y_to')).toBeCloseTo(HINGE_Y, 9);
    const lower3 = itemAt(rows, 5); // edge 3 → 4 (tail, lower hinge vertex), listed nose → tail
    expect(col(lower3, 'x_from')).toBe(0.75);
    expect(col(lower3, 'y_from')).toBeCloseTo(-HINGE_Y, 9);
    expect(col(lower3, 'x_to')).toBeCloseTo(TAIL[0], 9);
    expect(col(lower3, 'y_to')).toBeCloseTo(TAIL[1], 9);
    // Without a flap the header says so.
    expect(facetCsv('Demo', result).split('\n')[1]).toBe('# M 2.6, alpha 4 deg, gamma 1.4; no flap; status ok');
  });

  it('the signature CSV, the result JSON and the loads CSV name the flap with its hinge', () => {
    const sig = signatureCsv('Demo', result, pressureSignature(result, 'below', 1)!, flap).split('\n');
    expect(sig[1]).toContain('flap 10 deg (trailing edge down +) about a hinge at x/c 0.75');
    const json = JSON.parse(resultJson('Demo', doc, result, flap));
    expect(json.flap).toMatchObject({ hingeXOverC: 0.75, deflectionDeg: 10 });
    expect(JSON.parse(resultJson('Demo', doc, result)).flap).toBeNull();
    const loads = loadsCsv('Demo', doc, analyseDesignPoints(doc), { units: 'si' });
    expect(loads).toContain('flap 10 deg (trailing edge down +) about a hinge at x/c 0.75');
  });
});
