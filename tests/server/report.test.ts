import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { renderReport, waveMapLayout } from '../../server/api/reports/renderReport.ts';
import type { ReportData } from '../../server/api/reports/reportData.ts';
import { analyseDesignPoints } from '../../shared/flight/designPoints.ts';
import { selectedAnalysis } from '../../shared/flight/storedAnalysis.ts';
import { DEMO_SKETCHES } from '../../server/db/seed.ts';
import { pdfText, pdfToPng } from '../helpers/pdf.ts';
import { ARTIFACTS_DIR } from '../helpers/browser.ts';
import type { SketchDocument } from '../../shared/model/sketch.ts';
import type { UnitSystem } from '../../shared/flight/units.ts';
import { XCP_UNDEFINED_NOTE } from '../../shared/flight/xcp.ts';

/**
 * The section report's content (drawn by renderReport, no database): design points, the wave
 * map with axes and scale filling its frame, the Cp chart, the coordinates and per-facet tables,
 * and numbers printed by the one formatter. Pages are also rendered to PNG
 * (tests/e2e/artifacts/report-*.png) for a person to look at.
 */
const ROOT = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern fin root'))!;
const CANARD = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern canard'))!;

function data(title: string, document: SketchDocument, units: UnitSystem = 'si'): ReportData {
  const points = analyseDesignPoints(document);
  return { title, teamName: 'Harrowgate Dynamics — fins group', revision: 7, generatedAt: new Date('2026-12-03T06:00:00Z'), generatedBy: 'Ines Marlow', units, document, analysis: selectedAnalysis(points)!, points, study: null };
}

describe('the section report (PDF)', () => {
  it('lists every design point with its condition, status, coefficients and lift, the selected one named', async () => {
    const text = pdfText(await renderReport(data(ROOT.title, ROOT.document))).replace(/\s+/g, ' ');
    expect(text).toContain('Design points (3)');
    for (const name of ['Burnout', 'Max q', 'Pull-up']) expect(text).toContain(name);
    expect(text).toMatch(/Burnout 2\.6 4° 1\.4 12,000 m ok 0\.\d+ 0\.0\d+ −0\.\d+ [\d,.]+ N\/m/);
    expect(text).toContain('are for “Burnout” (bold), the sketch\'s selected design point');
    expect(text).toContain('Condition — design point “Burnout”');
  });

  it('has the Cp chart, the per-facet table with pressures in the person\'s units, and the coordinates table', async () => {
    for (const units of ['si', 'us'] as const) {
      const text = pdfText(await renderReport(data(ROOT.title, ROOT.document, units))).replace(/\s+/g, ' ');
      expect(text).toContain('Pressure coefficient along the chord');
      expect(text).toContain('Cp (negative up)');
      expect(text).toContain('linear (Ackeret)');
      expect(text).toContain('second-order (Busemann)');
      expect(text).toContain('Per facet (selected design point)');
      // Facet 0 is the edge from vertex 0 (the nose) to vertex 1, as in the loads CSV.
      expect(text).toMatch(units === 'si' ? /upper 0 0\.2 [−\d.]+° fan [\d.]+ [\d.]+ [−\d.]+ [−\d.]+ [−\d.]+ [\d,.]+ Pa [−\d,.]+ N\/m/ : /upper 0 0\.2 [−\d.]+° fan [\d.]+ [\d.]+ [−\d.]+ [−\d.]+ [−\d.]+ [\d,.]+ lbf\/ft² [−\d,.]+ lbf\/ft/);
      // The lower surface's first facet from the nose is the closing edge, vertex 3 → 0 (the CSV's lower,3).
      expect(text).toMatch(/lower 3 0\.2 [−\d.]+° shock/);
      expect(text).toContain('Section coordinates as drawn (4 vertices)');
      expect(text).toMatch(units === 'si' ? /0 0 0 0 ?m 0 ?m/ : /0 0 0 0 ?ft 0 ?ft/); // pdftotext may drop the space before a short unit
      // The scale bar names a chord fraction and its length on the 0.32 m chord.
      const bar = /([\d.]+) c = ([\d.]+) (m|ft)/.exec(text)!;
      expect(bar[3]).toBe(units === 'si' ? 'm' : 'ft');
      expect(Number(bar[2]) * (units === 'si' ? 1 : 0.3048)).toBeCloseTo(Number(bar[1]) * 0.32, 3); // the fin root's 0.32 m chord
      expect(text).toContain('x/c from the leading edge');
    }
  });

  it('with a flap, numbers the facets against the printed coordinates of the section as analysed (flap deflected)', async () => {
    // The fin root with a hinge at x/c 0.75 deflected 10°. By hand: the hinge cuts the aft faces at
    // y = ±0.025·0.25/0.6 = ±0.010417 and sits at (0.75, 0); the tail (1, 0) turns about it by 10°
    // trailing edge down, moving by (0.25·(cos10° − 1), −0.25·sin10°) to (0.99620, −0.043412).
    // Analysed vertices: 0 (0,0), 1 (0.4,0.025), 2 (0.75,0.010417), 3 tail, 4 (0.75,−0.010417), 5 (0.4,−0.025).
    const d = structuredClone(ROOT.document);
    const doc: SketchDocument = { ...d, flap: { hingeXOverC: 0.75 }, designPoints: d.designPoints.map((p) => ({ ...p, flapDeflectionDeg: 10 })) };
    const text = pdfText(await renderReport(data(ROOT.title, doc))).replace(/\s+/g, ' ');
    expect(text).toContain('Section coordinates as analysed — flap deflected 10° about x/c = 0.75 (6 vertices)');
    expect(text).toContain('Section coordinates as drawn (4 vertices)');
    expect(text).toContain('Facet i is the edge from vertex i to i + 1 of the table “Section coordinates as analysed”');
    // Upper 1 spans 0.4 → 0.75 (mid 0.575); lower 3 is the tail → lower hinge edge (mid 0.873).
    expect(text).toMatch(/upper 1 0\.575 /);
    expect(text).toMatch(/lower 3 0\.873 /);
    // Vertices 2 and 3 of the analysed table: the upper hinge vertex and the deflected tail.
    expect(text).toMatch(/ 2 0\.75 0\.010417 /);
    expect(text).toMatch(/ 3 0\.9962 −0\.043412 /);
  });

  it('x_cp/c in the coefficients table: a dash and the reason where the normal force is near zero, the number otherwise', async () => {
    // The fin root, flap at x/c 0.75 deflected −10°, M 1.5, α 2.233°: cn ≈ −2.3e-5, the solver's x_cp
    // ≈ 2515 c (linear 4.48 c, second-order −33.9 c); rule in shared/flight/xcp.ts.
    const d = structuredClone(ROOT.document);
    const doc: SketchDocument = { ...d, flap: { hingeXOverC: 0.75 }, designPoints: d.designPoints.map((p) => ({ ...p, condition: { ...p.condition, mach: 1.5, alphaDeg: 2.233 }, flapDeflectionDeg: -10 })) };
    const text = pdfText(await renderReport(data(ROOT.title, doc))).replace(/\s+/g, ' ');
    expect(text).toContain('x_cp/c (from the leading edge) — — — — —');
    expect(text).toContain(`— in x_cp/c: ${XCP_UNDEFINED_NOTE}; cm gives the moment there.`);
    expect(text).not.toMatch(/2,?51\d\.\d/);
    // The demo's own fin root (M 2.6, α 4°): a number (0.4… c, near mid-chord for a thin section), no note.
    const plain = pdfText(await renderReport(data(ROOT.title, ROOT.document))).replace(/\s+/g, ' ');
    expect(plain).toMatch(/x_cp\/c \(from the leading edge\) 0\.4\d+ 0\.5 /);
    expect(plain).not.toContain('— in x_cp/c');
  });

  it('prints numbers with the one formatter: true minus signs, no e-notation for ordinary values', async () => {
    for (const s of [ROOT, CANARD]) {
      const text = pdfText(await renderReport(data(s.title, s.document)));
      // A hyphen before a digit that is not inside a word or date would be a minus sign.
      const hyphenNumbers = text.match(/(?<![\w/.-])-\d[\d.,]*/g) ?? [];
      expect(hyphenNumbers).toEqual([]);
      expect(text).toContain('−'); // true minus signs are there
      expect(text.match(/\d[eE][+-]?\d/g) ?? []).toEqual([]);
    }
  });

  it('the wave map fills its frame: the drawing spans the width and the frame takes its aspect (within limits)', () => {
    for (const s of [ROOT, CANARD, ...DEMO_SKETCHES]) {
      const a = selectedAnalysis(analyseDesignPoints(s.document))!;
      const layout = waveMapLayout(a, 473);
      // Width: the drawing (with a 3 % margin) is the frame's width.
      expect((layout.drawing.maxX - layout.drawing.minX) * layout.scale).toBeGreaterThan(473 * 0.93);
      expect((layout.drawing.maxX - layout.drawing.minX) * layout.scale).toBeLessThanOrEqual(473 + 1e-9);
      // Height: the frame is the drawing's height when that fits in 170…330 pt, else clamped.
      const want = (layout.drawing.maxY - layout.drawing.minY) * layout.scale;
      expect(layout.height).toBeGreaterThanOrEqual(170);
      expect(layout.height).toBeLessThanOrEqual(330);
      expect(layout.height).toBeCloseTo(Math.min(330, Math.max(170, want * 1.06)), 6);
      // The frame shows the whole drawing's height whenever it fits, else the section's middle.
      if (want * 1.06 <= 330) {
        expect(layout.minY).toBeLessThanOrEqual(layout.drawing.minY);
        expect(layout.maxY).toBeGreaterThanOrEqual(layout.drawing.maxY);
      }
    }
  });

  it('renders its pages for a person to look at', async () => {
    mkdirSync(ARTIFACTS_DIR, { recursive: true });
    const pdf = await renderReport(data(CANARD.title, CANARD.document, 'us'));
    const pngs = pdfToPng(pdf, ARTIFACTS_DIR, 'report-canard', 80);
    expect(pngs.length).toBeGreaterThanOrEqual(3);
    void path;
  });
});
