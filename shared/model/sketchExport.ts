import type { Facet, SolveResult } from '../solver/types.ts';
import type { PressureSignature } from '../solver/pressureSignature.ts';
import { RESULTS_CAUTION } from './caution.ts';
import { csvHeader, csvNote, csvRow } from '../format/csv.ts';
import type { Point, SketchDocument } from './sketch.ts';
import { shownXcpOverC, XCP_UNDEFINED_NOTE } from '../flight/xcp.ts';

/**
 * Plain-text exports of a sketch: the section as CSV (readable back by `parseCoordinates`), the
 * per-facet result as CSV and the whole result as JSON. Result exports carry the caution line.
 * CSV cells come from `shared/format/csv.ts` (text quoted and neutralised, numbers bare).
 */

/**
 * A file name from a title [M3]: letters, digits and dashes only ("HD-7 Tern fin, root" →
 * "HD-7-Tern-fin-root"), at most 80 characters, never empty. Every download name (CSV, JSON,
 * PNG, the PDF report) is built from it.
 */
export function fileSafeName(title: string, fallback = 'sketch'): string {
  const s = title
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .replace(/[\s_]+/g, '-')
    .replace(/-+/g, '-')
    .slice(0, 80)
    .replace(/^-|-$/g, '');
  return s || fallback;
}

/** The section's vertices as `x,y` rows under `#` notes and a header (readable by `parseCoordinates`). */
export function sectionCsv(title: string, points: readonly Point[]): string {
  const rows = points.map(([x, y]) => csvRow([x, y]));
  return [csvNote('Shockwright section', title), csvNote('Vertices in drawing order, body axes (x aft, y up).'), csvHeader(['x', 'y']), ...rows, ''].join('\n');
}

export const FACET_CSV_COLUMNS = [
  'surface', 'facet', 'x_from', 'y_from', 'x_to', 'y_to', 'x_mid_over_c', 'length', 'phi_deg', 'theta_deg',
  'turn_deg', 'wave', 'solved', 'mach', 'p_over_pinf', 'T_over_Tinf', 'rho_over_rhoinf', 'p0_over_p0inf',
  'cp', 'cp_linear', 'cp_second_order', 'vacuum',
] as const;

function facetRow(surface: string, f: Facet): string {
  return csvRow([
    surface, f.index, f.from[0], f.from[1], f.to[0], f.to[1], f.xMidOverC, f.length, f.phiDeg, f.thetaDeg, f.turnDeg,
    f.wave, f.solved, f.mach, f.pRatio, f.tRatio, f.rhoRatio, f.p0Ratio, f.cp, f.cpLinear, f.cpSecondOrder, f.vacuum,
  ]);
}

/**
 * The flap a result was solved with (the analysis' `flap`: hinge and deflection), or null for a
 * section solved as drawn. Every export whose numbers depend on it names it.
 */
export interface ExportFlap {
  hingeXOverC: number;
  deflectionDeg: number;
}

/**
 * The flap named in an export's notes: deflection (trailing edge down +) and hinge, and that the
 * facets and their coordinates are those of the deflected section (the hinge is a vertex of it).
 */
export function flapNote(flap: ExportFlap | null | undefined): string {
  return flap
    ? `flap ${flap.deflectionDeg} deg (trailing edge down +) about a hinge at x/c ${flap.hingeXOverC}; facets and coordinates are the deflected section's, the hinge a vertex of both surfaces`
    : 'no flap';
}

/**
 * One row per facet (upper surface nose → tail, then lower), empty cells where unsolved. With a
 * flap (`flap`, the analysis' hinge and deflection) the rows are the deflected section's facets
 * and the notes say so.
 */
export function facetCsv(title: string, result: SolveResult, flap: ExportFlap | null = null): string {
  const c = result.condition;
  return [
    csvNote('Shockwright result per facet', title),
    csvNote(`M ${c.mach}, alpha ${c.alphaDeg} deg, gamma ${c.gamma}; ${flapNote(flap)}; status ${result.status}`),
    csvNote(RESULTS_CAUTION),
    csvNote(`x_mid_over_c from the leading edge (${result.geometry.reference.leadingEdge.join(', ')}) over the reference chord ${result.geometry.reference.chord} (${result.geometry.reference.source === 'input' ? 'the section as drawn' : 'the solved outline'}); vacuum: p = 0 past a Prandtl-Meyer limit`),
    csvHeader(FACET_CSV_COLUMNS),
    ...result.surfaces.upper.map((f) => facetRow('upper', f)),
    ...result.surfaces.lower.map((f) => facetRow('lower', f)),
    '',
  ].join('\n');
}

/**
 * The document and the full solve result, with the caution, as pretty JSON; `flap` is the flap
 * the result was solved with (null: none), since the document's design points may each deflect it
 * differently. `result` is the solver's output unchanged (its xcpOverC raw); `xcpOverC` beside it
 * gives x_cp/c per theory as every view shows it (null where it is not a location, rule in
 * shared/flight/xcp.ts) with the rule as `note`.
 */
export function resultJson(title: string, document: SketchDocument, result: SolveResult, flap: ExportFlap | null = null): string {
  const solvedFlap = flap ? { hingeXOverC: flap.hingeXOverC, deflectionDeg: flap.deflectionDeg, note: flapNote(flap) } : null;
  const shown = (c: { xcpOverC: number | null; cn: number } | null | undefined) => shownXcpOverC(c?.xcpOverC, c?.cn);
  const xcpOverC = {
    exact: shown(result.coefficients),
    linear: shown(result.theories?.linear),
    secondOrder: shown(result.theories?.secondOrder),
    note: XCP_UNDEFINED_NOTE,
  };
  return `${JSON.stringify({ title, caution: RESULTS_CAUTION, flap: solvedFlap, xcpOverC, document, result }, null, 2)}\n`;
}

/** Columns of the pressure signature CSV. */
export const SIGNATURE_CSV_COLUMNS = ['x_over_c_from_nose', 'p_over_pinf_ahead', 'p_over_pinf_behind'] as const;

/**
 * The pressure signature as CSV (shared cells, [CSV1]–[CSV4]): notes with the sketch's title
 * (its own quoted cell), the condition, the line and the caution, then one row per step edge:
 * x/c from the nose and p/p∞ on each side of it (empty inside the section or past the ends).
 */
export function signatureCsv(title: string, result: SolveResult, signature: PressureSignature, flap: ExportFlap | null = null): string {
  const c = result.condition;
  const rows: string[] = [];
  signature.xOverC.forEach((x, k) => {
    const before = k > 0 ? signature.p[k - 1] : null;
    const after = k < signature.p.length ? signature.p[k] : null;
    rows.push(csvRow([x, before ?? null, after ?? null]));
  });
  return [
    csvNote('Shockwright pressure signature:', title),
    csvNote(`M ${c.mach}, alpha ${c.alphaDeg} deg, gamma ${c.gamma}; ${flapNote(flap)}; p/p_inf along y = ${signature.y}, ${signature.distanceChords} chords ${signature.side} the section`),
    csvNote(RESULTS_CAUTION),
    csvHeader(SIGNATURE_CSV_COLUMNS),
    ...rows,
    '',
  ].join('\n');
}
