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
import { boundsOf, fitView, isotropic, panBy, toScreen, toWorld, withExaggeration, zoomAt, MAX_SCALE } from '@/canvas/view';
import { gridLines, niceStep, niceStepBelow, scaleBar } from '@/canvas/grid';
import { snapSteps, stepsLabel } from '@/canvas/snap';
import { facetAt, vertexAt } from '@/canvas/tools/types';
import { expectClose } from '../../helpers/expectClose';
import { itemAt } from '@shared/util/invariant';

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

describe('vertical exaggeration (view only)', () => {
  const view = { scale: 400, originX: 100, originY: 250, exaggeration: 5 };

  it('[V1] toWorld inverts toScreen under a vertical exaggeration; y is stretched on screen only', () => {
    expect(toScreen(view, [1, 0.02])).toEqual([500, 210]); // 0.02 c × 400 px × 5 = 40 px up
    const back = toWorld(view, [500, 210]);
    expectClose(back[0], 1, 1e-15);
    expectClose(back[1], 0.02, 1e-15);
  });

  it('[V2] zoomAt keeps the point under the cursor and the exaggeration', () => {
    const cursor: [number, number] = [321, 123];
    const before = toWorld(view, cursor);
    const zoomed = zoomAt(view, 2.5, cursor);
    expect(zoomed.exaggeration).toBe(5);
    const after = toWorld(zoomed, cursor);
    expectClose(after[0], before[0], 1e-12);
    expectClose(after[1], before[1], 1e-12);
  });

  it('withExaggeration keeps the world point at the middle row of the canvas where it was', () => {
    const plain = { scale: 400, originX: 100, originY: 250 };
    const middle = toWorld(plain, [0, 300]);
    const stretched = withExaggeration(plain, 5, 300);
    expectClose(toWorld(stretched, [0, 300])[1], middle[1], 1e-12);
    expect(withExaggeration(stretched, 1, 300)).toEqual({ scale: 400, originX: 100, originY: 250 });
  });

  it('fitView with ×5 fits the stretched height: a 5 % section fills the height before the width', () => {
    const v = fitView(boundsOf(wedge), { width: 800, height: 200 }, 0.1, 5);
    // Height 0.05 × 5 = 0.25 c over 160 px → 640 px per chord (the width would allow 640 too: a tie).
    expect(v.scale).toBeCloseTo(640, 9);
    expect(v.exaggeration).toBe(5);
  });

  it('hit tests measure pixels on screen: under ×5 a pointer 10 px from a vertex does not hit it', () => {
    // Thin lens, 0.5 % thick: the ridges are 12.5 px above and below the axis at 1000 px/c × 5.
    const lens: Point[] = [[0, 0], [0.5, 0.0025], [1, 0], [0.5, -0.0025]];
    const stretched = { scale: 1000, originX: 0, originY: 300, exaggeration: 5 };
    // 2.5 px above the axis: 10 px from the upper ridge on screen (only 2 px in unstretched chord units).
    expect(vertexAt({ points: lens, view: stretched }, [0.5, 0.0005])).toBeNull();
    expect(vertexAt({ points: lens, view: { ...stretched, exaggeration: 1 } }, [0.5, 0.0005])).toBe(1);
    expect(vertexAt({ points: lens, view: stretched }, [0.5, 0.002])).toBe(1);
    expect(isotropic({ scale: 1, originX: 0, originY: 0 })).toBeNull();
    // A facet point found through the stretched metric is on the facet in body axes.
    const hit = facetAt({ points: lens, view: stretched }, [0.25, 0.0013]);
    expect(hit?.index).toBe(0);
    expectClose(hit!.at[1], hit!.at[0] * 0.005, 1e-15);
  });
});

describe('snap steps follow the zoom and the thickness', () => {
  const auto = { grid: true, gridStep: 'auto' as const, angleStepDeg: 0 };
  const wedge5 = { chord: 1, thickness: 0.05 };

  it('niceStepBelow(x) is the largest 1, 2, 5 × 10^k at most x', () => {
    expect(niceStepBelow(0.00125)).toBe(0.001);
    expect(niceStepBelow(0.003)).toBe(0.002);
    expect(niceStepBelow(0.05)).toBe(0.05);
    expect(niceStepBelow(0.07)).toBe(0.05);
  });

  it('a 5 % section fitted at 576 px/c snaps its ridge in 0.001 c (t/c in 0.1 %), x in 0.01 c', () => {
    // The grid lines there are niceStep(18/576) = 0.05 c apart: snapping to them would move the
    // ridge of a 5 % section from 0.025 to 0 or 0.05 (t/c 0 % or 7.5 %).
    expect(snapSteps(auto, { scale: 576, originX: 0, originY: 0 }, wedge5)).toEqual({ stepX: 0.01, stepY: 0.001 });
    expect(niceStep(18 / 576)).toBe(0.05);
  });

  it('zooming in makes the steps finer; a fixed step applies to both axes', () => {
    expect(snapSteps(auto, { scale: 20_000, originX: 0, originY: 0 }, wedge5)).toEqual({ stepX: 0.0002, stepY: 0.0002 });
    expect(snapSteps({ ...auto, gridStep: 0.05 }, { scale: 576, originX: 0, originY: 0 }, wedge5)).toEqual({ stepX: 0.05, stepY: 0.05 });
  });

  it('the label counts chords, also for a section drawn at its physical size', () => {
    expect(stepsLabel({ stepX: 0.01, stepY: 0.001 })).toBe('x 0.01 c, y 0.001 c');
    expect(stepsLabel({ stepX: 0.0002, stepY: 0.0002 })).toBe('0.0002 c');
    // A 0.32 m chord drawn in metres: 0.002 m is 0.00625 c, 0.0002 m is 0.000625 c.
    expect(stepsLabel({ stepX: 0.002, stepY: 0.0002 }, 0.32)).toBe('x 0.00625 c, y 0.000625 c');
  });

  it('a thinner section gets a finer y step; a vertical exaggeration refines y by the zoom', () => {
    expect(snapSteps(auto, { scale: 576, originX: 0, originY: 0 }, { chord: 1, thickness: 0.001 }).stepY).toBe(0.00002);
    expect(snapSteps(auto, { scale: 50, originX: 0, originY: 0, exaggeration: 5 }, null)).toEqual({ stepX: 0.1, stepY: 0.02 });
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
    const settings = { grid: true, stepX: 0.05, stepY: 0.05, angleStepDeg: 15 };
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
    const gaps = grid.vertical.slice(1).map((l, i) => l.at - itemAt(grid.vertical, i).at);
    for (const g of gaps) expectClose(g, 20, 1e-9);
    expect(grid.vertical.find((l) => l.value === 0)).toMatchObject({ axis: true, major: true, at: 100 });
    expect(grid.vertical.find((l) => l.value === 0.25)?.major).toBe(true);
    expect(grid.vertical.find((l) => l.value === 0.3)?.major).toBe(false);
  });

  it('the scale bar is a nice length at most the target width', () => {
    const bar = scaleBar({ scale: 400, originX: 0, originY: 0 }, 1, 100);
    expect(bar).toEqual({ length: 0.2, pixels: 80, label: '0.2 c' });
  });

  it('the scale bar counts chords of a section drawn at its physical size', () => {
    // A 0.32 m chord imported in metres, 1250 px per metre: one chord is 400 px on screen,
    // so the bar is the same 0.2 c, 80 px long, as for the unit-chord drawing above; a shorter
    // target gives the next nice length down.
    const bar = scaleBar({ scale: 1250, originX: 0, originY: 0 }, 0.32, 100);
    expect(bar.label).toBe('0.2 c');
    expectClose(bar.pixels, 80, 1e-9);
    expect(scaleBar({ scale: 1250, originX: 0, originY: 0 }, 0.32, 62.5).label).toBe('0.1 c');
  });
});
