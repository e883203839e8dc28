/**
 * Property tests (fast-check) of the solver's geometry — `splitSurfaces`, `maxThicknessRatio`,
 * `facetDeflections` — against plain reference implementations written here the obvious way
 * (every facet's angle from its own atan2, the surfaces by walking the index modulo n, the
 * thickness by intersecting the polygon with a line normal to the chord line at every vertex).
 * The solver computes the same quantities another way (turns accumulated nose → tail, one sweep
 * per surface), so these checks are independent of its shortcuts. The polygons cover both
 * vertex orders, every starting index (the chains wrap past index 0), odd and even facet
 * counts down to one facet, concave sections and rotated chord lines.
 *
 * Source: common practice (facet angle atan2(dy, dx); shoelace orientation; thickness measured
 * normal to the chord line).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isSimplePolygon } from '../../../shared/model/polygon';
import { facetDeflections } from '../../../shared/solver/facetDeflections';
import { maxThicknessRatio } from '../../../shared/solver/maxThicknessRatio';
import { splitSurfaces } from '../../../shared/solver/splitSurfaces';
import { itemAt } from '../../../shared/util/invariant.ts';
import { expectClose } from '../../helpers/expectClose';
import { reached } from '../../helpers/reached';

type Pts = [number, number][];

/** Star-shaped polygon around the origin (simple; convex or concave; any vertex count ≥ 3). */
const starPolygon = fc
  .array(fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0.15, max: 1, noNaN: true })), {
    minLength: 3,
    maxLength: 40,
  })
  .map((raw) =>
    raw.map(([a, r], i): [number, number] => {
      const angle = (2 * Math.PI * (i + 0.1 + 0.8 * a)) / raw.length;
      return [r * Math.cos(angle), 0.4 * r * Math.sin(angle)];
    }),
  );

/** Lens-like section: both surfaces run monotonically in x, 1 to 60 facets each. */
const lensSection = fc
  .record({
    xu: fc.uniqueArray(fc.integer({ min: 1, max: 999 }), { maxLength: 59 }),
    xl: fc.uniqueArray(fc.integer({ min: 1, max: 999 }), { maxLength: 59 }),
    thickness: fc.double({ min: 0.005, max: 0.3, noNaN: true }),
    camber: fc.double({ min: -0.05, max: 0.05, noNaN: true }),
    tailY: fc.double({ min: -0.05, max: 0.05, noNaN: true }),
  })
  .filter(({ xu, xl }) => xu.length + xl.length > 0)
  .map(({ xu, xl, thickness, camber, tailY }) => {
    const y = (x: number, side: 1 | -1) => camber * 4 * x * (1 - x) + tailY * x + side * thickness * 2 * x * (1 - x);
    const upper = [...xu].sort((a, b) => a - b).map((i): [number, number] => [i / 1000, y(i / 1000, 1)]);
    const lower = [...xl].sort((a, b) => b - a).map((i): [number, number] => [i / 1000, y(i / 1000, -1)]);
    return [[0, 0] as [number, number], ...upper, [1, tailY] as [number, number], ...lower];
  });

/** Any of them, rotated (up to ±60°), possibly reversed, starting at any vertex. */
const section = fc
  .record({
    base: fc.oneof(starPolygon, lensSection),
    angle: fc.double({ min: -Math.PI / 3, max: Math.PI / 3, noNaN: true }),
    reverse: fc.boolean(),
    start: fc.nat(),
  })
  .map(({ base, angle, reverse, start }) => {
    const c = Math.cos(angle);
    const s = Math.sin(angle);
    const turned = base.map(([x, y]): [number, number] => [x * c - y * s, x * s + y * c]);
    const ordered = reverse ? turned.reverse() : turned;
    const k = start % ordered.length;
    return [...ordered.slice(k), ...ordered.slice(0, k)];
  })
  .filter((p) => isSimplePolygon(p));

/** Reference nose and tail: least x (then least y); greatest x (then least y). */
function ends(points: Pts): { nose: number; tail: number } {
  let nose = 0;
  let tail = 0;
  points.forEach(([x, y], i) => {
    const [nx, ny] = itemAt(points, nose);
    const [tx, ty] = itemAt(points, tail);
    if (x < nx || (x === nx && y < ny)) nose = i;
    if (x > tx || (x === tx && y < ty)) tail = i;
  });
  return { nose, tail };
}

/** Whether either end has an edge within 1e-6 rad of vertical (a blunt end: left out here). */
function nearlyBlunt(points: Pts, nose: number, tail: number): boolean {
  const n = points.length;
  return [nose, tail].some((v) =>
    [v - 1, v + 1].some((w) => {
      const [ax, ay] = itemAt(points, v);
      const [bx, by] = itemAt(points, (w + n) % n);
      return Math.abs(bx - ax) <= 1e-6 * Math.abs(by - ay);
    }),
  );
}

/** Reference chain: vertex indices walking from `from` to `to` by `step`, modulo n. */
function walk(n: number, from: number, to: number, step: 1 | -1): number[] {
  const out = [from];
  for (let i = from; i !== to; ) {
    i = (i + step + n) % n;
    out.push(i);
  }
  return out;
}

/** The angle a − b brought into (−π, π]. */
function angleBetween(a: number, b: number): number {
  let d = (a - b) % (2 * Math.PI);
  if (d > Math.PI) d -= 2 * Math.PI;
  if (d <= -Math.PI) d += 2 * Math.PI;
  return d;
}

/** Twice the signed area (shoelace): > 0 for counter-clockwise vertices. */
function twiceArea(points: Pts): number {
  return points.reduce((sum, [x, y], i) => {
    const [qx, qy] = itemAt(points, (i + 1) % points.length);
    return sum + x * qy - qx * y;
  }, 0);
}

/**
 * Reference thickness: at every vertex, the polygon's extent normal to the chord line (all its
 * crossings with the line normal to the chord line there), the largest over the chord length.
 */
function thicknessByCrossings(points: Pts, nose: number, tail: number): number {
  const [x0, y0] = itemAt(points, nose);
  const [x1, y1] = itemAt(points, tail);
  const length = Math.hypot(x1 - x0, y1 - y0);
  const cx = (x1 - x0) / length;
  const cy = (y1 - y0) / length;
  const local = points.map(([x, y]): [number, number] => [(x - x0) * cx + (y - y0) * cy, -(x - x0) * cy + (y - y0) * cx]);
  let best = 0;
  for (const [s] of local) {
    const ns: number[] = [];
    local.forEach(([sa, na], i) => {
      const [sb, nb] = itemAt(local, (i + 1) % local.length);
      if (s < Math.min(sa, sb) || s > Math.max(sa, sb)) return;
      if (sa === sb) ns.push(na, nb);
      else ns.push(na + ((s - sa) / (sb - sa)) * (nb - na));
    });
    best = Math.max(best, Math.max(...ns) - Math.min(...ns));
  }
  return best / length;
}

describe('geometry against plain reference implementations', () => {
  it('splitSurfaces: nose, tail, both chains walked modulo n, facet angles, turns and lengths; reversing the vertex order changes no number', () => {
    const cases = reached('splitSurfaces: sharp sections');
    const wrapped = reached('splitSurfaces: a chain wraps past index 0');
    const oneFacet = reached('splitSurfaces: a one-facet surface');
    const oddAndEven = { odd: reached('splitSurfaces: odd facet count'), even: reached('splitSurfaces: even facet count') };
    fc.assert(
      fc.property(section, (points) => {
        const n = points.length;
        const { nose, tail } = ends(points);
        if (nearlyBlunt(points, nose, tail)) return;
        cases.hit();
        const split = splitSurfaces(points);
        expect([split.noseIndex, split.tailIndex, split.bluntNose, split.bluntTail]).toEqual([nose, tail, null, null]);
        const ccw = twiceArea(points) > 0;
        // Counter-clockwise, the top runs from the nose backward in index order.
        const expected = { upper: walk(n, nose, tail, ccw ? -1 : 1), lower: walk(n, nose, tail, ccw ? 1 : -1) };
        for (const name of ['upper', 'lower'] as const) {
          const c = split[name];
          const vs = expected[name];
          const forward = vs.length < 2 || (itemAt(vs, 0) + 1) % n === itemAt(vs, 1);
          expect(c.vertices).toEqual(vs);
          expect(c.xs).toEqual(vs.map((v) => itemAt(points, v)[0]));
          expect(c.ys).toEqual(vs.map((v) => itemAt(points, v)[1]));
          const m = vs.length - 1;
          (m % 2 ? oddAndEven.odd : oddAndEven.even).hit();
          if (m === 1) oneFacet.hit();
          if (vs.some((v, k) => k > 0 && Math.abs(v - itemAt(vs, k - 1)) > 1)) wrapped.hit();
          expect([c.edges.length, c.phi.length, c.turn.length, c.length.length]).toEqual([m, m, m, m]);
          expect(c.turn[0]).toBe(0);
          for (let k = 0; k < m; k++) {
            const [ax, ay] = itemAt(points, itemAt(vs, k));
            const [bx, by] = itemAt(points, itemAt(vs, k + 1));
            // Edge i runs points[i] → points[i + 1 mod n].
            expect(itemAt(c.edges, k)).toBe(forward ? itemAt(vs, k) : itemAt(vs, k + 1));
            expectClose(itemAt(c.length, k), Math.hypot(bx - ax, by - ay), 1e-15 * Math.hypot(bx - ax, by - ay));
            const phi = Math.atan2(by - ay, bx - ax);
            expectClose(angleBetween(itemAt(c.phi, k), phi), 0, 1e-12);
            expect(itemAt(c.phi, k)).toBeGreaterThan(-Math.PI);
            expect(itemAt(c.phi, k)).toBeLessThanOrEqual(Math.PI);
            if (k > 0) expectClose(itemAt(c.turn, k), angleBetween(itemAt(c.phi, k), itemAt(c.phi, k - 1)), 1e-12);
          }
        }
        // [S1]: the reversed order gives the same chains, every number bit for bit, with
        // vertex i renamed n − 1 − i.
        const back = splitSurfaces([...points].reverse());
        for (const name of ['upper', 'lower'] as const) {
          expect(back[name].vertices).toEqual(split[name].vertices.map((v) => n - 1 - v));
          for (const key of ['xs', 'ys', 'phi', 'turn', 'length'] as const) expect(back[name][key]).toStrictEqual(split[name][key]);
        }
      }),
      { numRuns: 600 },
    );
    cases.expectAtLeast(400);
    wrapped.expectAtLeast(100);
    oneFacet.expectAtLeast(20);
    oddAndEven.odd.expectAtLeast(100);
    oddAndEven.even.expectAtLeast(100);
  });

  it('maxThicknessRatio equals the largest extent normal to the chord line at the vertices, over the chord length (sweep and general path)', () => {
    const monotone = reached('maxThicknessRatio: both chains monotone along the chord line (sweep)');
    const general = reached('maxThicknessRatio: a chain doubles back (general path)');
    fc.assert(
      fc.property(section, (points) => {
        const split = splitSurfaces(points);
        const { nose, tail } = ends(points);
        if (split.bluntNose || split.bluntTail || nearlyBlunt(points, nose, tail)) return;
        const [x0, y0] = itemAt(points, nose);
        const [x1, y1] = itemAt(points, tail);
        const along = (c: { xs: number[]; ys: number[] }) => c.xs.map((x, i) => (x - x0) * (x1 - x0) + (itemAt(c.ys, i) - y0) * (y1 - y0));
        const runsOn = (s: number[]) => s.every((v, i) => i === 0 || v >= itemAt(s, i - 1));
        (runsOn(along(split.upper)) && runsOn(along(split.lower)) ? monotone : general).hit();
        expectClose(maxThicknessRatio(split.upper, split.lower), thicknessByCrossings(points, nose, tail), 1e-12);
      }),
      { numRuns: 600 },
    );
    monotone.expectAtLeast(200);
    general.expectAtLeast(50);
  });

  it('facetDeflections: θ = φ − α on the upper surface and α − φ on the lower (mod 2π), facet by facet', () => {
    const cases = reached('facetDeflections');
    fc.assert(
      fc.property(section, fc.double({ min: -0.5, max: 0.5, noNaN: true }), (points, alpha) => {
        const split = splitSurfaces(points);
        cases.hit();
        for (const [name, sign] of [
          ['upper', 1],
          ['lower', -1],
        ] as const) {
          const c = split[name];
          const theta = facetDeflections(c, alpha, name);
          expect(theta.length).toBe(c.phi.length);
          theta.forEach((t, k) => expectClose(angleBetween(t, sign * (itemAt(c.phi, k) - alpha)), 0, 1e-12));
        }
      }),
      { numRuns: 300 },
    );
    cases.expectAtLeast(300);
  });
});

