import { csvHeader, csvNote, csvRow } from '../format/csv.ts';
import { flapNote } from '../model/sketchExport.ts';
import { RESULTS_CAUTION } from '../model/caution.ts';
import type { SketchDocument } from '../model/sketch.ts';
import type { DesignPointsAnalysis } from './storedAnalysis.ts';
import { facetLoads, type FacetLoad, type FacetLoadsTotal } from './facetLoads.ts';
import { toDisplay, type Quantity, type UnitSystem } from './units.ts';

/**
 * Loads per facet as CSV for structures (shared/flight/facetLoads.ts): one block of rows per
 * design point, each facet's pressure and force per unit span and over the span, then a
 * `total` row (wave loads: the sum over the facets), in SI or US customary units. Every column
 * header carries its unit (`p_Pa`, `lift_lbf_per_ft`); numbers are plain (a point as decimal
 * separator, no grouping), 9 significant figures. `#` lines before the header name the sketch,
 * each point's condition and free stream, the chord and span, the conventions and the caution;
 * a point without loads (no altitude, a limit) is named there with the reason and has no rows.
 * Cells, notes and the header come from shared/format/csv.ts [CSV1]–[CSV4]: the title and the
 * design points' names are quoted text cells, neutralised when they could run as a formula.
 */

const UNIT_SUFFIX: Record<UnitSystem, Record<'length' | 'pressure' | 'forcePerSpan' | 'momentPerSpan' | 'force' | 'moment', string>> = {
  si: { length: 'm', pressure: 'Pa', forcePerSpan: 'N_per_m', momentPerSpan: 'N_m_per_m', force: 'N', moment: 'N_m' },
  us: { length: 'ft', pressure: 'psf', forcePerSpan: 'lbf_per_ft', momentPerSpan: 'lbf_ft_per_ft', force: 'lbf', moment: 'lbf_ft' },
};

type Cell = { key: string; quantity: Quantity | null; value: (f: FacetLoad, span: number) => number | null };

const PER_SPAN: [string, keyof FacetLoad & keyof FacetLoadsTotal][] = [
  ['fx', 'forceXNPerM'],
  ['fy', 'forceYNPerM'],
  ['lift', 'liftNPerM'],
  ['drag', 'dragNPerM'],
];

function columns(): Cell[] {
  const perSpan = PER_SPAN.map(([name, key]): Cell => ({ key: name, quantity: 'forcePerSpan', value: (f) => f[key] }));
  const overSpan = PER_SPAN.map(([name, key]): Cell => ({ key: name, quantity: 'force', value: (f, s) => mul(f[key], s) }));
  return [
    { key: 'x_mid', quantity: 'length', value: (f) => f.xMidM },
    { key: 'y_mid', quantity: 'length', value: (f) => f.yMidM },
    { key: 'length', quantity: 'length', value: (f) => f.lengthM },
    { key: 'cp', quantity: null, value: (f) => f.cp },
    { key: 'p', quantity: 'pressure', value: (f) => f.pressurePa },
    { key: 'p_minus_pinf', quantity: 'pressure', value: (f) => f.pressureDifferencePa },
    { key: 'normal', quantity: 'forcePerSpan', value: (f) => f.normalNPerM },
    ...perSpan,
    { key: 'moment', quantity: 'momentPerSpan', value: (f) => f.momentNMPerM },
    { key: 'normal', quantity: 'force', value: (f, s) => mul(f.normalNPerM, s) },
    ...overSpan,
    { key: 'moment', quantity: 'moment', value: (f, s) => mul(f.momentNMPerM, s) },
  ];
}

const mul = (v: number | null, s: number) => (v === null ? null : v * s);

/** The header row for a unit system. */
export function loadsCsvHeader(units: UnitSystem): string[] {
  return ['design_point', 'surface', 'facet', ...columns().map((c) => (c.quantity ? `${c.key}_${UNIT_SUFFIX[units][c.quantity as keyof (typeof UNIT_SUFFIX)['si']]}` : c.key))];
}

/** A number for a machine: 9 significant figures, no −0; empty when there is none. */
const plain = (v: number | null): number | null => (v === null || !Number.isFinite(v) ? null : Number(v.toPrecision(9)) + 0);

export interface LoadsCsvOptions {
  units: UnitSystem;
  /** The design points to export, in the document's order; absent = every point. */
  pointIds?: readonly string[];
}

export function loadsCsv(title: string, doc: SketchDocument, analysis: DesignPointsAnalysis, options: LoadsCsvOptions): string {
  const u = options.units;
  const cols = columns();
  const show = (v: number | null, q: Quantity | null) => plain(v === null ? null : q ? toDisplay(v, q, u) : v);
  const text = (v: number | null, q: Quantity | null) => String(show(v, q) ?? '');
  const unit = (q: Quantity) => UNIT_SUFFIX[u][q as keyof (typeof UNIT_SUFFIX)['si']].replace(/_per_/g, '/').replace(/_/g, '·');
  const lines: string[] = [
    csvNote('Shockwright loads per facet', title),
    csvNote(`Units: ${u === 'si' ? 'SI' : 'US customary (psf = lbf/ft²)'}. Chord ${show(doc.loads.chordM, 'length')} ${unit('length')} (the section as drawn), span ${show(doc.loads.spanM, 'length')} ${unit('length')}; columns without "_per_" are the per-span load times the span.`),
    csvNote('Exact (shock-expansion) facet pressures; forces from p - p_inf on each facet (p_inf acts all round and adds nothing), body axes x aft and y up, lift and drag in wind axes; normal = (p - p_inf) x length, positive pressing into the section; moments about the moment point, nose up positive; x_mid, y_mid from the leading edge. Friction is not included (wave loads).'),
    csvNote(RESULTS_CAUTION),
  ];
  const rows: string[] = [];
  const wanted = options.pointIds ?? doc.designPoints.map((p) => p.id);
  for (const point of doc.designPoints) {
    if (!wanted.includes(point.id)) continue;
    const a = analysis.points.find((p) => p.id === point.id)?.analysis ?? null;
    const c = point.condition;
    const condition = `M ${c.mach}, alpha ${c.alphaDeg} deg, gamma ${c.gamma}, altitude ${c.altitudeM === null ? 'none' : `${text(c.altitudeM, 'altitude')} ${unit('length')}`}${doc.flap ? `, ${flapNote({ hingeXOverC: doc.flap.hingeXOverC, deflectionDeg: point.flapDeflectionDeg })}` : ''}`;
    if (!a) {
      lines.push(csvNote('Design point', point.name, `${condition}; not solved yet.`));
      continue;
    }
    const answer = facetLoads(a, doc.loads);
    if (!answer.ok) {
      lines.push(csvNote('Design point', point.name, `${condition}; status ${a.status}; no loads: ${answer.reason}`));
      continue;
    }
    const l = answer.loads;
    lines.push(
      csvNote(
        'Design point',
        point.name,
        `${condition}; status ${a.status}; p_inf ${text(l.freeStreamPressurePa, 'pressure')} ${unit('pressure')}, q_inf ${text(l.dynamicPressurePa, 'pressure')} ${unit('pressure')}; moment point (${text(l.momentPointM[0], 'length')}, ${text(l.momentPointM[1], 'length')}) ${unit('length')}`,
      ),
    );
    for (const f of l.facets) rows.push(csvRow([point.name, f.surface, f.facet, ...cols.map((col) => show(col.value(f, l.spanM), col.quantity))]));
    if (l.total) {
      const t = l.total;
      const asFacet: FacetLoad = { surface: 'upper', facet: -1, xMidM: 0, yMidM: 0, lengthM: 0, cp: null, pressurePa: null, pressureDifferencePa: null, normalNPerM: null, ...t };
      rows.push(csvRow([point.name, 'total', null, ...cols.map((col) => (['x_mid', 'y_mid', 'length'].includes(col.key) ? null : show(col.value(asFacet, l.spanM), col.quantity)))]));
    }
  }
  return [...lines, csvHeader(loadsCsvHeader(u)), ...rows, ''].join('\n');
}

