import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { boxesOverlap, layoutLimitLabels, nearestOnBox, type Box, type LayoutOptions } from '@/canvas/limitLayout';
import { renderLimits, LIMIT_LABEL_HEIGHT_PX, LIMIT_LABEL_WIDTH_PX, LIMIT_RING_RADIUS_PX } from '@/canvas/renderLimits';
import type { SolveLimit, SolveResult } from '@shared/solver/types';
import { itemAt } from '@shared/util/invariant';

const OPTIONS: LayoutOptions = { width: 760, height: 620, labelWidth: LIMIT_LABEL_WIDTH_PX, labelHeight: LIMIT_LABEL_HEIGHT_PX, ringRadius: LIMIT_RING_RADIUS_PX, gap: 6, margin: 8 };

/** [L1]–[L4] for one layout. */
function expectInvariants(anchors: { x: number; y: number }[], o: LayoutOptions, r: ReturnType<typeof layoutLimitLabels>) {
  const boxes = r.placements.filter((p) => p !== null).map((p) => p.box);
  expect(boxes.length + r.hidden).toBe(anchors.length); // [L4]
  boxes.forEach((a, i) => {
    boxes.slice(i + 1).forEach((b) => expect(boxesOverlap(a, b, o.gap - 1e-9), `callouts ${JSON.stringify(a)} and ${JSON.stringify(b)} overlap`).toBe(false)); // [L1]
    for (const p of anchors) {
      const [nx, ny] = nearestOnBox(a, p.x, p.y);
      expect(Math.hypot(nx - p.x, ny - p.y), `a callout covers the ring at ${p.x}, ${p.y}`).toBeGreaterThanOrEqual(o.ringRadius); // [L2]
    }
    expect(a.x >= o.margin && a.y >= o.margin && a.x + a.w <= o.width - o.margin && a.y + a.h <= o.height - o.margin).toBe(true); // [L3]
  });
  r.placements.forEach((p, i) => {
    if (!p) return;
    const [nx, ny] = nearestOnBox(p.box, itemAt(anchors, i).x, itemAt(anchors, i).y);
    // A callout away from its ring has a leader line from its edge to the ring.
    if (Math.hypot(nx - itemAt(anchors, i).x, ny - itemAt(anchors, i).y) > 40) expect(p.leader).toEqual([nx, ny, itemAt(anchors, i).x, itemAt(anchors, i).y]);
  });
}

function limitAt(vertex: number, at: [number, number]): SolveLimit {
  return { status: 'detached', surface: 'upper', vertex, at, message: `The compression at vertex ${vertex} is beyond the largest deflection.`, thetaDeg: 12, thetaMaxDeg: 9 } as SolveLimit;
}

describe('limit callouts', () => {
  it('[L1]–[L4] twelve limits on one section (every vertex of a 12-facet lens detached): no overlap, no ring hidden', () => {
    // A lens across the middle of the canvas, vertices 60 px apart: the crowded case.
    const anchors = Array.from({ length: 12 }, (_, i) => ({ x: 80 + i * 55, y: 310 + (i % 2 === 0 ? -12 : 12) }));
    const r = layoutLimitLabels(anchors, OPTIONS);
    expectInvariants(anchors, OPTIONS, r);
    // 760 × 620 holds two columns of 78 px rows minus the band the rings occupy: most fit.
    expect(r.hidden).toBeLessThanOrEqual(4);
  });

  it('[L1]–[L2] two limits at one vertex (a nose detached on both surfaces) are stacked, neither on the ring', () => {
    const anchors = [{ x: 200, y: 300 }, { x: 200, y: 300 }];
    const r = layoutLimitLabels(anchors, OPTIONS);
    expectInvariants(anchors, OPTIONS, r);
    expect(r.hidden).toBe(0);
  });

  it('[L3] a limit at the canvas edge gets its callout inside the canvas, not over the ring', () => {
    const anchors = [{ x: 750, y: 12 }, { x: 5, y: 610 }];
    const r = layoutLimitLabels(anchors, OPTIONS);
    expectInvariants(anchors, OPTIONS, r);
    expect(r.hidden).toBe(0);
  });

  it('[L1]–[L4] hold for any number of limits anywhere on any canvas size (property)', () => {
    // Counts the cases reaching the assertions, as tests/helpers/reached.ts does (that helper
    // reads Node's process.env, which the client project's types do not have).
    let reachedCount = 0;
    fc.assert(
      fc.property(
        fc.integer({ min: 320, max: 1600 }),
        fc.integer({ min: 200, max: 1000 }),
        fc.array(fc.tuple(fc.double({ min: -0.1, max: 1.1, noNaN: true }), fc.double({ min: -0.1, max: 1.1, noNaN: true })), { minLength: 1, maxLength: 30 }),
        (width, height, rel) => {
          const o = { ...OPTIONS, width, height };
          const anchors = rel.map(([u, v]) => ({ x: u * width, y: v * height }));
          const r = layoutLimitLabels(anchors, o);
          reachedCount++;
          expectInvariants(anchors, o, r);
        },
      ),
      { numRuns: 200 },
    );
    expect(reachedCount, `${reachedCount} layouts reached the assertions; at least 200 must`).toBeGreaterThanOrEqual(200);
  });

  it('renderLimits: callouts follow the layout, leaders join far callouts to their ring, and the hidden ones are counted', () => {
    const view = { scale: 600, originX: 60, originY: 310 };
    const limits = Array.from({ length: 16 }, (_, i) => limitAt(i, [i / 15, i % 2 === 0 ? 0.01 : -0.01]));
    const result = { limits } as unknown as SolveResult;
    const { labels, marks, hidden } = renderLimits(result, view, { width: 760, height: 620 });
    const callouts = labels.filter((l) => l.key !== 'limits-more');
    expect(callouts.length + hidden).toBe(16);
    expect(hidden).toBeGreaterThan(0);
    // One more box says how many are not labelled and at which vertices.
    const more = labels.find((l) => l.key === 'limits-more');
    expect(more?.title).toBe(`${hidden} more limit${hidden === 1 ? '' : 's'} not labelled here`);
    expect(more?.numbers).toMatch(/^at vertex \d+(, \d+)*$/);
    const boxes: Box[] = labels.map((l) => ({ x: l.x, y: l.y, w: LIMIT_LABEL_WIDTH_PX, h: LIMIT_LABEL_HEIGHT_PX }));
    boxes.forEach((a, i) => boxes.slice(i + 1).forEach((b) => expect(boxesOverlap(a, b)).toBe(false)));
    // Rings for every limit, shown or counted.
    expect(marks.dots).toHaveLength(16);
    expect(marks.paths.length).toBe(labels.filter((l) => l.leader).length);
  });
});
