/**
 * Loads of a section with a deflected flap, checked against a hand integration of the facet
 * pressures: p·n over every facet of the deflected outline, in newtons per metre of span, with
 * the drawn section as the reference (its chord, its quarter-chord moment point, its flap chord).
 * Nothing here uses the solver's coefficients: only each facet's p/p∞ and the outline.
 *
 * Our own section: the fictional HD-7 fin, a 5 % double wedge of 0.32 m chord with a 25 % flap.
 */
import { describe, expect, it } from 'vitest';
import { analyseSketch } from '../../../shared/flight/analyseSketch.ts';
import type { SketchCase } from '../../../shared/model/sketch.ts';
import { expectClose, expectCloseRel } from '../../helpers/expectClose.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

const CHORD_M = 0.32;
const P_SEA_LEVEL_PA = 101_325; // U.S. Standard Atmosphere 1976, sea-level pressure (defined)
const MACH = 2.5;
const ALPHA_DEG = 2;
const HINGE_X = 0.75;

function fin(deflectionDeg: number): SketchCase {
  return {
    section: { points: [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]] },
    condition: { mach: MACH, alphaDeg: ALPHA_DEG, gamma: 1.4, altitudeM: 0 },
    flap: { hingeXOverC: HINGE_X, deflectionDeg },
    momentPoint: null,
    loads: { chordM: CHORD_M, spanM: 0.18, friction: 'none' },
  };
}

/** Signed area (shoelace): > 0 for a counter-clockwise outline. */
const signedArea = (pts: readonly [number, number][]) =>
  pts.reduce((s, p, i) => {
    const q = itemAt(pts, (i + 1) % pts.length);
    return s + 0.5 * (p[0] * q[1] - q[0] * p[1]);
  }, 0);

/**
 * Force and moments per metre of span from the facet pressures: F = −Σ p·n_out·len, moments
 * about `about` (z out of the page), lengths scaled from drawing units to metres.
 */
function integrate(points: readonly [number, number][], pOf: (edge: number) => number, scale: number, about: [number, number], edges: Iterable<number>) {
  const ccw = signedArea(points) > 0;
  let fx = 0;
  let fy = 0;
  let mz = 0;
  for (const i of edges) {
    const a = itemAt(points, i);
    const b = itemAt(points, (i + 1) % points.length);
    const dx = (b[0] - a[0]) * scale;
    const dy = (b[1] - a[1]) * scale;
    // Outward normal times length: right of the edge for a counter-clockwise outline.
    const nx = ccw ? dy : -dy;
    const ny = ccw ? -dx : dx;
    const p = pOf(i);
    const px = -p * nx;
    const py = -p * ny;
    const rx = ((a[0] + b[0]) / 2 - about[0]) * scale;
    const ry = ((a[1] + b[1]) / 2 - about[1]) * scale;
    fx += px;
    fy += py;
    mz += rx * py - ry * px;
  }
  return { fx, fy, mz };
}

describe('flap loads are referred to the drawn section (hand integration of facet pressures)', () => {
  it.each([0, 5, 10, 20])('δ = %d°: lift, drag, pitching and hinge moments per span equal the integrated p·n', (deflectionDeg) => {
    const analysis = analyseSketch(fin(deflectionDeg), { waves: false });
    expect(analysis.status).toBe('ok');
    const r = analysis.result!;
    const loads = analysis.loads!;
    const pts = analysis.solvedPoints;
    // The reference is the drawn section whatever the deflection.
    expect(r.geometry.reference.chord).toBe(1);
    expect(r.geometry.reference.leadingEdge).toEqual([0, 0]);
    expect(r.geometry.momentPoint).toEqual([0.25, 0]);
    expectClose(analysis.flap!.flapChordOverC, 0.25, 1e-15);

    // q∞ = ½·γ·p∞·M² at sea level (definition of q for a perfect gas).
    const q = 0.5 * 1.4 * P_SEA_LEVEL_PA * MACH * MACH;
    expectCloseRel(loads.dynamicPressurePa, q, 1e-12);

    const pOfEdge = new Map<number, number>();
    for (const f of [...r.surfaces.upper, ...r.surfaces.lower]) pOfEdge.set(f.index, f.pRatio! * P_SEA_LEVEL_PA);
    const scale = CHORD_M; // drawn chord 1 → 0.32 m
    const all = integrate(pts, (i) => pOfEdge.get(i)!, scale, [0.25, 0], pts.keys());
    const a = (ALPHA_DEG * Math.PI) / 180;
    const lift = all.fy * Math.cos(a) - all.fx * Math.sin(a);
    const drag = all.fx * Math.cos(a) + all.fy * Math.sin(a);
    expectCloseRel(loads.perSpan.liftNPerM, lift, 1e-9);
    expectCloseRel(loads.perSpan.dragWaveNPerM, drag, 1e-9);
    // Pitching moment about the drawn quarter chord, nose up positive (clockwise here: −z).
    expectCloseRel(loads.perSpan.momentNMPerM, -all.mz, 1e-9);

    // Hinge moment: the flap's facets (both ends on the hinge line, which stays, or aft of it
    // once rotated back by δ; not the hinge line itself), about the hinge, trailing edge down
    // positive (clockwise: −z).
    const hinge = analysis.flap!.hinge;
    const d = (deflectionDeg * Math.PI) / 180;
    const onHingeLine = ([x]: [number, number]) => Math.abs(x - HINGE_X) < 1e-12;
    const back = ([x, y]: [number, number]) => hinge[0] + Math.cos(d) * (x - hinge[0]) - Math.sin(d) * (y - hinge[1]);
    const onFlapVertex = (p: [number, number]) => onHingeLine(p) || back(p) > HINGE_X + 1e-12;
    const next = (i: number) => itemAt(pts, (i + 1) % pts.length);
    const flapEdges = [...pts.keys()].filter((i) => onFlapVertex(itemAt(pts, i)) && onFlapVertex(next(i)) && !(onHingeLine(itemAt(pts, i)) && onHingeLine(next(i))));
    expect(flapEdges.length).toBe(2);
    const h = integrate(pts, (i) => pOfEdge.get(i)!, scale, hinge, flapEdges);
    expectCloseRel(loads.perSpan.hingeMomentNMPerM!, -h.mz, 1e-9);
  });

  it('the flap chord and the coefficients do not shrink with the deflection (0.25 c at every δ, not 0.2538 c at 20°)', () => {
    for (const deflectionDeg of [-20, -10, 10, 20, 30]) {
      const analysis = analyseSketch(fin(deflectionDeg), { waves: false });
      expect(analysis.flap!.flapChordOverC).toBe(0.25);
      expect(analysis.result!.geometry.reference).toEqual({ chord: 1, leadingEdge: [0, 0], source: 'input' });
      // The outline's own chord is shorter: 0.75 + 0.25·cos δ.
      expectClose(analysis.result!.geometry.chord, 0.75 + 0.25 * Math.cos((deflectionDeg * Math.PI) / 180), 1e-12);
    }
  });
});
