import type { SketchOpDraft } from './ops.ts';
import type { XY } from './polygon.ts';
import { fromChordAxes, sectionShape, sectionSurfaces, surfaceYAt, toChordAxes, type SectionShape } from './sectionShape.ts';
import type { Point } from './sketch.ts';
import { firstItem, itemAt, lastItem } from '../util/invariant.ts';

/**
 * Section commands: the whole-section changes an engineer makes by number rather than by
 * dragging. Each is a pure function (points in, points out, inputs never mutated) that either
 * returns the new outline or says in one sentence why it cannot; `sectionCommandOp` turns the
 * outline into an ordinary edit op, so a command syncs, undoes and persists like any edit.
 * Conventions are those of `sectionShape`: nose = min x, tail = max x, surfaces nose → tail;
 * thickness, mean line, camber and ridge in chord-line axes (s along the line from nose to tail,
 * n normal to it; x and y for a section drawn level), positions as s/L.
 *
 * Invariants (tests cite them):
 * - [SC1] Commands that keep the vertex count keep every vertex's index (vertex i is moved,
 *   never renumbered), so selections and a colleague's concurrent vertex edits still fit.
 * - [SC2] Nose and tail stay where they are, except for normalise and rotate, which move the
 *   whole section rigidly (and normalise scales it).
 * - [SC3] Thickness commands keep the mean line at every vertex; the ridge command keeps
 *   every vertex's distance from the chord line; camber keeps the thickness at every vertex.
 *   "At a vertex" uses the other surface interpolated at its s, so these hold exactly where
 *   both surfaces have vertices at the same s and to within the facets' straightness elsewhere.
 */

export type CommandResult = { ok: true; points: Point[] } | { ok: false; reason: string };

const DEG = Math.PI / 180;

/** Drops binary noise (0.025·1.6 = 0.04000000000000001) at 12 significant digits. */
function tidy(v: number): number {
  const r = Number(v.toPrecision(12));
  return r === 0 ? 0 : r;
}

const tidyPoint = (x: number, y: number): Point => [tidy(x), tidy(y)];

function fail(reason: string): CommandResult {
  return { ok: false, reason };
}

/** Surfaces for the commands that need "the other surface at x", or why not. */
function monotoneShape(points: readonly XY[], what: string): SectionShape | string {
  if (points.length < 3) return `${what} needs a section of at least 3 vertices.`;
  const shape = sectionShape(points);
  if (!(shape.frame.length > 0)) return `${what} needs a section with a chord (its nose and tail are one point).`;
  if (!shape.monotone) return `${what} needs each surface to run from nose to tail without turning back; this outline doubles back along its chord line.`;
  return shape;
}

/**
 * Moves every surface vertex to `mean + k·(n − mean)` in chord-line axes, where `mean` is
 * halfway between the vertex and the other surface at its s: the half-thickness at each vertex
 * is scaled by k about the mean line [SC3]. Nose and tail (zero thickness) stay.
 */
function scaleAboutMeanLine(points: readonly XY[], shape: SectionShape, k: number): Point[] {
  return moveNormal(points, shape, (n, other) => {
    const mean = (n + other) / 2;
    return mean + k * (n - mean);
  });
}

/**
 * Each surface vertex but the nose and tail moved along n (chord-line axes) to `to(n, other, s)`,
 * `other` being the other surface's n at the vertex's s.
 */
function moveNormal(points: readonly XY[], shape: SectionShape, to: (n: number, other: number, s: number) => number): Point[] {
  const out = points.map(([x, y]) => [x, y] as Point);
  const move = (own: SectionShape['alongUpper'], other: SectionShape['alongUpper']) => {
    for (let j = 1; j < own.vertices.length - 1; j++) {
      // xs, ys and vertices are parallel lists of one surface.
      const sAt = itemAt(own.xs, j);
      const p = fromChordAxes(shape.frame, [sAt, to(itemAt(own.ys, j), surfaceYAt(other, sAt), sAt)]);
      out[itemAt(own.vertices, j)] = tidyPoint(p[0], p[1]);
    }
  };
  move(shape.alongUpper, shape.alongLower);
  move(shape.alongLower, shape.alongUpper);
  return out;
}

/**
 * Scales the thickness by `factor` about the mean line (1.2 = 20 % thicker). Exact at every
 * vertex where both surfaces have a vertex at the same x; elsewhere the other surface is
 * interpolated, so the thickness ratio changes by `factor` to within the facets' straightness.
 */
export function scaleThickness(points: readonly XY[], factor: number): CommandResult {
  if (!Number.isFinite(factor) || factor <= 0) return fail('The thickness factor must be a positive number.');
  if (factor > 100) return fail('The thickness factor must be at most 100.');
  const shape = monotoneShape(points, 'Scaling the thickness');
  if (typeof shape === 'string') return fail(shape);
  return { ok: true, points: scaleAboutMeanLine(points, shape, factor) };
}

/**
 * Sets the largest thickness over chord to `ratio` (0.05 = 5 %) by scaling the thickness about
 * the mean line: the scale factor k is found so that the new maximum is exactly `ratio`. The
 * thickness at each vertex x is affine and increasing in k, so the maximum is increasing in k
 * and bisection finds it; a section whose surfaces share their vertex x positions needs no
 * search (k = ratio / current).
 */
export function setThicknessRatio(points: readonly XY[], ratio: number): CommandResult {
  if (!Number.isFinite(ratio) || ratio <= 0) return fail('The thickness ratio must be above 0 %.');
  if (ratio > 1) return fail('The thickness ratio must be at most 100 %.');
  const shape = monotoneShape(points, 'Setting the thickness ratio');
  if (typeof shape === 'string') return fail(shape);
  if (!(shape.thicknessRatio > 0)) return fail('The section has no thickness to scale.');
  const at = (k: number) => {
    const next = scaleAboutMeanLine(points, shape, k);
    return { next, ratio: sectionShape(next).thicknessRatio };
  };
  const tol = 1e-10 * ratio;
  let guess = at(ratio / shape.thicknessRatio);
  if (Math.abs(guess.ratio - ratio) <= tol) return { ok: true, points: guess.next };
  let lo = 0;
  let hi = ratio / shape.thicknessRatio;
  while (at(hi).ratio < ratio && hi < 1e6) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-15 * hi; i++) {
    const mid = (lo + hi) / 2;
    if (at(mid).ratio < ratio) lo = mid;
    else hi = mid;
  }
  guess = at(hi);
  return { ok: true, points: guess.next };
}

/**
 * Moves the ridge (the thickest point) to `xOverC` from the nose by stretching s piecewise
 * linearly: [nose, ridge] onto [nose, new ridge] and [ridge, tail] onto [new ridge, tail]. Every
 * vertex keeps its n [SC3], so the thickness distribution moves with the ridge and the maximum
 * thickness keeps its value.
 */
export function moveRidge(points: readonly XY[], xOverC: number): CommandResult {
  if (!Number.isFinite(xOverC) || xOverC <= 0 || xOverC >= 1) return fail('The ridge position must be between the nose and the tail (above 0 and below 1 x/c).');
  const shape = monotoneShape(points, 'Moving the ridge');
  if (typeof shape === 'string') return fail(shape);
  const L = shape.frame.length;
  const from = (shape.ridgeXOverC ?? 0) * L;
  if (!(from > 0) || !(from < L)) return fail('The thickest point is at the nose or the tail; there is no ridge to move.');
  // A blunt nose or base (a face across the flow) that is the thickest part leaves no ridge either.
  const tie = 1e-9 * shape.chord;
  const onFace = points.some(([x, y]) => (x <= shape.minX + tie || x >= shape.maxX - tie) && Math.abs(toChordAxes(shape.frame, [x, y])[0] - from) <= 1e-9 * L);
  if (onFace) return fail('The thickest point is at the nose or the tail; there is no ridge to move.');
  const to = xOverC * L;
  return {
    ok: true,
    points: points.map((p) => {
      const [sAt, n] = toChordAxes(shape.frame, p);
      const moved = sAt <= from ? (sAt * to) / from : to + ((sAt - from) * (L - to)) / (L - from);
      const q = fromChordAxes(shape.frame, [moved, n]);
      return tidyPoint(q[0], q[1]);
    }),
  };
}

export type MirrorSide = 'upper' | 'lower';

/**
 * Makes the section symmetric about its chord line (nose → tail) by replacing one surface with
 * the mirror image of the other (`from` is the surface kept). The vertex count may change: the
 * result lists nose, the upper surface, tail, then the lower surface back to the nose.
 */
export function mirrorSurface(points: readonly XY[], from: MirrorSide): CommandResult {
  if (points.length < 3) return fail('Mirroring needs a section of at least 3 vertices.');
  const s = sectionSurfaces(points);
  if (!(s.chord > 0)) return fail('Mirroring needs a section with a chord.');
  if (s.blunt) return fail('Mirroring needs a sharp nose and tail (one vertex each); this section has a vertical face there.');
  const kept = from === 'upper' ? s.upper : s.lower;
  if (kept.vertices.length < 3) return fail(`The ${from} surface is a single facet; its mirror image would enclose no area.`);
  const [nx, ny] = s.nose;
  const dx = s.tail[0] - nx;
  const dy = s.tail[1] - ny;
  const len2 = dx * dx + dy * dy;
  // Reflection about the line through the nose along (dx, dy).
  const reflect = (x: number, y: number): Point => {
    const px = x - nx;
    const py = y - ny;
    const along = (px * dx + py * dy) / len2;
    return tidyPoint(nx + 2 * along * dx - px, ny + 2 * along * dy - py);
  };
  const keptPoints = kept.vertices.map((i) => [...itemAt(points, i)] as Point);
  const interior = keptPoints.slice(1, -1);
  const mirrored = interior.map(([x, y]) => reflect(x, y));
  const upper = from === 'upper' ? keptPoints : [firstItem(keptPoints), ...mirrored, lastItem(keptPoints)];
  const lower = from === 'upper' ? mirrored : interior;
  return { ok: true, points: [...upper, ...[...lower].reverse()] };
}

/**
 * Mean line of the NACA four-digit sections: two parabolic arcs meeting with a horizontal
 * tangent at their peak `camber` (fraction of chord) at `xOverC`. ξ = x/c from the nose.
 * Source: NACA Report 460 (Jacobs, Ward & Pinkerton, 1933), mean-line equations (from memory).
 */
export function fourDigitMeanLine(xi: number, camber: number, xOverC: number): number {
  if (camber === 0) return 0;
  if (xi <= xOverC) return (camber / (xOverC * xOverC)) * (2 * xOverC * xi - xi * xi);
  const q = 1 - xOverC;
  return (camber / (q * q)) * (1 - 2 * xOverC + 2 * xOverC * xi - xi * xi);
}

/**
 * Replaces the mean line with a four-digit mean line of the given largest camber (fraction of
 * the chord line's length, signed: positive up for a level section) at `xOverC`, keeping the
 * thickness at every vertex [SC3]: each surface vertex moves normal to the chord line by (new
 * mean line − present mean line) at its s. Camber 0 makes the section symmetric about its chord
 * line.
 */
export function setCamber(points: readonly XY[], camber: number, xOverC: number): CommandResult {
  if (!Number.isFinite(camber) || Math.abs(camber) > 0.2) return fail('The camber must be from −20 % to 20 % of the chord.');
  if (!Number.isFinite(xOverC) || xOverC <= 0 || xOverC >= 1) return fail('The position of largest camber must be above 0 and below 1 x/c.');
  const shape = monotoneShape(points, 'Setting the camber');
  if (typeof shape === 'string') return fail(shape);
  const L = shape.frame.length;
  // The chord line is n = 0, so the new mean line is the four-digit line itself.
  const points2 = moveNormal(points, shape, (n, other, sAt) => n + L * fourDigitMeanLine(Math.min(1, Math.max(0, sAt / L)), camber, xOverC) - (n + other) / 2);
  return { ok: true, points: points2 };
}

/**
 * Rotates the section rigidly about `pivot` by `angleDeg`, positive nose up (clockwise in body
 * axes, x aft and y up, with the nose on the left).
 */
export function rotateSection(points: readonly XY[], angleDeg: number, pivot: XY): CommandResult {
  if (!Number.isFinite(angleDeg) || Math.abs(angleDeg) > 180) return fail('The angle must be from −180° to 180°.');
  if (!Number.isFinite(pivot[0]) || !Number.isFinite(pivot[1])) return fail('The pivot needs two numbers (x, y).');
  const c = Math.cos(angleDeg * DEG);
  const s = Math.sin(angleDeg * DEG);
  const [px, py] = pivot;
  return {
    ok: true,
    points: points.map(([x, y]) => {
      const dx = x - px;
      const dy = y - py;
      return tidyPoint(px + dx * c + dy * s, py - dx * s + dy * c);
    }),
  };
}

/**
 * Normalises to unit chord: (optionally) levels the chord line by rotating about the nose until
 * the tail is at the nose's height, moves the nose to (0, 0) and scales uniformly so that the
 * chord is 1. Shape, t/c and camber ratio are unchanged.
 */
export function normaliseSection(points: readonly XY[], options: { level: boolean } = { level: true }): CommandResult {
  if (points.length < 3) return fail('Normalising needs a section of at least 3 vertices.');
  let pts: readonly XY[] = points;
  if (options.level) {
    const s = sectionSurfaces(pts);
    const angle = Math.atan2(s.tail[1] - s.nose[1], s.tail[0] - s.nose[0]);
    // A tail above the nose is a nose-down chord line: rotate nose up by that angle.
    if (angle !== 0) {
      const r = rotateSection(pts, angle / DEG, s.nose);
      if (!r.ok) return r;
      pts = r.points;
    }
  }
  const s = sectionSurfaces(pts);
  if (!(s.chord > 0)) return fail('Normalising needs a section with a chord (its vertices all share one x).');
  const [nx, ny] = s.nose;
  return { ok: true, points: pts.map(([x, y]) => tidyPoint((x - nx) / s.chord, (y - ny) / s.chord)) };
}

/**
 * The edit op that turns `before` into `after`: `moveVertices` of the vertices that moved when
 * the count is kept [SC1], else `replaceSection`; null when nothing changed.
 */
export function sectionCommandOp(before: readonly XY[], after: readonly Point[]): SketchOpDraft | null {
  if (before.length !== after.length) return { type: 'replaceSection', points: after.map((p) => [p[0], p[1]] as Point) };
  const indices: number[] = [];
  const to: Point[] = [];
  after.forEach((p, i) => {
    const [x, y] = itemAt(before, i); // same length, checked above
    if (p[0] !== x || p[1] !== y) {
      indices.push(i);
      to.push([p[0], p[1]]);
    }
  });
  return indices.length === 0 ? null : { type: 'moveVertices', indices, to };
}
