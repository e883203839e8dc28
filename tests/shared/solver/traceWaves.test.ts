import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../helpers/expectClose';
import { reached } from '../../helpers/reached';
import { itemAt, lastItem } from '../../../shared/util/invariant';
import { isSimplePolygon } from '../../../shared/model/polygon';
import { machAngle } from '../../../shared/solver/machAngle';
import { solveSection } from '../../../shared/solver/solveSection';
import type { Point, SolveResult, Wave } from '../../../shared/solver/types';
import { rad, shockState } from './independentRelations';
import { diamond, input, lens } from './sections';

const deg = (r: number) => (r * 180) / Math.PI;

/** All drawn straight pieces along the paths: [waveId, from, to]. */
function segments(r: SolveResult): [string, Point, Point][] {
  const out: [string, Point, Point][] = [];
  for (const w of r.waves) {
    const paths = w.rays ? w.rays.map((ray) => ray.path) : [w.path];
    for (const p of paths) for (let k = 0; k + 1 < p.length; k++) out.push([w.id, itemAt(p, k), itemAt(p, k + 1)]);
  }
  return out;
}

/** Proper crossing of two segments (interiors cross, not merely touching at an end). */
function crossesInside(a: Point, b: Point, c: Point, d: Point): boolean {
  const o = (p: Point, q: Point, r: Point) => (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]);
  const scale = Math.hypot(b[0] - a[0], b[1] - a[1]) * Math.hypot(d[0] - c[0], d[1] - c[1]);
  const eps = 1e-9 * scale;
  const d1 = o(a, b, c);
  const d2 = o(a, b, d);
  const d3 = o(c, d, a);
  const d4 = o(c, d, b);
  return ((d1 > eps && d2 < -eps) || (d1 < -eps && d2 > eps)) && ((d3 > eps && d4 < -eps) || (d3 < -eps && d4 > eps));
}

function byId(r: SolveResult, id: string): Wave {
  const w = r.waves.find((x) => x.id === id);
  if (!w) throw new Error(`no wave ${id}`);
  return w;
}

describe('traceWaves (via solveSection)', () => {
  it('diamond t/c 0.1 at M 2, α 0: nose shocks at ±β, ridge fans from ε+μ1 to −ε+μ2, tail shocks and a level slip line', () => {
    const r = solveSection(input(diamond(0.1), 2, 0));
    const eps = Math.atan(0.1);
    const front = shockState(2, eps, 1.4);
    const upperNose = byId(r, 'wave_upper_0');
    expect(upperNose.kind).toBe('shock');
    expectClose(upperNose.angleDeg, deg(front.beta), 1e-8);
    expectClose(upperNose.betaDeg!, deg(front.beta), 1e-8);
    expectClose(byId(r, 'wave_lower_0').angleDeg, -deg(front.beta), 1e-8);
    expectClose(upperNose.pRatioBehind, front.pRatio, 1e-10);
    expect(upperNose.upstream).toEqual({ mach: 2, pRatio: 1 });

    const fan = byId(r, 'wave_upper_1');
    expect(fan.kind).toBe('fan');
    expect(fan.origin).toEqual([0.5, 0.05]);
    const rays = fan.rays!;
    expect(rays).toHaveLength(5);
    expectClose(itemAt(rays, 0).angleDeg, deg(eps + machAngle(front.m2)), 1e-8);
    const m2 = itemAt(r.surfaces.upper, 1).mach!;
    expectClose(itemAt(rays, 4).angleDeg, deg(-eps + machAngle(m2)), 1e-8);
    for (let k = 1; k < rays.length; k++) {
      expect(itemAt(rays, k).pRatio).toBeLessThan(itemAt(rays, k - 1).pRatio);
      expect(itemAt(rays, k).mach).toBeGreaterThan(itemAt(rays, k - 1).mach);
      expect(itemAt(rays, k).angleDeg).toBeLessThan(itemAt(rays, k - 1).angleDeg);
    }
    expectClose(fan.deflectionDeg, -2 * deg(eps), 1e-9);
    expectClose(itemAt(rays, 4).pRatio, fan.pRatioBehind, 1e-15);

    expect(byId(r, 'wave_tail_upper').kind).toBe('shock');
    expectClose(byId(r, 'wave_slip').angleDeg, 0, 1e-12);
    expect(byId(r, 'wave_slip').surface).toBe('trailingEdge');
    expect(byId(r, 'wave_tail_lower').vertex).toBe(2);
  });

  it('a zero first deflection draws a Mach line at α ± μ∞', () => {
    // Flat bottom at α 0: the lower nose wave is a Mach line.
    const r = solveSection(input([[0, 0], [0.5, 0.05], [1, 0]], 2.5, 0));
    const mach = byId(r, `wave_lower_0`);
    expect(mach.kind).toBe('mach');
    expectClose(mach.angleDeg, -deg(machAngle(2.5)), 1e-12);
    expect(mach.deflectionDeg).toBe(0);
  });

  it('[S12] every wave leans away from its surface (upper waves to the left of the flow, lower to the right)', () => {
    const r = solveSection(input(lens(12, 0.08, 0.02), 2.2, 4));
    expect(r.status).toBe('ok');
    for (const w of r.waves) {
      if (w.kind === 'slip') continue;
      const facets = w.surface === 'upper' ? r.surfaces.upper : r.surfaces.lower;
      const k = facets.findIndex((f) => f.from[0] === w.origin[0] && f.from[1] === w.origin[1]);
      const psiDeg = w.id.startsWith('wave_tail') ? lastItem(facets).phiDeg : k <= 0 ? 4 : itemAt(facets, k - 1).phiDeg;
      const lean = w.angleDeg - psiDeg;
      if (w.surface === 'upper') expect(lean).toBeGreaterThan(0);
      else expect(lean).toBeLessThan(0);
    }
  });

  it('[S12] lines end on the field box, the body, or a reported meeting where they were absorbed', () => {
    const pts = lens(16, 0.1, 0.03);
    const r = solveSection(input(pts, 2, 3, { fieldExtentChords: 1 }));
    expect(r.intersections.length).toBeGreaterThan(0);
    // Field box: the section's bounding box grown by 1 chord on every side.
    const ys = pts.map((p) => p[1]);
    const box = { minX: -1, maxX: 2, minY: Math.min(...ys) - 1, maxY: Math.max(...ys) + 1 };
    const onBox = (p: Point) =>
      [p[0] - box.minX, box.maxX - p[0], p[1] - box.minY, box.maxY - p[1]].some((d) => Math.abs(d) < 1e-12);
    for (const [, , end] of segments(r)) {
      expect(end[0]).toBeGreaterThanOrEqual(box.minX - 1e-12);
      expect(end[0]).toBeLessThanOrEqual(box.maxX + 1e-12);
      expect(end[1]).toBeGreaterThanOrEqual(box.minY - 1e-12);
      expect(end[1]).toBeLessThanOrEqual(box.maxY + 1e-12);
    }
    for (const w of r.waves) {
      if (w.endReason === 'wave') {
        expect(r.intersections.some((i) => i.waves.includes(w.id) && Math.hypot(i.at[0] - w.end[0], i.at[1] - w.end[1]) < 1e-12)).toBe(true);
      }
      if (w.endReason === 'field') expect(onBox(w.end)).toBe(true);
    }
    for (const i of r.intersections) expect(i.waves[0]).not.toBe(i.waves[1]);
  });

  it('[S12] drawn lines of different waves cross only where a crossing is reported (random sections, fast-check)', () => {
    const checked = reached('[S12] wave maps');
    const section = fc
      .tuple(fc.integer({ min: 3, max: 14 }), fc.double({ min: 0.02, max: 0.12, noNaN: true }), fc.double({ min: -0.03, max: 0.03, noNaN: true }))
      .map(([m, t, c]) => lens(m, t, c))
      .filter((p) => isSimplePolygon(p));
    fc.assert(
      fc.property(section, fc.double({ min: 1.3, max: 6, noNaN: true }), fc.double({ min: -6, max: 6, noNaN: true }), (pts, mach, alphaDeg) => {
        const r = solveSection(input(pts, mach, alphaDeg));
        const segs = segments(r);
        const crossed = r.intersections.filter((i) => i.kind === 'crossed');
        checked.hit();
        for (let i = 0; i < segs.length; i++) {
          for (let j = i + 1; j < segs.length; j++) {
            const [ia, a, b] = itemAt(segs, i);
            const [ib, c, d] = itemAt(segs, j);
            if (ia === ib || !crossesInside(a, b, c, d)) continue;
            expect(crossed.some((x) => x.waves.includes(ia) && x.waves.includes(ib)), `${ia} × ${ib}`).toBe(true);
          }
        }
      }),
      { numRuns: 100 },
    );
    checked.expectAtLeast(95);
  }, 60_000); // generous: this machine is shared, and the check is O(lines²) per run

  it('a larger field box lets waves that reach it run further (options.fieldExtentChords)', () => {
    const near = solveSection(input(diamond(0.06), 3, 0, { fieldExtentChords: 0.5 }));
    const far = solveSection(input(diamond(0.06), 3, 0, { fieldExtentChords: 4 }));
    const a = byId(near, 'wave_slip');
    const b = byId(far, 'wave_slip');
    expectClose(a.end[0], 1.5, 1e-12);
    expectClose(b.end[0], 5, 1e-12);
  });

  it('a surface whose march stopped has waves only up to its last solved facet, and no tail waves', () => {
    const r = solveSection(input([[0, 0], [0.5, 0.5 * Math.tan(rad(30))], [1, 0], [0.5, -0.02]], 2, 0));
    expect(r.status).toBe('detached');
    expect(r.waves.some((w) => w.surface === 'upper')).toBe(false);
    expect(r.waves.some((w) => w.surface === 'lower')).toBe(true);
    expect(r.waves.some((w) => w.id.startsWith('wave_tail') || w.kind === 'slip')).toBe(false);
  });
});
