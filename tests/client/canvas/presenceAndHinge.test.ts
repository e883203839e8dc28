import { describe, expect, it } from 'vitest';
import type { Point } from '@shared/model/sketch';
import { DEFAULT_LAYERS } from '@/canvas/layers';
import { renderSection } from '@/canvas/renderSection';
import { renderPresence } from '@/canvas/renderPresence';
import { toScreen, type View } from '@/canvas/view';
import { itemAt } from '@shared/util/invariant';

const VIEW: View = { scale: 400, originX: 100, originY: 300 };
const DIAMOND: [Point, Point, Point, Point] = [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]];

describe('renderSection hinge marker', () => {
  it('draws a ring at the flap hinge only when there is one', () => {
    const base = { selection: [], invalid: false, hoverVertex: null, hoverFacet: null, showVertices: false };
    const domain = { min: 0.5, max: 2 } as never;
    const without = renderSection(DIAMOND, null, VIEW, DEFAULT_LAYERS, domain, base);
    const withHinge = renderSection(DIAMOND, null, VIEW, DEFAULT_LAYERS, domain, { ...base, hinge: [0.75, 0] });
    expect(without.dots).toHaveLength(0);
    const [hx, hy] = toScreen(VIEW, [0.75, 0]);
    expect(withHinge.dots).toEqual([expect.objectContaining({ x: hx, y: hy })]);
  });
});

describe('renderPresence', () => {
  it('draws a named cursor and a ring on each vertex a colleague selected', () => {
    const list = renderPresence([{ key: 'c1', name: 'Tomasz Reyes', colour: '#17bebb', cursor: [0.5, 0.1], selection: [1, 3] }], DIAMOND, VIEW, null, null);
    expect(list.texts?.map((t) => t.text)).toEqual(['Tomasz Reyes']);
    expect(list.dots.map((d) => [d.x, d.y])).toEqual([toScreen(VIEW, DIAMOND[1]), toScreen(VIEW, DIAMOND[3])]);
    expect(list.paths.every((p) => p.fill === '#17bebb' || p.colour === '#17bebb' || p.colour === '#0b141a')).toBe(true);
  });

  it('draws the walkthrough highlight of a facet, and nothing for a cursor-less colleague', () => {
    const list = renderPresence([{ key: 'c2', name: 'Priya Vance', colour: '#ffc914', cursor: null, selection: [] }], DIAMOND, VIEW, { kind: 'facet', id: 2 }, null);
    expect(list.texts).toEqual([]);
    expect(list.paths).toHaveLength(1);
    expect(itemAt(list.paths, 0).points).toEqual([...toScreen(VIEW, DIAMOND[2]), ...toScreen(VIEW, DIAMOND[3])]);
  });
});
