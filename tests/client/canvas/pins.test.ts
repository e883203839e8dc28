import { describe, expect, it } from 'vitest';
import type { Point } from '@shared/model/sketch';
import { parseSolveInput } from '@shared/model/solveInput';
import { solveSection } from '@shared/solver';
import { CANVAS_BACKGROUND, contrastRatio } from '@/canvas/colors';
import { distanceToSegment } from '@/canvas/geometry';
import { describePinTarget, hitPinMarker, pinHead, pinTargetAt, PIN_STEM_PX, type PinMarker } from '@/canvas/pins';
import { COMPARE_A, COMPARE_B, PIN_OPEN, PIN_RESOLVED, outlineOnto, renderReview } from '@/canvas/renderReview';
import { toScreen } from '@/canvas/view';
import { expectClose } from '../../helpers/expectClose';
import { itemAt } from '@shared/util/invariant';

const wedge: [Point, Point, Point, Point] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];
const view = { scale: 400, originX: 100, originY: 250 };

function solve(points: Point[], mach: number, alphaDeg: number) {
  const parsed = parseSolveInput({ section: { points }, flow: { mach, alphaDeg } });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return solveSection(parsed.value);
}

describe('pin targets', () => {
  const result = solve(wedge, 2, 0);
  const tol = 6 / view.scale;

  it('[P2] a click on a facet pins that facet at the nearest point of it', () => {
    const target = pinTargetAt(wedge, result, [0.25, 0.0135], tol);
    expect(target.kind).toBe('facet');
    if (target.kind !== 'facet') return;
    expect(target.facet).toBe(0);
    expect(distanceToSegment(target.at, wedge[0], wedge[1]).distance).toBeLessThan(1e-12);
    expectClose(target.at[0], 0.25, 0.002);
  });

  it('[P2] a click on a shock pins the wave by id with its label, on the shock line', () => {
    const shock = result.waves.find((w) => w.kind === 'shock' && w.surface === 'upper')!;
    const mid: Point = [(shock.origin[0] + shock.end[0]) / 2, (shock.origin[1] + shock.end[1]) / 2];
    const target = pinTargetAt(wedge, result, [mid[0], mid[1] + 0.002], tol);
    expect(target.kind).toBe('wave');
    if (target.kind !== 'wave') return;
    expect(target.waveId).toBe(shock.id);
    expect(target.label).toBe('Oblique shock · upper surface, vertex 0');
    expect(distanceToSegment(target.at, shock.origin, shock.end).distance).toBeLessThan(1e-9);
  });

  it('a hidden wave is not pinned; open space pins the point itself', () => {
    const shock = result.waves.find((w) => w.kind === 'shock' && w.surface === 'upper')!;
    const mid: Point = [(shock.origin[0] + shock.end[0]) / 2, (shock.origin[1] + shock.end[1]) / 2];
    const target = pinTargetAt(wedge, result, mid, tol, (w) => w.kind !== 'shock');
    expect(target).toEqual({ kind: 'point', at: mid.map((v) => Number(v.toPrecision(12))) });
    expect(pinTargetAt(wedge, null, [2, 2], tol)).toEqual({ kind: 'point', at: [2, 2] });
  });

  it('describes targets in words', () => {
    expect(describePinTarget({ kind: 'facet', facet: 3, at: [0, 0] })).toBe('Facet 3');
    expect(describePinTarget({ kind: 'wave', waveId: 'wave_upper_0', label: 'Oblique shock · upper surface, vertex 0', at: [0, 0] })).toBe('Oblique shock · upper surface, vertex 0');
    expect(describePinTarget({ kind: 'point', at: [0.41234, -0.0567] })).toBe('Point (0.4123, −0.0567)');
  });
});

describe('pin markers', () => {
  const markers: PinMarker[] = [
    { id: 'pin_a', at: [0.5, 0], status: 'resolved', selected: false },
    { id: 'pin_b', at: [0.5, 0], status: 'open', selected: false },
    { id: 'draft', at: [0.2, 0.1], status: 'draft', selected: false },
  ];

  it('[P1] the marker tip is drawn at the pinned point and the head above it', () => {
    const list = renderReview([itemAt(markers, 1)], null, view);
    const [x, y] = toScreen(view, [0.5, 0]);
    expect(list.dots[0]).toMatchObject({ x, y, fill: PIN_OPEN });
    expect(pinHead(view, [0.5, 0])).toEqual([x, y - PIN_STEM_PX]);
  });

  it('a click on a head opens the pin drawn on top (open over resolved); the draft and empty space open nothing', () => {
    const [hx, hy] = pinHead(view, [0.5, 0]);
    expect(hitPinMarker(markers, view, [hx + 3, hy - 2])).toBe('pin_b');
    expect(hitPinMarker(markers, view, pinHead(view, [0.2, 0.1]))).toBeNull();
    expect(hitPinMarker(markers, view, [hx + 40, hy])).toBeNull();
  });

  it('open pins are filled, resolved ones hollow rings', () => {
    const list = renderReview(markers.slice(0, 2), null, view);
    const heads = list.dots.filter((d) => d.radius > 3);
    expect(heads.find((d) => d.stroke === PIN_RESOLVED)?.fill).toBe(CANVAS_BACKGROUND);
    expect(heads.find((d) => d.fill === PIN_OPEN)).toBeDefined();
  });

  it('compared outlines: A dashed, B solid, both closed and labelled at the nose', () => {
    const b: Point[] = wedge.map(([x, y]) => [x, y * 2]);
    const list = renderReview([], { a: wedge, b, labelA: 'A', labelB: 'B' }, view);
    expect(list.paths).toHaveLength(2);
    expect(list.paths[0]).toMatchObject({ colour: COMPARE_A, closed: true });
    expect(itemAt(list.paths, 0).dash).toBeDefined();
    expect(list.paths[1]).toMatchObject({ colour: COMPARE_B, closed: true, dash: undefined });
    expect(itemAt(list.paths, 1).points).toEqual(b.flatMap((p) => toScreen(view, p)));
    expect(list.texts!.map((t) => t.text)).toEqual(['A', 'B']);
  });

  it('an empty outline (a sketch with no section yet) is compared as drawn, not fitted', () => {
    expect(outlineOnto([], wedge)).toEqual({ points: wedge, fitted: false });
    expect(outlineOnto(wedge, [])).toEqual({ points: [], fitted: false });
    const list = renderReview([], { a: [], b: wedge, labelA: 'A', labelB: 'B' }, view);
    expect(list.paths).toHaveLength(2);
    expect(itemAt(list.paths, 0).points).toEqual([]);
    expect(list.texts!.map((t) => t.text)).toEqual(['B']);
  });

  it('[P3] pin and compare colours keep at least 3:1 contrast with the canvas background', () => {
    for (const c of [PIN_OPEN, PIN_RESOLVED, COMPARE_A, COMPARE_B]) expect(contrastRatio(c, CANVAS_BACKGROUND)).toBeGreaterThanOrEqual(3);
  });
});
