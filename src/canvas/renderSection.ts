import type { Point } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import {
  HOVER,
  SECTION_FILL,
  SECTION_INVALID,
  SECTION_OUTLINE,
  UNSOLVED_FACET,
  VERTEX_FILL,
  VERTEX_SELECTED,
  pressureColour,
  pressureColourAt,
  pressureT,
  type PressureDomain,
} from './colors';
import type { Dot, DrawList, StrokePath } from './drawPaths';
import type { LayerSettings } from './layers';
import { itemAt, present } from '@shared/util/invariant';
import { toScreen, type View } from './view';

/** Facet stroke width when shaded by Cp, pixels. */
export const FACET_CP_WIDTH_PX = 4;
export const VERTEX_RADIUS_PX = 3.5;
export const SELECTED_RADIUS_PX = 5;

export interface SectionRenderOptions {
  selection: readonly number[];
  /** The section as drawn is not a simple polygon (outline in the warning colour). */
  invalid: boolean;
  hoverVertex: number | null;
  hoverFacet: number | null;
  /** Vertices get dots (off while moving the whole section, for instance). */
  showVertices: boolean;
  /**
   * The outline the solver saw when it differs from the drawn one (a deflected flap): drawn
   * dashed, and the facets are shaded along it.
   */
  solvedPoints?: readonly Point[] | null;
  /** The flap's hinge (drawn as a ring with a cross) when the sketch has a flap. */
  hinge?: Point | null;
  /**
   * A drag's detail ([DR7]): vertex dots at least VERTEX_GAP_DRAG_PX apart along the outline
   * (the selected and hovered vertices, the `keepVertex` and its two neighbours always), and the
   * Cp shading stroked as one line per run of facets of one colour.
   */
  drag?: { keepVertex: number | null } | null;
}

/**
 * During a drag ([DR7]) a vertex dot is left out when it lies within this many pixels of the
 * last dot drawn along the outline: a 200-vertex arc at the usual zoom puts dots ~4 px apart,
 * overlapping into a bead chain that costs the software rasteriser ~0.6 ms a move.
 */
export const VERTEX_GAP_DRAG_PX = 12;
/**
 * During a drag the Cp shading takes one of this many colours of the scale (at rest: 256), so
 * that neighbouring facets of nearly one pressure make one run to stroke ([DR7]).
 */
export const CP_DRAG_STEPS = 24;

const HINGE_RADIUS_PX = 6;
const HINGE_COLOUR = '#f1e6d2';

function sameOutline(a: readonly Point[], b: readonly Point[]): boolean {
  return a.length === b.length && a.every((p, i) => {
    const q = present(b[i], i, b);
    return p[0] === q[0] && p[1] === q[1];
  });
}

/**
 * p/p∞ per facet index (input edge i → i+1), when `result` solved a section with as many
 * facets as `pointCount`; otherwise null (the result is for another outline).
 */
export function facetPressures(result: SolveResult | null, pointCount: number): (number | null)[] | null {
  if (!result) return null;
  const facets = [...result.surfaces.upper, ...result.surfaces.lower];
  if (facets.length !== pointCount) return null;
  const out: (number | null)[] = new Array(pointCount).fill(null);
  for (const f of facets) if (f.index >= 0 && f.index < pointCount) out[f.index] = f.solved ? f.pRatio : null;
  return out;
}

/**
 * The section: a filled body, each facet stroked in the colour of its pressure (or neutral
 * when unsolved or shading is off), vertices as dots with the selection highlighted.
 */
export function renderSection(points: readonly Point[], result: SolveResult | null, view: View, layers: LayerSettings, domain: PressureDomain, options: SectionRenderOptions): DrawList {
  const n = points.length;
  const paths: StrokePath[] = [];
  const dots: Dot[] = [];
  if (n === 0) return { paths, dots };
  const screen = points.map((p) => toScreen(view, p));
  const flat = screen.flat();
  paths.push({ points: flat, colour: options.invalid ? SECTION_INVALID : SECTION_OUTLINE, width: 1, closed: true, fill: SECTION_FILL, dash: options.invalid ? [4, 3] : undefined });
  const solved = options.solvedPoints && !sameOutline(options.solvedPoints, points) ? options.solvedPoints : null;
  const shaded = solved ? solved.map((p) => toScreen(view, p)) : screen;
  if (solved) paths.push({ points: shaded.flat(), colour: SECTION_OUTLINE, width: 1, dash: [5, 4], closed: true, alpha: 0.8 });
  const m = shaded.length;
  const pressures = layers.surfaceCp && !options.invalid ? facetPressures(result, m) : null;
  if (pressures && options.drag) paths.push(...cpRuns(shaded, pressures, domain));
  else if (pressures) {
    for (let i = 0; i < m; i++) {
      const a = present(shaded[i], i, shaded);
      const b = present(shaded[(i + 1) % m], (i + 1) % m, shaded);
      const p = present(pressures[i], i, pressures);
      paths.push({
        points: [a[0], a[1], b[0], b[1]],
        colour: p === null ? UNSOLVED_FACET : pressureColour(p, domain),
        width: FACET_CP_WIDTH_PX,
        dash: p === null ? [3, 3] : undefined,
      });
    }
  }
  if (options.hoverFacet !== null && options.hoverFacet < n) {
    const a = itemAt(screen, options.hoverFacet);
    const b = itemAt(screen, (options.hoverFacet + 1) % n);
    paths.push({ points: [a[0], a[1], b[0], b[1]], colour: HOVER, width: 1.5, alpha: 0.9 });
  }
  if (options.hinge) {
    const [hx, hy] = toScreen(view, options.hinge);
    dots.push({ x: hx, y: hy, radius: HINGE_RADIUS_PX, fill: 'rgba(0,0,0,0)', stroke: HINGE_COLOUR, strokeWidth: 1.5 });
    paths.push({ points: [hx - HINGE_RADIUS_PX, hy, hx + HINGE_RADIUS_PX, hy], colour: HINGE_COLOUR, width: 1 });
    paths.push({ points: [hx, hy - HINGE_RADIUS_PX, hx, hy + HINGE_RADIUS_PX], colour: HINGE_COLOUR, width: 1 });
  }
  if (options.showVertices) {
    const selected = new Set(options.selection);
    const keep = options.drag ? options.drag.keepVertex : null;
    // During a drag: the last dot drawn (screen), to leave out the ones crowding it.
    let lastX = Number.NaN;
    let lastY = Number.NaN;
    screen.forEach(([x, y], i) => {
      if (options.drag) {
        const always = selected.has(i) || i === options.hoverVertex || (keep !== null && (i === keep || i === (keep + 1) % n || i === (keep + n - 1) % n));
        if (!always && Math.hypot(x - lastX, y - lastY) < VERTEX_GAP_DRAG_PX) return;
        lastX = x;
        lastY = y;
      }
      if (selected.has(i)) dots.push({ x, y, radius: SELECTED_RADIUS_PX, fill: VERTEX_SELECTED, stroke: '#0b2b2a', strokeWidth: 1.5 });
      else dots.push({ x, y, radius: i === options.hoverVertex ? SELECTED_RADIUS_PX : VERTEX_RADIUS_PX, fill: VERTEX_FILL, stroke: '#0c1418', strokeWidth: 1 });
    });
  }
  return { paths, dots };
}

/**
 * The Cp shading as one line per run of neighbouring facets of one colour (a drag's detail,
 * [DR7]): round joins where the facets of a run meet instead of a round cap at each end of
 * every facet — the same band, a fraction of the strokes to rasterise. Unsolved facets stay
 * dashed, each on its own.
 */
function cpRuns(shaded: readonly (readonly [number, number])[], pressures: readonly (number | null)[], domain: PressureDomain): StrokePath[] {
  const m = shaded.length;
  const out: StrokePath[] = [];
  let run: StrokePath | null = null;
  for (let i = 0; i < m; i++) {
    const a = present(shaded[i], i, shaded);
    const b = present(shaded[(i + 1) % m], (i + 1) % m, shaded);
    const p = present(pressures[i], i, pressures);
    if (p === null) {
      run = null;
      out.push({ points: [a[0], a[1], b[0], b[1]], colour: UNSOLVED_FACET, width: FACET_CP_WIDTH_PX, dash: [3, 3] });
      continue;
    }
    const colour = pressureColourAt(Math.round(Math.min(1, Math.max(0, pressureT(p, domain))) * CP_DRAG_STEPS) / CP_DRAG_STEPS);
    if (run && run.colour === colour) run.points.push(b[0], b[1]);
    else {
      run = { points: [a[0], a[1], b[0], b[1]], colour, width: FACET_CP_WIDTH_PX };
      out.push(run);
    }
  }
  return out;
}
