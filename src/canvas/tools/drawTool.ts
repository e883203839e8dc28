import { explainSectionProblem } from '@shared/model/ops';
import type { Point } from '@shared/model/sketch';
import { firstItem } from '@shared/util/invariant';
import { snapPoint } from '../geometry';
import { toScreen } from '../view';
import { HIT_TOLERANCE_PX, type Tool, type ToolContext, type ToolStep } from './types';

export interface DrawState {
  path: Point[];
  cursor: Point | null;
}

/**
 * Draw a new section: click to place vertices (snapped to the grid, or the facet being drawn
 * to the angle step), click the first vertex or press Enter to close — the drawn polygon then
 * replaces the section in one edit and the tool hands back to Select, so the next click edits
 * the new section instead of starting another. Backspace removes the last vertex, Escape abandons.
 */
export const drawTool: Tool<DrawState> = {
  id: 'draw',
  label: 'Draw',
  shortcut: 'p',
  help: 'Draw a new section: click vertices, click the first one (or Enter) to close.',
  initial: () => ({ path: [], cursor: null }),

  down(s, ctx, p) {
    if (ctx.readOnly) return { state: s, effects: [] };
    if (s.path.length >= 3 && nearFirst(s, ctx, p.screen)) return close(s);
    const at = place(s, ctx, p.world, p.alt);
    const last = s.path.at(-1);
    if (last && last[0] === at[0] && last[1] === at[1]) return { state: s, effects: [] };
    const path = [...s.path, at];
    return show({ path, cursor: at }, path.length === 1 ? 'Click the next vertex; click the first one or press Enter to close.' : null);
  },

  move(s, ctx, p) {
    if (s.path.length === 0) return { state: s, effects: [], cursor: 'crosshair' };
    const closing = s.path.length >= 3 && nearFirst(s, ctx, p.screen);
    const cursor = closing ? firstItem(s.path) : place(s, ctx, p.world, p.alt);
    return { ...show({ path: s.path, cursor }, null), cursor: closing ? 'pointer' : 'crosshair' };
  },

  up: (s) => ({ state: s, effects: [] }),

  key(s, _ctx, k) {
    if (s.path.length === 0) return null;
    if (k.key === 'Enter') return s.path.length >= 3 ? close(s) : { state: s, effects: [{ kind: 'hint', text: 'A section needs at least 3 vertices.' }] };
    if (k.key === 'Backspace' || k.key === 'Delete') return show({ path: s.path.slice(0, -1), cursor: s.cursor }, null);
    if (k.key === 'Escape') return drawTool.cancel(s);
    return null;
  },

  // Nothing drawn: nothing to clear (and the hint said after closing stays).
  cancel: (s) => ({ state: { path: [], cursor: null }, effects: s.path.length > 0 ? [{ kind: 'path', points: null, cursor: null }, { kind: 'hint', text: null }] : [] }),
};

function place(s: DrawState, ctx: ToolContext, world: Point, alt: boolean): Point {
  return alt ? [world[0], world[1]] : snapPoint(world, ctx.snap, s.path.at(-1) ?? null);
}

function nearFirst(s: DrawState, ctx: ToolContext, screen: [number, number]): boolean {
  const [fx, fy] = toScreen(ctx.view, firstItem(s.path));
  return Math.hypot(fx - screen[0], fy - screen[1]) <= HIT_TOLERANCE_PX;
}

function show(state: DrawState, hint: string | null): ToolStep<DrawState> {
  return { state, effects: [{ kind: 'path', points: state.path, cursor: state.cursor }, { kind: 'hint', text: hint }] };
}

function close(s: DrawState): ToolStep<DrawState> {
  // A path that would not make a section stays open to be fixed (nothing drawn is lost).
  const problem = explainSectionProblem(s.path);
  if (problem) return { state: s, effects: [{ kind: 'hint', text: `Not closed: ${problem}. Remove the last vertex (Backspace) and place it elsewhere.` }] };
  return {
    state: { path: [], cursor: null },
    effects: [
      { kind: 'path', points: null, cursor: null },
      { kind: 'commit', op: { type: 'replaceSection', points: s.path }, select: [] },
      { kind: 'tool', id: 'select' },
      { kind: 'hint', text: `Section of ${s.path.length} vertices drawn; Select is on. Press P to draw another.` },
    ],
  };
}
