import { describe, expect, it } from 'vitest';
import type { Point } from '@shared/model/sketch';
import {
  distanceToSegment,
  hitFacet,
  hitVertex,
  pointInPolygon,
  roundTo,
  snapAngle,
  snapPoint,
  snapToGrid,
  tidy,
  verticesInRect,
} from '@/canvas/geometry';
import { boundsOf, fitView, panBy, toScreen, toWorld, zoomAt, MAX_SCALE } from '@/canvas/view';
import { gridLines, niceStep, scaleBar } from '@/canvas/grid';
import { expectClose } from '../../helpers/expectClose';

const wedge: Point[] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];

describe('view transform', () => {
  const view = { scale: 400, originX: 100, originY: 250 };

  it('[V1] toWorld inverts toScreen, with y up in the world and down on screen', () => {
    expect(toScreen(view, [1, 0.5])).toEqual([500, 50]);
    expect(toWorld(view, [500, 50])).toEqual([1, 0.5]);
  });

  it('[V2] zoomAt keeps the world point under the cursor fixed', () => {
    const cursor: [number, number] = [333, 177];
    const before = toWorld(view, cursor);
    const zoomed = zoomAt(view, 1.7, cursor);
    const after = toWorld(zoomed, cursor);
    expectClose(after[0], before[0], 1e-12);
    expectClose(after[1], before[1], 1e-12);
    expect(zoomed.scale).toBeCloseTo(680, 9);
    expect(zoomAt(view, 1e9, cursor).scale).toBe(MAX_SCALE);
  });

  it('panBy moves the origin only', () => {
    expect(panBy(view, 10, -5)).toEqual({ scale: 400, originX: 110, originY: 245 });
  });

  it('fitView centres the section and fits its width inside the margins', () => {
    const size = { width: 800, height: 600 };
    const v = fitView(boundsOf(wedge), size, 0.2);
    expect(toScreen(v, [0.5, 0])).toEqual([400, 300]);
    expect(v.scale).toBeCloseTo(480, 9); // 60 % of 800 px over a chord of 1
  });
});

describe('hit tests', () => {
  it('hitVertex finds the nearest vertex within the tolerance', () => {
    expect(hitVertex(wedge, [0.51, 0.02], 0.02)).toBe(1);
    expect(hitVertex(wedge, [0.3, 0.3], 0.02)).toBeNull();
  });

  it('hitFacet returns the facet and the nearest point on it', () => {
    const hit = hitFacet(wedge, [0.75, 0.02], 0.02);
    expect(hit?.index).toBe(1);
    expectClose(hit!.at[1], 0.0125, 1e-3);
    expect(hitFacet(wedge, [0.5, 0.5], 0.02)).toBeNull();
  });

  it('distanceToSegment clamps to the ends', () => {
    expect(distanceToSegment([2, 0], [0, 0], [1, 0])).toEqual({ distance: 1, t: 1, at: [1, 0] });
  });

  it('pointInPolygon and verticesInRect', () => {
    expect(pointInPolygon(wedge, [0.5, 0])).toBe(true);
    expect(pointInPolygon(wedge, [0.5, 0.1])).toBe(false);
    expect(verticesInRect(wedge, { x0: 1.1, y0: 0.1, x1: 0.4, y1: -0.01 })).toEqual([1, 2]);
  });
});

describe('snapping', () => {
  it('snaps to the grid without binary noise', () => {
    expect(snapToGrid([0.3049, -0.0151], 0.01)).toEqual([0.3, -0.02]);
    expect(roundTo(0.1 * 3, 0.1)).toBe(0.3);
    expect(tidy(0.025 - 0.035)).toBe(-0.01);
  });

  it('snaps the direction from an anchor to the angle step, keeping the projected length', () => {
    const p = snapAngle([0, 0], [1, 0.09], 5);
    expectClose((Math.atan2(p[1], p[0]) * 180) / Math.PI, 5, 1e-12);
    expectClose(Math.hypot(p[0], p[1]), 1 * Math.cos((5 * Math.PI) / 180) + 0.09 * Math.sin((5 * Math.PI) / 180), 1e-12);
  });

  it('snapPoint prefers the angle step when there is an anchor, else the grid, else nothing', () => {
    const settings = { grid: true, gridStep: 0.05, angleStepDeg: 15 };
    const angled = snapPoint([1, 0.3], settings, [0, 0]);
    expectClose((Math.atan2(angled[1], angled[0]) * 180) / Math.PI, 15, 1e-12);
    expect(snapPoint([0.512, 0.033], settings, null)).toEqual([0.5, 0.05]);
    expect(snapPoint([0.512, 0.033], { ...settings, grid: false }, null)).toEqual([0.512, 0.033]);
  });
});

describe('grid', () => {
  it('niceStep picks 1, 2 or 5 × 10^k at or above the asked step', () => {
    expect([0.003, 0.012, 0.04, 0.07, 0.3, 7].map(niceStep)).toEqual([0.005, 0.02, 0.05, 0.1, 0.5, 10]);
  });

  it('gridLines cover the view with lines at least 18 px apart; every fifth is major', () => {
    const view = { scale: 400, originX: 100, originY: 250 };
    const grid = gridLines(view, { width: 800, height: 500 });
    expect(grid.step).toBe(0.05); // 18 px / 400 px per chord = 0.045 → 0.05
    const gaps = grid.vertical.slice(1).map((l, i) => l.at - grid.vertical[i].at);
    for (const g of gaps) expectClose(g, 20, 1e-9);
    expect(grid.vertical.find((l) => l.value === 0)).toMatchObject({ axis: true, major: true, at: 100 });
    expect(grid.vertical.find((l) => l.value === 0.25)?.major).toBe(true);
    expect(grid.vertical.find((l) => l.value === 0.3)?.major).toBe(false);
  });

  it('the scale bar is a nice length at most the target width', () => {
    const bar = scaleBar({ scale: 400, originX: 0, originY: 0 }, 100);
    expect(bar).toEqual({ length: 0.2, pixels: 80, label: '0.2 c' });
  });
});
