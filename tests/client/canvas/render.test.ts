import { describe, expect, it } from 'vitest';
import type { Point } from '@shared/model/sketch';
import { parseSolveInput } from '@shared/model/solveInput';
import { solveSection } from '@shared/solver';
import {
  CANVAS_BACKGROUND,
  PRESSURE_SCALE_START,
  UNSOLVED_FACET,
  contrastRatio,
  cpFromPressureRatio,
  pressureColour,
  pressureColourAt,
  pressureDomain,
  pressureRatioFromCp,
  pressureT,
} from '@/canvas/colors';
import { DEFAULT_LAYERS } from '@/canvas/layers';
import { legendModel } from '@/canvas/legend';
import { renderLimits } from '@/canvas/renderLimits';
import { FACET_CP_WIDTH_PX, facetPressures, renderSection } from '@/canvas/renderSection';
import { FAN_RAY_GAP_PX, SLIP_DASH_PX, WAVE_WIDTH_PX, renderWaves, resultDomain, wavePath } from '@/canvas/renderWaves';
import { generateSection } from '@shared/model/templates';
import { facetTooltip, waveTooltip } from '@/canvas/tooltips';
import { toScreen } from '@/canvas/view';
import { expectClose } from '../../helpers/expectClose';
import { itemAt } from '@shared/util/invariant';

function solve(points: Point[], mach: number, alphaDeg: number) {
  const parsed = parseSolveInput({ section: { points }, flow: { mach, alphaDeg } });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return solveSection(parsed.value);
}

const wedge: Point[] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];
const view = { scale: 400, originX: 100, originY: 250 };
const size = { width: 900, height: 500 };
const sectionOptions = { selection: [], invalid: false, hoverVertex: null, hoverFacet: null, showVertices: true };

describe('pressure colours', () => {
  it('[C1] every colour of the scale keeps at least 3:1 contrast with the canvas background', () => {
    for (let i = 0; i <= 100; i++) expect(contrastRatio(pressureColourAt(i / 100), CANVAS_BACKGROUND)).toBeGreaterThanOrEqual(3);
  });

  it('[C1] the cut of the scale is needed: the part below it would fall under 3:1', () => {
    expect(PRESSURE_SCALE_START).toBeGreaterThan(0);
    expect(contrastRatio('#440154', CANVAS_BACKGROUND)).toBeLessThan(3); // viridis(0)
  });

  it('[C2] the domain is the range present in the flow, free stream included, rounded outwards to 0.05 in ln(p/p∞)', () => {
    const d = pressureDomain([0.6, 1.3, 2.1]);
    expect(d.min).toBeLessThanOrEqual(0.6);
    expect(d.min).toBeGreaterThan(0.6 * Math.exp(-0.05));
    expect(d.max).toBeGreaterThanOrEqual(2.1);
    expect(d.max).toBeLessThan(2.1 * Math.exp(0.05));
    expect(pressureT(d.max, d)).toBeCloseTo(1, 12);
    expect(pressureT(d.min, d)).toBeCloseTo(0, 12);
    // Rounded to 0.05 in ln(p/p∞): a small change of the largest pressure keeps the domain.
    expect(pressureDomain([2.1]).max).toBe(pressureDomain([2.11]).max);
  });

  it('Cp and p/p∞ convert both ways (Cp = 2/(γM²)(p/p∞ − 1), definition)', () => {
    expectClose(cpFromPressureRatio(1.5, 2, 1.4), (2 / (1.4 * 4)) * 0.5, 1e-15);
    expectClose(pressureRatioFromCp(cpFromPressureRatio(0.7, 3, 1.3), 3, 1.3), 0.7, 1e-14);
  });

  it('the legend keeps its colours and changes only its tick labels between p/p∞ and Cp', () => {
    const d = pressureDomain([0.5, 2]);
    const p = legendModel(d, 'pressureRatio', 2, 1.4);
    const cp = legendModel(d, 'cp', 2, 1.4);
    expect(cp.stops).toEqual(p.stops);
    // Free stream (mid-scale on this symmetric range) reads 1 in p/p∞ and 0 in Cp.
    expect(p.ticks.find((t) => Math.abs(t.t - 0.5) < 1e-12)?.label).toBe('1');
    expect(cp.ticks.find((t) => Math.abs(t.t - 0.5) < 1e-12)?.label).toBe('0');
    expect(cp.title).toMatch(/^Cp/);
  });
});

describe('wave map renderer', () => {
  const result = solve(wedge, 2, 2);
  const domain = resultDomain(result);

  it('draws each shock, Mach and slip line once and each fan ray, coloured by the pressure behind', () => {
    const list = renderWaves(result, view, DEFAULT_LAYERS, domain);
    const expected = result.waves.reduce((n, w) => n + (w.kind === 'fan' && w.rays?.length ? w.rays.length : 1), 0);
    expect(list.paths).toHaveLength(expected);
    const shock = result.waves.find((w) => w.kind === 'shock')!;
    const drawn = list.paths.find((p) => p.points[2] === toScreen(view, shock.end)[0] && p.points[3] === toScreen(view, shock.end)[1])!;
    expect(drawn.colour).toBe(pressureColour(shock.pRatioBehind, domain));
    expect(drawn.points.slice(0, 2)).toEqual(toScreen(view, shock.origin));
  });

  it('draws the slip line dashed, and only the slip line', () => {
    const list = renderWaves(result, view, DEFAULT_LAYERS, domain);
    const dashed = list.paths.filter((p) => p.dash);
    expect(dashed).toHaveLength(result.waves.filter((w) => w.kind === 'slip').length);
    expect(itemAt(dashed, 0).dash).toEqual(SLIP_DASH_PX);
  });

  it('fan rays closer than FAN_RAY_GAP_PX to a drawn ray of their stream (start within it, end within it of its line) are left out; zoomed in, nearly every ray is drawn', () => {
    const section = generateSection('biconvex', { thicknessPercent: 6, facetsPerSide: 100 });
    if (!section.ok) throw new Error('no section');
    const fine = solve(section.points, 2.5, 3);
    const fineDomain = resultDomain(fine);
    const fans = fine.waves.filter((w) => w.kind === 'fan');
    const rayCount = fans.reduce((n, w) => n + (w.rays?.length ?? 0), 0);
    const others = fine.waves.length - fans.length;
    const distance = (p: number[], a: number[], b: number[], clamp: boolean) => {
      const [dx, dy] = [b[0]! - a[0]!, b[1]! - a[1]!];
      const along = ((p[0]! - a[0]!) * dx + (p[1]! - a[1]!) * dy) / (dx * dx + dy * dy);
      const t = clamp ? Math.min(1, Math.max(0, along)) : along;
      return Math.hypot(p[0]! - (a[0]! + t * dx), p[1]! - (a[1]! + t * dy));
    };
    // At the editor's usual zoom a 200-vertex arc starts a ray about every pixel.
    const list = renderWaves(fine, view, DEFAULT_LAYERS, fineDomain);
    const drawnRays = list.paths.filter((p) => p.width === WAVE_WIDTH_PX.fan);
    expect(drawnRays.length).toBeLessThan(rayCount / 2);
    expect(list.paths.filter((p) => p.width !== WAVE_WIDTH_PX.fan).length).toBeGreaterThanOrEqual(others);
    let left = 0;
    for (const w of fans) {
      const stream = drawnRays.filter((p) => fans.some((f) => f.surface === w.surface && f.rays!.some((_, k) => toScreen(view, wavePath(f, k)[0]!)[0] === p.points[0] && toScreen(view, wavePath(f, k)[0]!)[1] === p.points[1])));
      w.rays!.forEach((_, k) => {
        const pts = wavePath(w, k).map((q) => toScreen(view, q));
        const start = pts[0]!;
        const end = pts[pts.length - 1]!;
        const drawn = drawnRays.some((p) => p.points[0] === start[0] && p.points[1] === start[1] && p.points[p.points.length - 2] === end[0] && p.points[p.points.length - 1] === end[1]);
        if (drawn) return;
        left += 1;
        const beside = stream.some((p) => {
          const a = p.points.slice(0, 2);
          const b = p.points.slice(-2);
          return distance(start, a, b, true) < FAN_RAY_GAP_PX && distance(end, a, b, false) < FAN_RAY_GAP_PX;
        });
        expect(beside).toBe(true);
      });
    }
    expect(left).toBe(rayCount - drawnRays.length);
    // Sixteen times closer the vertices' rays are many pixels apart: nearly all drawn (what stays
    // left out are rays of one tiny fan, a fraction of a degree apart, on a short way to a shock).
    const zoomed = renderWaves(fine, { scale: 6400, originX: -2000, originY: 250 }, DEFAULT_LAYERS, fineDomain);
    expect(zoomed.paths.filter((p) => p.width === WAVE_WIDTH_PX.fan).length).toBeGreaterThan(0.9 * rayCount);
  });

  it('layer toggles remove their kind of wave', () => {
    const noFans = renderWaves(result, view, { ...DEFAULT_LAYERS, fans: false }, domain);
    const fanRays = result.waves.filter((w) => w.kind === 'fan').reduce((n, w) => n + (w.rays?.length ?? 1), 0);
    expect(renderWaves(result, view, DEFAULT_LAYERS, domain).paths.length - noFans.paths.length).toBe(fanRays);
    expect(renderWaves(null, view, DEFAULT_LAYERS, domain).paths).toEqual([]);
  });
});

describe('section renderer', () => {
  it('shades every solved facet by its pressure', () => {
    const result = solve(wedge, 2, 2);
    const domain = resultDomain(result);
    const list = renderSection(wedge, result, view, DEFAULT_LAYERS, domain, sectionOptions);
    const facets = list.paths.filter((p) => p.width === FACET_CP_WIDTH_PX);
    expect(facets).toHaveLength(4);
    const pressures = facetPressures(result, 4)!;
    facets.forEach((f, i) => expect(f.colour).toBe(pressureColour(pressures[i]!, domain)));
    expect(list.dots).toHaveLength(4);
  });

  it('draws unsolved facets (past a limit) in the neutral dashed style', () => {
    const result = solve([[0, 0], [0.5, 0.06], [1, 0], [0.5, -0.06]], 1.4, 5);
    expect(result.status).toBe('detached');
    const list = renderSection(result.geometry.lower.length ? [[0, 0], [0.5, 0.06], [1, 0], [0.5, -0.06]] : [], result, view, DEFAULT_LAYERS, resultDomain(result), sectionOptions);
    const unsolved = list.paths.filter((p) => p.width === FACET_CP_WIDTH_PX && p.colour === UNSOLVED_FACET);
    expect(unsolved.length).toBeGreaterThan(0);
    expect(unsolved.every((p) => p.dash)).toBe(true);
  });

  it('a result for another outline is not used for shading; selection is highlighted', () => {
    const result = solve(wedge, 2, 2);
    const five: Point[] = [[0, 0], [0.3, 0.02], [0.6, 0.02], [1, 0], [0.5, -0.02]];
    expect(facetPressures(result, 5)).toBeNull();
    const list = renderSection(five, result, view, DEFAULT_LAYERS, resultDomain(result), { ...sectionOptions, selection: [2] });
    expect(list.paths.filter((p) => p.width === FACET_CP_WIDTH_PX)).toHaveLength(0);
    expect(itemAt(list.dots, 2).radius).toBeGreaterThan(itemAt(list.dots, 1).radius);
  });
});

describe('limits and tooltips', () => {
  it('puts a labelled ring at the limit vertex with the numbers and the sentence, inside the canvas', () => {
    const result = solve([[0, 0], [0.5, 0.06], [1, 0], [0.5, -0.06]], 1.4, 5);
    const { marks, labels } = renderLimits(result, view, size);
    expect(marks.dots).toHaveLength(result.limits.length);
    expect([itemAt(marks.dots, 0).x, itemAt(marks.dots, 0).y]).toEqual(toScreen(view, itemAt(result.limits, 0).at));
    expect(itemAt(labels, 0).title).toBe('detached at vertex 0, lower surface');
    expect(itemAt(labels, 0).numbers).toMatch(/^θ 11\.8°, θmax 9\.4°$/);
    expect(itemAt(labels, 0).sentence).toBe(itemAt(result.limits, 0).message);
    for (const l of labels) {
      expect(l.x).toBeGreaterThanOrEqual(0);
      expect(l.y).toBeGreaterThanOrEqual(0);
    }
  });

  it('a wave tooltip gives kind, angle, M before and after and the pressure ratio', () => {
    const result = solve(wedge, 2, 2);
    const shock = result.waves.find((w) => w.kind === 'shock')!;
    const tip = waveTooltip(shock, null, result, 'pressureRatio');
    expect(tip.title).toMatch(/^Oblique shock · (upper|lower) surface, vertex \d+$/);
    const text = tip.lines.join('\n');
    expect(text).toContain(`angle ${Number(shock.angleDeg.toPrecision(4))}°`);
    expect(text).toContain(`M ${Number(shock.upstream.mach.toPrecision(4))} → ${Number(shock.downstream.mach.toPrecision(4))}`);
    expect(text).toContain('pressure ratio across');
    const fan = result.waves.find((w) => w.kind === 'fan')!;
    expect(waveTooltip(fan, 1, result, 'cp').title).toMatch(/^Expansion fan \(ray 2 of \d+\)/);
  });

  it('a facet tooltip gives its Mach number and Cp', () => {
    const result = solve(wedge, 2, 2);
    const tip = facetTooltip(0, result)!;
    const facet = [...result.surfaces.upper, ...result.surfaces.lower].find((f) => f.index === 0)!;
    expect(tip.lines[0]).toBe(`M ${Number(facet.mach!.toPrecision(4))}, Cp ${Number(facet.cp!.toPrecision(4))}`);
  });
});
