import type { Facet, SurfaceName } from '../solver/types.ts';
import type { SketchAnalysis } from './analyseSketch.ts';

/**
 * Pressures and forces facet by facet in physical units (SI), for structures: the analysis'
 * exact (shock-expansion) facet pressures at the condition's altitude, on the sketch's physical
 * chord and span. Drawing units are scaled by chordM / (reference chord), so the section as
 * drawn has the physical chord (a deflected flap does not change the scale, as for every
 * coefficient).
 *
 * Per facet: the static pressure p = (p/p∞)·p∞ (zero past a Prandtl-Meyer limit), the
 * difference p − p∞, and the force of that difference on the facet per unit span,
 * F = −(p − p∞)·n_out·L (n_out the outward unit normal, L the facet length), in body axes
 * (x aft, y up) and wind axes (drag along the free stream, lift normal to it), and its moment
 * about the sketch's moment point, nose up positive. The free-stream pressure acts all round a
 * closed section and adds nothing to the section's force, so the sum over the facets is the
 * section load of the loads panel (cl·q∞·c and so on). `normalNPerM` = (p − p∞)·L is the load
 * pressing on the facet (positive into the section). For the span, multiply by spanM (the
 * section load spread evenly over the span, as everywhere in Shockwright).
 *
 * Facets the march did not reach have null pressures and forces; then there are no totals.
 * Source: common practice (pressure integration over a polygon, as shared/solver/integrateLoads).
 */
export interface FacetLoad {
  surface: SurfaceName;
  /** Input edge index (the edge from points[index] to points[index + 1]). */
  facet: number;
  /** Facet midpoint from the reference leading edge, m (x aft, y up). */
  xMidM: number;
  yMidM: number;
  lengthM: number;
  cp: number | null;
  pressurePa: number | null;
  /** p − p∞, Pa. */
  pressureDifferencePa: number | null;
  /** (p − p∞)·L per unit span, N/m, positive pressing into the section. */
  normalNPerM: number | null;
  forceXNPerM: number | null;
  forceYNPerM: number | null;
  liftNPerM: number | null;
  dragNPerM: number | null;
  /** About the moment point, nose up positive, N·m/m. */
  momentNMPerM: number | null;
}

export interface FacetLoadsTotal {
  forceXNPerM: number;
  forceYNPerM: number;
  liftNPerM: number;
  dragNPerM: number;
  momentNMPerM: number;
}

export interface FacetLoads {
  chordM: number;
  spanM: number;
  /** Metres per drawing unit. */
  scaleMPerUnit: number;
  freeStreamPressurePa: number;
  dynamicPressurePa: number;
  /** Moment point from the reference leading edge, m. */
  momentPointM: [number, number];
  /** Upper surface nose → tail, then the lower. */
  facets: FacetLoad[];
  /** Sums over the facets (wave loads only: friction is not a facet pressure); null when a facet is unsolved. */
  total: FacetLoadsTotal | null;
}

export type FacetLoadsAnswer = { ok: true; loads: FacetLoads } | { ok: false; reason: string };

export function facetLoads(analysis: SketchAnalysis, settings: { chordM: number; spanM: number }): FacetLoadsAnswer {
  const r = analysis.result;
  if (!r) return { ok: false, reason: analysis.problem ?? 'The sketch has no result.' };
  if (!analysis.loads) return { ok: false, reason: analysis.loadsNote ?? 'No loads for this analysis.' };
  const pInf = analysis.loads.atmosphere.pressurePa;
  const q = analysis.loads.dynamicPressurePa;
  const ref = r.geometry.reference;
  const k = settings.chordM / ref.chord;
  const alpha = (r.condition.alphaDeg * Math.PI) / 180;
  const ca = Math.cos(alpha);
  const sa = Math.sin(alpha);
  const [le0, le1] = ref.leadingEdge;
  const mp: [number, number] = [(r.geometry.momentPoint[0] - le0) * k, (r.geometry.momentPoint[1] - le1) * k];

  const one = (surface: SurfaceName, f: Facet): FacetLoad => {
    const dx = (f.to[0] - f.from[0]) * k;
    const dy = (f.to[1] - f.from[1]) * k;
    const lengthM = Math.hypot(dx, dy);
    const xMidM = ((f.from[0] + f.to[0]) / 2 - le0) * k;
    const yMidM = ((f.from[1] + f.to[1]) / 2 - le1) * k;
    const base = { surface, facet: f.index, xMidM, yMidM, lengthM, cp: f.cp };
    if (f.pRatio === null) {
      return { ...base, pressurePa: null, pressureDifferencePa: null, normalNPerM: null, forceXNPerM: null, forceYNPerM: null, liftNPerM: null, dragNPerM: null, momentNMPerM: null };
    }
    const p = f.pRatio * pInf;
    const dp = p - pInf;
    // n_out·L = (−dy, dx) on the upper surface (run nose → tail over the top), (dy, −dx) below.
    const side = surface === 'upper' ? 1 : -1;
    const fx = -dp * side * -dy;
    const fy = -dp * side * dx;
    const mz = (xMidM - mp[0]) * fy - (yMidM - mp[1]) * fx;
    return {
      ...base,
      pressurePa: p,
      pressureDifferencePa: dp,
      normalNPerM: dp * lengthM,
      forceXNPerM: fx,
      forceYNPerM: fy,
      liftNPerM: fy * ca - fx * sa,
      dragNPerM: fx * ca + fy * sa,
      // Nose up positive: −(r × F)_z with x aft and y up.
      momentNMPerM: 0 - mz,
    };
  };
  const facets = [...r.surfaces.upper.map((f) => one('upper', f)), ...r.surfaces.lower.map((f) => one('lower', f))];
  let total: FacetLoadsTotal | null = { forceXNPerM: 0, forceYNPerM: 0, liftNPerM: 0, dragNPerM: 0, momentNMPerM: 0 };
  for (const f of facets) {
    if (f.forceXNPerM === null || f.forceYNPerM === null || f.liftNPerM === null || f.dragNPerM === null || f.momentNMPerM === null) {
      total = null;
      break;
    }
    total.forceXNPerM += f.forceXNPerM;
    total.forceYNPerM += f.forceYNPerM;
    total.liftNPerM += f.liftNPerM;
    total.dragNPerM += f.dragNPerM;
    total.momentNMPerM += f.momentNMPerM;
  }
  return {
    ok: true,
    loads: { chordM: settings.chordM, spanM: settings.spanM, scaleMPerUnit: k, freeStreamPressurePa: pInf, dynamicPressurePa: q, momentPointM: mp, facets, total },
  };
}
