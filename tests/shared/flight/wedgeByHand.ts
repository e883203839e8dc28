import { defaultSketchDocument, type SketchDocument } from '../../../shared/model/sketch.ts';
import { fanState, rad, shockState } from '../solver/independentRelations.ts';
import { firstItem, itemAt } from '../../../shared/util/invariant.ts';

/**
 * A hand integration of the facet pressures for a double wedge
 * (half-angle 5°, drawn with unit chord) at Mach 2, α = 5°, 11 000 m, on a 2 m chord and a 3 m
 * span. By hand, facet by facet:
 * - upper front facet: parallel to the stream (θ = 5° − 5° = 0), so p = p∞;
 * - upper rear facet: a Prandtl-Meyer expansion by 10° from Mach 2;
 * - lower front facet: an oblique shock turning the flow by 10° (p/p∞ = 1.7066 at Mach 2,
 *   NACA Report 1135 chart, from memory);
 * - lower rear facet: an expansion by 10° from the state behind that shock.
 * p∞ at 11 000 m (geometric) = 22 700 Pa, U.S. Standard Atmosphere 1976 Table I (from memory).
 * The pressures come from the textbook relations written out independently of the solver
 * (tests/shared/solver/independentRelations.ts); the forces are integrated here by hand:
 * each facet pushes with (p − p∞)·L along its inward normal.
 */

export const G = 1.4;
export const EPS = 5;
const T = Math.tan(rad(EPS)) * 0.5; // half thickness (drawing units)
export const CHORD_M = 2;
export const SPAN_M = 3;
export const P_INF = 22_700; // Pa, 1976 standard at 11 km (from memory; 5 figures)

export function wedgeDocument(): SketchDocument {
  const doc = defaultSketchDocument();
  return {
    ...doc,
    section: { points: [[0, 0], [0.5, T], [1, 0], [0.5, -T]] },
    designPoints: [{ ...firstItem(doc.designPoints), name: 'Pull-up, "max g"', condition: { mach: 2, alphaDeg: 5, gamma: G, altitudeM: 11_000 } }],
    loads: { chordM: CHORD_M, spanM: SPAN_M, friction: 'none' },
  };
}

/** The hand integration: pressures from the textbook relations, forces summed here. */
export function handLoads() {
  const front = shockState(2, rad(10), G);
  const pUpperRear = fanState(2, rad(10), G).pRatio;
  const pLowerRear = front.pRatio * fanState(front.m2, rad(10), G).pRatio;
  const L = (0.5 / Math.cos(rad(EPS))) * CHORD_M; // each facet's length, m
  const t = T * CHORD_M; // half thickness, m
  // Facet ends in metres: nose (0,0), ridges (1, ±t), tail (2, 0).
  const facets = [
    { name: 'upper front', p: P_INF, from: [0, 0], to: [1, t], side: 1 },
    { name: 'upper rear', p: P_INF * pUpperRear, from: [1, t], to: [2, 0], side: 1 },
    { name: 'lower front', p: P_INF * front.pRatio, from: [0, 0], to: [1, -t], side: -1 },
    { name: 'lower rear', p: P_INF * pLowerRear, from: [1, -t], to: [2, 0], side: -1 },
  ];
  const a = rad(5);
  let lift = 0;
  let drag = 0;
  let moment = 0; // about the quarter chord (0.5 m, 0), nose up +
  const rows = facets.map((f) => {
    const dx = itemAt(f.to, 0) - itemAt(f.from, 0);
    const dy = itemAt(f.to, 1) - itemAt(f.from, 1);
    // Outward normal × length: (−dy, dx) above, (dy, −dx) below; force = −(p − p∞)·n·L.
    const nx = f.side * -dy;
    const ny = f.side * dx;
    const dp = f.p - P_INF;
    const fx = -dp * nx;
    const fy = -dp * ny;
    const xm = (itemAt(f.from, 0) + itemAt(f.to, 0)) / 2;
    const ym = (itemAt(f.from, 1) + itemAt(f.to, 1)) / 2;
    const m = -((xm - 0.5) * fy - ym * fx);
    lift += fy * Math.cos(a) - fx * Math.sin(a);
    drag += fx * Math.cos(a) + fy * Math.sin(a);
    moment += m;
    return { ...f, dp, fx, fy, m, L };
  });
  return { rows, lift, drag, moment, front };
}

