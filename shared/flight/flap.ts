import { signedArea } from '../model/polygon.ts';
import { explainSectionProblem } from '../model/ops.ts';
import type { Point } from '../model/sketch.ts';
import { itemAt } from '../util/invariant.ts';

/**
 * A plain flap (control surface) on a section. The hinge line sits at x = x_nose + h·c, on the
 * section's mean line there (halfway between the two surfaces); every vertex aft of it rotates
 * about the hinge by the deflection δ, positive trailing edge DOWN (a clockwise rotation in body
 * axes, x aft and y up). Where a facet crosses the hinge line a vertex is inserted first, so the
 * hinge is a corner of both surfaces. The stored section stays as drawn; this runs on the
 * solver's input only.
 */
export interface FlapInput {
  hingeXOverC: number;
  deflectionDeg: number;
}

export type DeflectedSection =
  | {
      ok: true;
      points: Point[];
      hinge: Point;
      /** Indices (in `points`) of the vertices that moved with the flap. */
      flapVertices: number[];
      /** Indices (in `points`) of the two hinge-line vertices (upper and lower surface). */
      hingeVertices: number[];
      /** Flap chord: tail x − hinge x of the undeflected section. */
      flapChord: number;
      /** The section as drawn (undeflected): the reference of every coefficient and load. */
      drawn: { chord: number; leadingEdge: Point };
    }
  | { ok: false; reason: string };

const EPS = 1e-12;

export function deflectFlap(section: readonly Point[], flap: FlapInput): DeflectedSection {
  const xs = section.map((p) => p[0]);
  const minX = Math.min(...xs);
  const maxX = Math.max(...xs);
  const chord = maxX - minX;
  const xh = minX + flap.hingeXOverC * chord;

  // Insert a vertex wherever an edge strictly crosses the hinge line.
  const points: Point[] = [];
  const onHinge: number[] = [];
  const n = section.length;
  for (let i = 0; i < n; i++) {
    const a = itemAt(section, i);
    const b = itemAt(section, (i + 1) % n);
    if (Math.abs(a[0] - xh) <= EPS * chord) onHinge.push(points.length);
    points.push([a[0], a[1]]);
    const da = a[0] - xh;
    const db = b[0] - xh;
    if ((da < -EPS * chord && db > EPS * chord) || (da > EPS * chord && db < -EPS * chord)) {
      const t = (xh - a[0]) / (b[0] - a[0]);
      onHinge.push(points.length);
      points.push([xh, a[1] + t * (b[1] - a[1])]);
    }
  }
  const [upperHinge, lowerHinge, ...more] = onHinge;
  if (upperHinge === undefined || lowerHinge === undefined || more.length > 0) {
    return { ok: false, reason: `The hinge line at x/c = ${flap.hingeXOverC} meets the section outline ${onHinge.length} times; a flap needs a section it cuts exactly twice (once per surface).` };
  }
  const hinge: Point = [xh, (itemAt(points, upperHinge)[1] + itemAt(points, lowerHinge)[1]) / 2];
  const d = (-flap.deflectionDeg * Math.PI) / 180;
  const c = Math.cos(d);
  const s = Math.sin(d);
  const flapVertices: number[] = [];
  const moved = points.map((p, i): Point => {
    if (p[0] <= xh + EPS * chord) return p;
    flapVertices.push(i);
    const rx = p[0] - hinge[0];
    const ry = p[1] - hinge[1];
    return [hinge[0] + c * rx - s * ry, hinge[1] + s * rx + c * ry];
  });
  const problem = explainSectionProblem(moved);
  if (problem) {
    return { ok: false, reason: `A flap deflection of ${flap.deflectionDeg}° folds the section: ${problem}. Use a smaller deflection or move the hinge.` };
  }
  // The drawn nose: least x, least y among exact ties (the solver's own choice of nose).
  let nose = itemAt(section, 0);
  for (const p of section) {
    if (p[0] < nose[0] || (p[0] === nose[0] && p[1] < nose[1])) nose = p;
  }
  return {
    ok: true,
    points: moved,
    hinge,
    flapVertices,
    hingeVertices: onHinge,
    flapChord: maxX - xh,
    drawn: { chord, leadingEdge: [nose[0], nose[1]] },
  };
}

export interface FacetPressures {
  /** Input edge index (edge i runs points[i] → points[i+1]). */
  index: number;
  cp: number | null;
  cpLinear: number | null;
  cpSecondOrder: number | null;
}

/** Per deflected section, computed once: studies call hingeMoments thousands of times with it. */
const geometryCache = new WeakMap<object, { onFlap: Set<number>; ccw: boolean }>();
function flapGeometry(deflected: Extract<DeflectedSection, { ok: true }>) {
  let g = geometryCache.get(deflected);
  if (!g) {
    g = { onFlap: new Set([...deflected.flapVertices, ...deflected.hingeVertices]), ccw: signedArea(deflected.points) > 0 };
    geometryCache.set(deflected, g);
  }
  return g;
}

export interface HingeMoments {
  /** Exact (shock-expansion); null when some flap facet was not solved. */
  exact: number | null;
  /** Null when the theory gives no Cp (a blunt section). */
  linear: number | null;
  secondOrder: number | null;
}

/**
 * Hinge-moment coefficient ch = H / (q∞·c_f²) about the hinge, per unit span, with c_f the flap
 * chord of the section as drawn (tail x − hinge x, undeflected), from the facet
 * pressures of the deflected section: each flap facet's force −Cp·n_out·length acts at its
 * midpoint. Sign: positive when the moment tends to deflect the trailing edge further down
 * (increase δ) — so a flap deflected into the stream usually shows a negative, restoring ch
 * (common practice).
 */
export function hingeMoments(deflected: Extract<DeflectedSection, { ok: true }>, facets: readonly FacetPressures[]): HingeMoments {
  const pts = deflected.points;
  const n = pts.length;
  const { onFlap, ccw } = flapGeometry(deflected);
  const sums = { exact: 0, linear: 0, secondOrder: 0 };
  let exactValid = true;
  let theoriesValid = true;
  for (const f of facets) {
    const a = itemAt(pts, f.index);
    const b = itemAt(pts, (f.index + 1) % n);
    if (!onFlap.has(f.index) || !onFlap.has((f.index + 1) % n)) continue;
    if (deflected.hingeVertices.includes(f.index) && deflected.hingeVertices.includes((f.index + 1) % n)) continue;
    const dx = b[0] - a[0];
    const dy = b[1] - a[1];
    // Outward normal times length: right of the edge for a counter-clockwise polygon.
    const nx = ccw ? dy : -dy;
    const ny = ccw ? -dx : dx;
    const rx = (a[0] + b[0]) / 2 - deflected.hinge[0];
    const ry = (a[1] + b[1]) / 2 - deflected.hinge[1];
    // Moment (z) of the force −Cp·n: −Cp·(rx·ny − ry·nx); TE-down positive is clockwise (−z).
    const arm = rx * ny - ry * nx;
    if (f.cp === null) exactValid = false;
    else sums.exact += f.cp * arm;
    if (f.cpLinear === null || f.cpSecondOrder === null) theoriesValid = false;
    else {
      sums.linear += f.cpLinear * arm;
      sums.secondOrder += f.cpSecondOrder * arm;
    }
  }
  const cf2 = deflected.flapChord * deflected.flapChord;
  return {
    exact: exactValid ? sums.exact / cf2 : null,
    linear: theoriesValid ? sums.linear / cf2 : null,
    secondOrder: theoriesValid ? sums.secondOrder / cf2 : null,
  };
}
