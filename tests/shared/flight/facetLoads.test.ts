import { describe, expect, it } from 'vitest';
import { analyseDesignPoints } from '../../../shared/flight/designPoints.ts';
import { facetLoads } from '../../../shared/flight/facetLoads.ts';
import { loadsCsv, loadsCsvHeader } from '../../../shared/flight/loadsExport.ts';
import type { SketchDocument } from '../../../shared/model/sketch.ts';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';
import { sketchCase } from '../../../shared/model/sketch.ts';
import { expectClose, expectCloseRel, expectPrinted } from '../../helpers/expectClose.ts';
import { rad, shockState } from '../solver/independentRelations.ts';
import { CHORD_M, G, P_INF, SPAN_M, handLoads, wedgeDocument } from './wedgeByHand.ts';
import { firstItem, itemAt } from '../../../shared/util/invariant.ts';

/** Loads per facet against the hand integration of tests/shared/flight/wedgeByHand.ts. */
describe('facetLoads (loads per facet in physical units)', () => {
  it('the textbook relations give p/p∞ = 1.7066 behind a 10° shock at Mach 2 (NACA Report 1135 chart, from memory)', () => {
    expectPrinted(shockState(2, rad(10), G).pRatio, '1.7066');
  });

  it('double wedge 5°, Mach 2, α 5°, 11 km, 2 m chord: each facet\'s p in Pa and its force per span match a hand integration (p∞ 22 700 Pa, 1976 standard Table I)', () => {
    const doc = wedgeDocument();
    const a = analyseSketch(sketchCase(doc));
    expect(a.status).toBe('ok');
    expectPrinted(a.loads!.atmosphere.pressurePa, '22700');
    const answer = facetLoads(a, doc.loads);
    if (!answer.ok) throw new Error(answer.reason);
    const hand = handLoads();
    const byName = (s: string, x: number) => answer.loads.facets.find((f) => f.surface === s && (x < 1 ? f.xMidM < 1 : f.xMidM > 1))!;
    const got = [byName('upper', 0), byName('upper', 2), byName('lower', 0), byName('lower', 2)];
    got.forEach((f, i) => {
      const h = itemAt(hand.rows, i);
      // p∞ is known to 5 figures (±0.5 Pa); the relations to far better.
      expectClose(f.pressurePa!, h.p, 0.5 * (h.p / P_INF) + 0.01);
      expectClose(f.pressureDifferencePa!, h.dp, 0.5 * Math.abs(h.p / P_INF - 1) + 0.01);
      expectCloseRel(f.lengthM, h.L, 1e-12);
      expectClose(f.normalNPerM!, h.dp * h.L, 1 * h.L);
      expectClose(f.forceXNPerM!, h.fx, 1);
      expectClose(f.forceYNPerM!, h.fy, 1);
      expectClose(f.momentNMPerM!, h.m, 1);
    });
    // The upper front facet lies along the stream: no pressure difference, no force.
    expectClose(itemAt(got, 0).pressureDifferencePa!, 0, 1e-6);
    // Section totals, per unit span and for the 3 m span.
    const tot = answer.loads.total!;
    expectCloseRel(tot.liftNPerM, hand.lift, 3e-5);
    expectCloseRel(tot.dragNPerM, hand.drag, 3e-5);
    expectCloseRel(tot.momentNMPerM, hand.moment, 3e-5);
    // Plausibility: Ackeret's flat-plate lift 4α/√(M² − 1)·q∞·c (textbook) with q∞ = ½γp∞M²
    // = 63 560 Pa is 25.6 kN/m; shock-expansion theory gives a few per cent more at this α.
    const ackeret = ((4 * rad(5)) / Math.sqrt(3)) * 0.5 * G * P_INF * 4 * CHORD_M;
    expect(tot.liftNPerM / ackeret).toBeGreaterThan(1);
    expect(tot.liftNPerM / ackeret).toBeLessThan(1.05);
  });

  it('the CSV carries units in every header, one row per facet and a total row, SI and US customary (1 lbf/ft = 14.5939 N/m, 1 psf = 47.8803 Pa, definitions)', () => {
    const doc = wedgeDocument();
    const all = analyseDesignPoints(doc);
    const hand = handLoads();
    for (const units of ['si', 'us'] as const) {
      const text = loadsCsv('HD-7 Tern fin, "root"', doc, all, { units });
      const lines = text.trim().split('\n');
      const header = lines.find((l) => l.startsWith('design_point,'))!;
      expect(header.split(',')).toEqual(loadsCsvHeader(units));
      const cols = header.split(',');
      for (const c of cols.slice(3)) if (c !== 'cp') expect(c).toMatch(units === 'si' ? /_(m|Pa|N_per_m|N_m_per_m|N|N_m)$/ : /_(ft|psf|lbf_per_ft|lbf_ft_per_ft|lbf|lbf_ft)$/);
      const data = lines.filter((l) => l.startsWith('"'));
      expect(data).toHaveLength(5);
      // The name people typed stays one quoted cell with its comma and quotes.
      expect(itemAt(data, 0).startsWith('"Pull-up, ""max g""","upper",')).toBe(true);
      const parse = (l: string) => l.slice(l.indexOf('",') + 2).split(',');
      const total = parse(itemAt(data, 4));
      const col = (name: string) => cols.indexOf(name) - 1;
      const lift = Number(total[col(units === 'si' ? 'lift_N_per_m' : 'lift_lbf_per_ft')]);
      const liftSpan = Number(total[col(units === 'si' ? 'lift_N' : 'lift_lbf')]);
      const moment = Number(total[col(units === 'si' ? 'moment_N_m_per_m' : 'moment_lbf_ft_per_ft')]);
      const lbf = 4.4482216152605; // N (definition: 0.45359237 kg × 9.80665 m/s²)
      const ft = 0.3048;
      expectCloseRel(lift, units === 'si' ? hand.lift : hand.lift / (lbf / ft), 3e-5);
      expectCloseRel(liftSpan, units === 'si' ? hand.lift * SPAN_M : (hand.lift * SPAN_M) / lbf, 3e-5);
      expectCloseRel(moment, units === 'si' ? hand.moment : hand.moment / lbf, 3e-5);
      const lowerFront = parse(itemAt(data, 2));
      const p = Number(lowerFront[col(units === 'si' ? 'p_Pa' : 'p_psf')]);
      expectCloseRel(p, units === 'si' ? P_INF * hand.front.pRatio : (P_INF * hand.front.pRatio) / (lbf / ft ** 2), 3e-5);
      expect(text).toContain('Inviscid preliminary estimate');
    }
  });

  it('a design point without an altitude is named with the reason and has no rows; the selected point alone can be exported', () => {
    const doc = wedgeDocument();
    const second = { ...firstItem(doc.designPoints), id: 'point_bbbbbbbbbbbbbbbbbbbb', name: 'Cruise', condition: { mach: 2.5, alphaDeg: 1, gamma: G, altitudeM: null } };
    const two: SketchDocument = { ...doc, designPoints: [...doc.designPoints, second] };
    const all = analyseDesignPoints(two);
    const text = loadsCsv('t', two, all, { units: 'si' });
    expect(text).toMatch(/# Design point,"Cruise",".*no loads: Give an altitude/);
    expect(text.split('\n').filter((l) => l.startsWith('"Cruise"'))).toHaveLength(0);
    const only = loadsCsv('t', two, all, { units: 'si', pointIds: [itemAt(doc.designPoints, 0).id] });
    expect(only).not.toContain('Cruise');
    expect(only.split('\n').filter((l) => l.startsWith('"Pull-up'))).toHaveLength(5);
  });

  it('a design point named like a formula is a neutralised text cell in every row and note [CSV2]', () => {
    const doc = wedgeDocument();
    const evil: SketchDocument = { ...doc, designPoints: [{ ...firstItem(doc.designPoints), name: '=HYPERLINK("x")' }] };
    const text = loadsCsv('@title', evil, analyseDesignPoints(evil), { units: 'si' });
    const rows = text.split('\n').filter((l) => l.startsWith('"'));
    expect(rows).toHaveLength(5);
    for (const r of rows) expect(r.startsWith(`"'=HYPERLINK(""x"")",`)).toBe(true);
    expect(text).toContain(`# Shockwright loads per facet,"'@title"`);
    expect(text).toContain(`# Design point,"'=HYPERLINK(""x"")"`);
  });
});
