import { describe, expect, it } from 'vitest';
import type { Point } from '@shared/model/sketch';
import { parseSolveInput } from '@shared/model/solveInput';
import { solveSection } from '@shared/solver';
import { drawList, HAIRLINE_MAX_PX, type DrawList, type StrokePath } from '@/canvas/drawPaths';
import { CP_DRAG_STEPS, FACET_CP_WIDTH_PX, VERTEX_GAP_DRAG_PX, facetPressures } from '@/canvas/renderSection';
import { pressureColour, pressureColourAt, pressureT } from '@/canvas/colors';
import { DEFAULT_LAYERS } from '@/canvas/layers';
import { readoutLines } from '@/canvas/renderReadout';
import { FIELD_ROW_DRAG_PX, FIELD_ROW_PX } from '@/canvas/renderField';
import { FAN_RAY_GAP_DRAG_PX, WAVE_WIDTH_PX, renderWaves, resultDomain } from '@/canvas/renderWaves';
import { sceneLists, type SceneContent, type SceneState } from '@/canvas/scenePainter';
import { generateSection } from '@shared/model/templates';
import { toScreen } from '@/canvas/view';
import { firstItems, itemAt } from '@shared/util/invariant';

function solve(points: Point[], mach: number, alphaDeg: number) {
  const parsed = parseSolveInput({ section: { points }, flow: { mach, alphaDeg } });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return solveSection(parsed.value);
}

const wedge: [Point, Point, Point, Point] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];
const state: SceneState = {
  size: { width: 900, height: 500 },
  pixelRatio: 1,
  view: { scale: 400, originX: 100, originY: 250 },
  layers: DEFAULT_LAYERS,
  selection: [],
  hoverVertex: null,
  hoverFacet: null,
  showVertices: true,
  marquee: null,
  drawPath: null,
  ghost: null,
  readoutVertex: null,
};

/** A 2D context that records the calls drawList makes. */
function recorder() {
  const calls: { name: string; args: unknown[]; lineWidth?: number }[] = [];
  const ctx: Record<string, unknown> = { lineWidth: 1 };
  for (const name of ['save', 'restore', 'beginPath', 'moveTo', 'lineTo', 'closePath', 'fill', 'stroke', 'setLineDash', 'arc', 'fillRect', 'rect', 'fillText', 'createLinearGradient']) {
    ctx[name] = (...args: unknown[]) => {
      calls.push({ name, args, lineWidth: ctx.lineWidth as number });
      if (name === 'createLinearGradient') return { addColorStop: () => {} };
      return undefined;
    };
  }
  return { ctx: ctx as unknown as CanvasRenderingContext2D, calls };
}

/** A 200-vertex faceted biconvex at Mach 2.5, α 3° (the canvas bench's section). */
function bench200() {
  const section = generateSection('biconvex', { thicknessPercent: 6, facetsPerSide: 100 });
  if (!section.ok) throw new Error('no section');
  const result = solve(section.points, 2.5, 3);
  const content: SceneContent = { points: section.points, result, solvedPoints: section.points, hinge: null, invalid: false };
  return { result, content };
}

describe('scene painter', () => {
  it('[DR1] the scene is grid, wave map, section and marks, with the waves stroked unordered', () => {
    const result = solve(wedge, 2, 2);
    const lists = sceneLists(state, { points: wedge, result, solvedPoints: wedge, hinge: null, invalid: false });
    expect(itemAt(lists, 1).unordered).toBe(true);
    expect(itemAt(lists, 1).paths.length).toBeGreaterThan(0);
    // The section's vertex dots sit on the content's points.
    expect(itemAt(lists, 2).dots.map((d) => [d.x, d.y])).toEqual(wedge.map((p) => toScreen(state.view, p)));
  });

  it('[DR1] the readout is named by vertex and sits beside that vertex of the solved section', () => {
    const result = solve(wedge, 2, 2);
    const content: SceneContent = { points: wedge, result, solvedPoints: wedge, hinge: null, invalid: false };
    const lists = sceneLists({ ...state, readoutVertex: 1 }, content);
    const readout = lists.at(-1)!;
    expect(readout.texts!.map((t) => t.text)).toEqual(['t/c 5.00 %   ridge x/c 0.500', 'x 0.5000   y 0.0250']);
    const [vx, vy] = toScreen(state.view, wedge[1]);
    expect(itemAt(readout.paths, 0).points[0]).toBeGreaterThan(vx);
    expect(itemAt(readout.paths, 0).points[1]).toBeLessThan(vy);
    // A vertex index beyond the section (a stale mark) draws nothing.
    expect(sceneLists({ ...state, readoutVertex: 9 }, content)).toHaveLength(lists.length - 1);
  });

  it('[DR6] a drag\'s detail: the field in rows of FIELD_ROW_DRAG_PX and fan rays at least FAN_RAY_GAP_DRAG_PX apart; the grid and the other waves as in full', () => {
    const { result, content } = bench200();
    const full = sceneLists(state, content);
    const drag = sceneLists(state, content, 'drag');
    // Grid, wave map, section (then the marks).
    const [fullGrid, fullWaves, fullSection] = firstItems(full, 3);
    const [dragGrid, dragWaves, dragSection] = firstItems(drag, 3);
    expect(fullWaves.image!.rowHeight).toBe(FIELD_ROW_PX);
    expect(dragWaves.image!.rowHeight).toBe(FIELD_ROW_DRAG_PX);
    expect(dragWaves.image!.rows).toBe(Math.ceil(fullWaves.image!.rows * (FIELD_ROW_PX / FIELD_ROW_DRAG_PX)));
    const rays = (list: DrawList) => list.paths.filter((p) => p.width === WAVE_WIDTH_PX.fan);
    expect(rays(dragWaves).length).toBeLessThan(rays(fullWaves).length);
    expect(dragWaves.paths.filter((p) => p.width !== WAVE_WIDTH_PX.fan)).toEqual(fullWaves.paths.filter((p) => p.width !== WAVE_WIDTH_PX.fan));
    expect(dragGrid).toEqual(fullGrid);
    // The section's outline and fill, the tool marks and the limit rings as in full ([DR7] for the rest).
    expect(dragSection.paths[0]).toEqual(fullSection.paths[0]);
    expect(drag.slice(3)).toEqual(full.slice(3));
    // The drag's rays are those a full paint draws with the wider gap.
    expect(rays(dragWaves)).toEqual(rays(renderWaves(result, state.view, DEFAULT_LAYERS, resultDomain(result), FAN_RAY_GAP_DRAG_PX)));
  });

  it('[DR7] a drag leaves out the meeting marks, thins the vertex dots (the dragged vertex, its neighbours and the selection always drawn) and shades Cp in runs of one colour', () => {
    const { content } = bench200();
    const dragged = 50;
    const moving: SceneState = { ...state, selection: [dragged, 120], readoutVertex: dragged, hoverVertex: 7 };
    const full = sceneLists(moving, content);
    const drag = sceneLists(moving, content, 'drag');
    const [, fullWaves, fullSection] = firstItems(full, 3);
    const [, dragWaves, dragSection] = firstItems(drag, 3);
    // Meeting marks: there at rest, none while moving.
    expect(fullWaves.dots.length).toBeGreaterThan(100);
    expect(dragWaves.dots).toEqual([]);
    // Vertex dots: every dot drawn is one of the full paint's, fewer of them, none crowding the last one drawn.
    const at = (d: { x: number; y: number }) => `${d.x},${d.y}`;
    const fullDots = new Map(fullSection.dots.map((d) => [at(d), d]));
    expect(dragSection.dots.length).toBeLessThan(fullSection.dots.length / 2);
    for (const d of dragSection.dots) expect(fullDots.get(at(d))).toEqual(d);
    const kept = new Set([dragged - 1, dragged, dragged + 1, 120, 7].map((i) => at(itemAt(fullSection.dots, i))));
    for (const k of kept) expect(dragSection.dots.map(at)).toContain(k);
    let checked = 0;
    dragSection.dots.forEach((d, i) => {
      const before = dragSection.dots[i - 1];
      if (!before || kept.has(at(d))) return;
      expect(Math.hypot(d.x - before.x, d.y - before.y)).toBeGreaterThanOrEqual(VERTEX_GAP_DRAG_PX);
      checked++;
    });
    expect(checked).toBeGreaterThan(10);
    // Cp shading: the runs cover the facets in order, each facet in its pressure's colour on a
    // scale of CP_DRAG_STEPS colours; a fraction of the strokes.
    const segments = (paths: StrokePath[]) => paths.filter((p) => p.width === FACET_CP_WIDTH_PX).flatMap((p) => {
      const out: { at: string; colour: string }[] = [];
      for (let i = 2; i < p.points.length; i += 2) out.push({ at: `${p.points[i - 2]},${p.points[i - 1]},${p.points[i]},${p.points[i + 1]}`, colour: p.colour });
      return out;
    });
    const pressures = facetPressures(content.result, content.points.length)!;
    const domain = resultDomain(content.result);
    const dragFacets = segments(dragSection.paths);
    expect(dragFacets.map((f) => f.at)).toEqual(segments(fullSection.paths).map((f) => f.at));
    expect(dragFacets.map((f) => f.colour)).toEqual(pressures.map((p) => pressureColourAt(Math.round(pressureT(p!, domain) * CP_DRAG_STEPS) / CP_DRAG_STEPS)));
    expect(new Set(dragFacets.map((f) => f.colour)).size).toBeLessThanOrEqual(CP_DRAG_STEPS + 1);
    const runs = dragSection.paths.filter((p) => p.width === FACET_CP_WIDTH_PX);
    expect(runs.length).toBeLessThan(content.points.length / 4);
  });

  it('[DR8] a drag\'s preview painted on a given colour range (the last full paint\'s): waves, facets and the field take their colours from it', () => {
    const { result, content } = bench200();
    const own = resultDomain(result);
    const held = { min: own.min * 1.5, max: own.max / 1.5 };
    const drag = sceneLists(state, content, 'drag', held);
    // (The next field drawn reuses the picture's buffer: keep a copy.)
    const a = itemAt(drag, 1).image!.pixels.slice();
    const ownDrag = sceneLists(state, content, 'drag');
    const shocks = (lists: DrawList[]) => itemAt(lists, 1).paths.filter((p) => p.width === WAVE_WIDTH_PX.shock).map((p) => p.colour);
    // The bow shocks' first segments, coloured by the pressure behind them on each range.
    const bow = result.waves.filter((w) => w.kind === 'shock' && w.pRatioBehindAlong?.length);
    expect(bow.length).toBeGreaterThan(0);
    for (const w of bow) {
      expect(shocks(drag)).toContain(pressureColour(w.pRatioBehindAlong![0]!, held));
      expect(shocks(ownDrag)).toContain(pressureColour(w.pRatioBehindAlong![0]!, own));
    }
    expect(shocks(drag)).not.toEqual(shocks(ownDrag));
    // The facets' Cp shading (a drag's CP_DRAG_STEPS colours) on the held range.
    const pressures = facetPressures(result, content.points.length)!;
    const firstRun = itemAt(drag, 2).paths.find((p) => p.width === FACET_CP_WIDTH_PX)!;
    expect(firstRun.colour).toBe(pressureColourAt(Math.round(Math.min(1, Math.max(0, pressureT(pressures[0]!, held))) * CP_DRAG_STEPS) / CP_DRAG_STEPS));
    // The field picture: the same regions filled, in the held range's colours.
    const b = itemAt(ownDrag, 1).image!.pixels;
    let filled = 0;
    let differ = 0;
    for (let i = 3; i < a.length; i += 4) {
      expect(a[i] === 0).toBe(b[i] === 0);
      if (a[i] !== 0) filled++;
      if (a[i - 3] !== b[i - 3] || a[i - 2] !== b[i - 2] || a[i - 1] !== b[i - 1]) differ++;
    }
    expect(filled).toBeGreaterThan(1000);
    expect(differ).toBeGreaterThan(filled / 2);
  });

  it('an unsolvable section keeps the last waves, drops the limit rings and its facet shading', () => {
    const result = solve([[0, 0], [0.5, 0.06], [1, 0], [0.5, -0.06]], 1.4, 5);
    expect(result.limits.length).toBeGreaterThan(0);
    const crossing: Point[] = [[0, 0], [1, 0.06], [1, 0], [0, 0.06]];
    const withLimits = sceneLists(state, { points: [[0, 0], [0.5, 0.06], [1, 0], [0.5, -0.06]], result, solvedPoints: null, hinge: null, invalid: false });
    const invalid = sceneLists(state, { points: crossing, result, solvedPoints: null, hinge: null, invalid: true });
    expect(withLimits).toHaveLength(5);
    expect(invalid).toHaveLength(4);
    expect(itemAt(invalid, 1).paths.length).toBe(itemAt(withLimits, 1).paths.length);
  });

  it('readoutLines: t/c and ridge of the shown section, then the vertex', () => {
    expect(readoutLines([[0, 0], [0.3, 0.04], [1, 0], [0.3, -0.04]], [0.3, 0.04])).toEqual(['t/c 8.00 %   ridge x/c 0.300', 'x 0.3000   y 0.0400']);
  });
});

describe('drawList', () => {
  it('[DR3] lines up to 1.25 px are stroked 1 px wide; wider lines keep their width', () => {
    const { ctx, calls } = recorder();
    const list: DrawList = {
      paths: [
        { points: [0, 0, 10, 10], colour: '#fff', width: 1.1 },
        { points: [0, 0, 10, 10], colour: '#fff', width: HAIRLINE_MAX_PX + 0.05 },
        { points: [0, 0, 10, 10], colour: '#fff', width: 0.9 },
      ],
      dots: [],
    };
    drawList(ctx, list);
    expect(calls.filter((c) => c.name === 'stroke').map((c) => c.lineWidth)).toEqual([1, 1.3, 0.9]);
  });

  it('[DR3] an unordered list is stroked once per style; filled and closed paths still draw one by one', () => {
    const { ctx, calls } = recorder();
    const list: DrawList = {
      unordered: true,
      paths: [
        { points: [0, 0, 10, 10], colour: '#a00', width: 1.1 },
        { points: [5, 0, 10, 10], colour: '#0a0', width: 1.1 },
        { points: [7, 0, 10, 10], colour: '#a00', width: 1 },
        { points: [0, 0, 1, 0, 1, 1], colour: '#a00', width: 1, closed: true, fill: '#123' },
      ],
      dots: [],
    };
    drawList(ctx, list);
    // Red 1.1 and red 1 are one style (both 1 px); green is another; the closed one on its own.
    expect(calls.filter((c) => c.name === 'stroke')).toHaveLength(3);
    expect(calls.filter((c) => c.name === 'moveTo')).toHaveLength(4);
    expect(calls.filter((c) => c.name === 'fill')).toHaveLength(1);
  });
});
