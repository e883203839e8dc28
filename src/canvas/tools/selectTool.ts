import type { Point } from '@shared/model/sketch';
import { firstItem, itemAt, present } from '@shared/util/invariant';
import { snapPoint, tidyPoint, verticesInRect } from '../geometry';
import { ARROWS, movedBeyondThreshold, nudgeBy, vertexAt, type KeyInput, type Tool, type ToolContext, type ToolEffect, type ToolStep } from './types';

export type SelectState =
  | { mode: 'idle' }
  | { mode: 'pointing'; startScreen: [number, number]; startWorld: Point; vertex: number | null; shift: boolean }
  | { mode: 'dragging'; startWorld: Point; indices: number[]; origins: Point[]; grabbed: number; moved: Point[] | null }
  | { mode: 'marquee'; startWorld: Point; current: Point; additive: boolean };

const idle: SelectState = { mode: 'idle' };

/**
 * Select and move vertices. Click a vertex to select it, Shift-click to add or remove it,
 * drag from empty space for a marquee (Shift adds to the selection), drag a selected vertex to
 * move the whole selection (snapped: the grabbed vertex to the grid, or — dragging one vertex —
 * its facet from the previous vertex to the angle step). Arrow keys nudge, Delete removes.
 */
export const selectTool: Tool<SelectState> = {
  id: 'select',
  label: 'Select',
  shortcut: 'v',
  help: 'Select and drag vertices; Shift-click or drag a box for several.',
  initial: () => idle,

  down(_s, ctx, p) {
    const vertex = vertexAt(ctx, p.world);
    const effects: ToolEffect[] = [];
    if (vertex !== null) {
      if (p.shift) {
        const has = ctx.selection.includes(vertex);
        effects.push({ kind: 'select', indices: has ? ctx.selection.filter((i) => i !== vertex) : [...ctx.selection, vertex] });
      } else if (!ctx.selection.includes(vertex)) {
        effects.push({ kind: 'select', indices: [vertex] });
      }
    }
    return { state: { mode: 'pointing', startScreen: p.screen, startWorld: p.world, vertex, shift: p.shift }, effects, cursor: vertex !== null ? 'grabbing' : 'crosshair' };
  },

  move(s, ctx, p) {
    if (s.mode === 'idle') {
      const over = vertexAt(ctx, p.world);
      return { state: s, effects: [], cursor: over !== null ? 'grab' : 'default' };
    }
    if (s.mode === 'pointing') {
      if (!movedBeyondThreshold(s.startScreen, p.screen)) return { state: s, effects: [] };
      if (s.vertex === null) {
        const next: SelectState = { mode: 'marquee', startWorld: s.startWorld, current: p.world, additive: s.shift };
        return { state: next, effects: [{ kind: 'marquee', rect: rect(next.startWorld, p.world) }], cursor: 'crosshair' };
      }
      if (ctx.readOnly) return { state: s, effects: [] };
      const indices = ctx.selection.includes(s.vertex) ? [...ctx.selection] : [s.vertex];
      // The selection and the grabbed vertex index the committed points (the store keeps the
      // selection within them).
      const origins = indices.map((i): Point => {
        const q = itemAt(ctx.points, i);
        return [q[0], q[1]];
      });
      const dragging: SelectState = { mode: 'dragging', startWorld: s.startWorld, indices, origins, grabbed: s.vertex, moved: null };
      return selectTool.move(dragging, ctx, p);
    }
    if (s.mode === 'dragging') {
      const n = ctx.points.length;
      const k = s.indices.indexOf(s.grabbed);
      const origin = itemAt(s.origins, k);
      const raw: Point = [origin[0] + p.world[0] - s.startWorld[0], origin[1] + p.world[1] - s.startWorld[1]];
      const prev = (s.grabbed - 1 + n) % n;
      const anchor = s.indices.length === 1 && !s.indices.includes(prev) ? itemAt(ctx.points, prev) : null;
      const target = p.alt ? raw : snapPoint(raw, ctx.snap, anchor);
      const dx = target[0] - origin[0];
      const dy = target[1] - origin[1];
      const moved = s.origins.map(([x, y]) => tidyPoint(x + dx, y + dy));
      const preview = ctx.points.map((q) => [q[0], q[1]] as Point);
      s.indices.forEach((i, j) => {
        preview[i] = present(moved[j], j, moved);
      });
      return { state: { ...s, moved }, effects: [{ kind: 'preview', points: preview }, { kind: 'readout', vertex: s.grabbed }], cursor: 'grabbing' };
    }
    const next = { ...s, current: p.world };
    return { state: next, effects: [{ kind: 'marquee', rect: rect(s.startWorld, p.world) }], cursor: 'crosshair' };
  },

  up(s, ctx) {
    if (s.mode === 'dragging') {
      const effects: ToolEffect[] = [{ kind: 'preview', points: null }, { kind: 'readout', vertex: null }];
      const changed = s.moved && s.moved.some((m, j) => {
        const o = itemAt(s.origins, j);
        return m[0] !== o[0] || m[1] !== o[1];
      });
      if (s.moved && changed) effects.push({ kind: 'commit', op: { type: 'moveVertices', indices: s.indices, to: s.moved }, select: s.indices });
      return { state: idle, effects, cursor: 'grab' };
    }
    if (s.mode === 'marquee') {
      const inside = verticesInRect(ctx.points, rect(s.startWorld, s.current));
      const indices = s.additive ? [...new Set([...ctx.selection, ...inside])] : inside;
      return { state: idle, effects: [{ kind: 'marquee', rect: null }, { kind: 'select', indices }] };
    }
    if (s.mode === 'pointing' && s.vertex === null && !s.shift) return { state: idle, effects: [{ kind: 'select', indices: [] }] };
    return { state: idle, effects: [] };
  },

  key(s, ctx, k) {
    if (k.key === 'Escape') {
      if (s.mode !== 'idle') return selectTool.cancel(s);
      return { state: s, effects: [{ kind: 'select', indices: [] }] };
    }
    if (k.ctrl && k.key.toLowerCase() === 'a') return { state: s, effects: [{ kind: 'select', indices: ctx.points.map((_, i) => i) }] };
    if (s.mode !== 'idle' || ctx.readOnly || ctx.selection.length === 0) return null;
    const dir = ARROWS[k.key];
    if (dir) return nudge(s, ctx, k, dir);
    if (k.key === 'Delete' || k.key === 'Backspace') return deleteSelection(s, ctx);
    return null;
  },

  cancel: () => ({ state: idle, effects: [{ kind: 'preview', points: null }, { kind: 'marquee', rect: null }, { kind: 'readout', vertex: null }] }),
};

function rect(a: Point, b: Point) {
  return { x0: a[0], y0: a[1], x1: b[0], y1: b[1] };
}

function nudge(s: SelectState, ctx: ToolContext, k: KeyInput, dir: [number, number]): ToolStep<SelectState> {
  const [dx, dy] = nudgeBy(ctx, k, dir);
  const to = ctx.selection.map((i) => {
    const q = itemAt(ctx.points, i);
    return tidyPoint(q[0] + dx, q[1] + dy);
  });
  return { state: s, effects: [{ kind: 'commit', op: { type: 'moveVertices', indices: [...ctx.selection], to }, select: [...ctx.selection] }] };
}

function deleteSelection(s: SelectState, ctx: ToolContext): ToolStep<SelectState> {
  if (ctx.selection.length === 1) {
    return { state: s, effects: [{ kind: 'commit', op: { type: 'deleteVertex', index: firstItem(ctx.selection) }, select: [] }] };
  }
  const gone = new Set(ctx.selection);
  const points = ctx.points.filter((_, i) => !gone.has(i)).map((p) => [p[0], p[1]] as Point);
  return { state: s, effects: [{ kind: 'commit', op: { type: 'replaceSection', points }, select: [] }] };
}
