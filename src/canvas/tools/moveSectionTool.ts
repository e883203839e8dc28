import type { Point } from '@shared/model/sketch';
import { pointInPolygon, roundTo, tidyPoint } from '../geometry';
import { itemAt } from '@shared/util/invariant';
import { ARROWS, facetAt, movedBeyondThreshold, nudgeBy, type Tool, type ToolContext, type ToolEffect } from './types';

export type MoveSectionState =
  | { mode: 'idle' }
  | { mode: 'dragging'; startScreen: [number, number]; startWorld: Point; moved: Point[] | null };

/**
 * Move the whole section: drag from inside it or from its outline; the offset snaps to whole
 * snap steps so a section on the grid stays on it. Arrow keys nudge the whole section.
 */
export const moveSectionTool: Tool<MoveSectionState> = {
  id: 'moveSection',
  label: 'Move section',
  shortcut: 'm',
  help: 'Drag the section to move it as a whole.',
  initial: () => ({ mode: 'idle' }),
  down(s, ctx, p) {
    if (ctx.readOnly) return { state: s, effects: [] };
    const on = pointInPolygon(ctx.points, p.world) || facetAt(ctx, p.world) !== null;
    if (!on) return { state: s, effects: [] };
    return { state: { mode: 'dragging', startScreen: p.screen, startWorld: p.world, moved: null }, effects: [], cursor: 'grabbing' };
  },
  move(s, ctx, p) {
    if (s.mode === 'idle') {
      const on = pointInPolygon(ctx.points, p.world) || facetAt(ctx, p.world) !== null;
      return { state: s, effects: [], cursor: on ? 'move' : 'default' };
    }
    if (!s.moved && !movedBeyondThreshold(s.startScreen, p.screen)) return { state: s, effects: [] };
    let dx = p.world[0] - s.startWorld[0];
    let dy = p.world[1] - s.startWorld[1];
    if (ctx.snap.grid && !p.alt) {
      dx = roundTo(dx, ctx.snap.stepX);
      dy = roundTo(dy, ctx.snap.stepY);
    }
    const moved = ctx.points.map(([x, y]) => tidyPoint(x + dx, y + dy));
    return { state: { ...s, moved }, effects: [{ kind: 'preview', points: moved }], cursor: 'grabbing' };
  },
  up(s, ctx) {
    if (s.mode !== 'dragging') return { state: s, effects: [] };
    const effects: ToolEffect[] = [{ kind: 'preview', points: null }];
    // A colleague's edit that added or removed vertices during the drag leaves a move for another
    // outline: nothing is committed then (the section stays as they left it).
    const moved = s.moved && s.moved.length === ctx.points.length ? s.moved : null;
    if (moved && moved.some((m, i) => {
      const q = itemAt(ctx.points, i);
      return m[0] !== q[0] || m[1] !== q[1];
    })) {
      effects.push({ kind: 'commit', op: { type: 'moveVertices', indices: ctx.points.map((_, i) => i), to: moved } });
    }
    return { state: { mode: 'idle' }, effects, cursor: 'move' };
  },
  key(s, ctx, k) {
    const dir = ARROWS[k.key];
    if (!dir || s.mode !== 'idle' || ctx.readOnly) return null;
    return { state: s, effects: [{ kind: 'commit', op: shift(ctx, nudgeBy(ctx, k, dir)) }] };
  },
  cancel: () => ({ state: { mode: 'idle' }, effects: [{ kind: 'preview', points: null }] }),
};

function shift(ctx: ToolContext, [dx, dy]: [number, number]) {
  return {
    type: 'moveVertices' as const,
    indices: ctx.points.map((_, i) => i),
    to: ctx.points.map(([x, y]) => tidyPoint(x + dx, y + dy)),
  };
}
