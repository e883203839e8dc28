import { describe, expect, it } from 'vitest';
import type { Point } from '@shared/model/sketch';
import { applyOp, withOpId } from '@shared/model/ops';
import { defaultSketchDocument } from '@shared/model/sketch';
import { selectTool, type SelectState } from '@/canvas/tools/selectTool';
import { drawTool } from '@/canvas/tools/drawTool';
import { insertTool } from '@/canvas/tools/insertTool';
import { deleteTool } from '@/canvas/tools/deleteTool';
import { moveSectionTool } from '@/canvas/tools/moveSectionTool';
import type { PointerInput, ToolContext, ToolEffect } from '@/canvas/tools/types';
import { toScreen, type View } from '@/canvas/view';
import { itemAt } from '@shared/util/invariant';

/** 1000 px per chord, body origin at (100, 300): vertex (0.5, 0.025) is at screen (600, 275). */
const view: View = { scale: 1000, originX: 100, originY: 300 };
const wedge: Point[] = [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]];

function ctx(extra: Partial<ToolContext> = {}): ToolContext {
  return { points: wedge, selection: [], view, snap: { grid: false, stepX: 0.01, stepY: 0.01, angleStepDeg: 0 }, readOnly: false, ...extra };
}

function at(world: Point, mods: Partial<PointerInput> = {}): PointerInput {
  return { world, screen: toScreen(view, world), shift: false, alt: false, ...mods };
}

function find<K extends ToolEffect['kind']>(effects: ToolEffect[], kind: K) {
  return effects.filter((e): e is Extract<ToolEffect, { kind: K }> => e.kind === kind);
}

/** The first effect of a kind; throws (naming the index and the count) when there is none. */
function first<K extends ToolEffect['kind']>(effects: ToolEffect[], kind: K) {
  return itemAt(find(effects, kind), 0);
}

describe('select tool', () => {
  it('click on a vertex selects it; click on empty space clears', () => {
    const down = selectTool.down(selectTool.initial(), ctx(), at([0.5, 0.025]));
    expect(find(down.effects, 'select')).toEqual([{ kind: 'select', indices: [1] }]);
    const up = selectTool.up(down.state, ctx({ selection: [1] }), at([0.5, 0.025]));
    expect(up.effects).toEqual([]);
    const d2 = selectTool.down(up.state, ctx({ selection: [1] }), at([0.2, 0.3]));
    const u2 = selectTool.up(d2.state, ctx({ selection: [1] }), at([0.2, 0.3]));
    expect(u2.effects).toEqual([{ kind: 'select', indices: [] }]);
  });

  it('shift-click adds and removes vertices', () => {
    const add = selectTool.down(selectTool.initial(), ctx({ selection: [1] }), at([1, 0], { shift: true }));
    expect(first(add.effects, 'select').indices).toEqual([1, 2]);
    const remove = selectTool.down(selectTool.initial(), ctx({ selection: [1, 2] }), at([1, 0], { shift: true }));
    expect(first(remove.effects, 'select').indices).toEqual([1]);
  });

  it('[K1] a drag previews every move and commits one moveVertices on release', () => {
    // Arrange: vertex 1 selected, pressed.
    let s: SelectState = selectTool.down(selectTool.initial(), ctx(), at([0.5, 0.025])).state;
    const c = ctx({ selection: [1] });
    // Act: three moves, then release.
    const previews: Point[][] = [];
    for (const y of [0.03, 0.035, 0.04]) {
      const step = selectTool.move(s, c, at([0.5, y]));
      s = step.state;
      previews.push(first(step.effects, 'preview').points!);
      expect(find(step.effects, 'commit')).toEqual([]);
    }
    const up = selectTool.up(s, c, at([0.5, 0.04]));
    // Assert
    expect(previews.map((p) => itemAt(p, 1)[1])).toEqual([0.03, 0.035, 0.04]);
    expect(find(up.effects, 'preview')).toEqual([{ kind: 'preview', points: null }]);
    const commits = find(up.effects, 'commit');
    expect(commits).toHaveLength(1);
    expect(itemAt(commits, 0).op).toEqual({ type: 'moveVertices', indices: [1], to: [[0.5, 0.04]] });
  });

  it('a press that moves less than the drag threshold commits nothing', () => {
    const d = selectTool.down(selectTool.initial(), ctx(), at([0.5, 0.025]));
    const m = selectTool.move(d.state, ctx({ selection: [1] }), { ...at([0.5, 0.025]), screen: [601, 276] });
    const u = selectTool.up(m.state, ctx({ selection: [1] }), at([0.5, 0.025]));
    expect(find(u.effects, 'commit')).toEqual([]);
  });

  it('drags the whole selection together, snapping the grabbed vertex to the grid', () => {
    const c = ctx({ selection: [1, 3], snap: { grid: true, stepX: 0.01, stepY: 0.01, angleStepDeg: 0 } });
    const d = selectTool.down(selectTool.initial(), c, at([0.5, 0.025]));
    const m = selectTool.move(d.state, c, at([0.4132, 0.0368]));
    const u = selectTool.up(m.state, c, at([0.4132, 0.0368]));
    // Grabbed vertex 1 lands on (0.41, 0.04); vertex 3 keeps its offset (0, −0.05).
    expect(first(u.effects, 'commit').op).toEqual({ type: 'moveVertices', indices: [1, 3], to: [[0.41, 0.04], [0.41, -0.01]] });
  });

  it('angle snapping turns the dragged facet (from the previous vertex) to the step', () => {
    const c = ctx({ selection: [1], snap: { grid: false, stepX: 0.01, stepY: 0.01, angleStepDeg: 5 } });
    const d = selectTool.down(selectTool.initial(), c, at([0.5, 0.025]));
    const m = selectTool.move(d.state, c, at([0.5, 0.046]));
    const preview = first(m.effects, 'preview').points;
    expect(preview).not.toBeNull();
    const p = itemAt(preview ?? [], 1);
    const angle = (Math.atan2(p[1], p[0]) * 180) / Math.PI;
    expect(angle).toBeCloseTo(5, 9);
  });

  it('a marquee selects the vertices inside it; with Shift it adds to the selection', () => {
    const d = selectTool.down(selectTool.initial(), ctx(), at([0.4, 0.1]));
    const m = selectTool.move(d.state, ctx(), at([1.1, -0.1]));
    expect(first(m.effects, 'marquee').rect).toEqual({ x0: 0.4, y0: 0.1, x1: 1.1, y1: -0.1 });
    const u = selectTool.up(m.state, ctx(), at([1.1, -0.1]));
    expect(first(u.effects, 'select').indices).toEqual([1, 2, 3]);
    const d2 = selectTool.down(selectTool.initial(), ctx({ selection: [0] }), at([0.9, 0.1], { shift: true }));
    const m2 = selectTool.move(d2.state, ctx({ selection: [0] }), at([1.1, -0.1], { shift: true }));
    const u2 = selectTool.up(m2.state, ctx({ selection: [0] }), at([1.1, -0.1]));
    expect(first(u2.effects, 'select').indices).toEqual([0, 2]);
  });

  it('arrow keys nudge the selection by a grid step (Shift ×10), Delete removes it', () => {
    const c = ctx({ selection: [1], snap: { grid: true, stepX: 0.01, stepY: 0.01, angleStepDeg: 0 } });
    const up = selectTool.key(selectTool.initial(), c, { key: 'ArrowUp', shift: false, alt: false, ctrl: false });
    expect(first(up!.effects, 'commit').op).toEqual({ type: 'moveVertices', indices: [1], to: [[0.5, 0.035]] });
    const left = selectTool.key(selectTool.initial(), c, { key: 'ArrowLeft', shift: true, alt: false, ctrl: false });
    expect(first(left!.effects, 'commit').op).toEqual({ type: 'moveVertices', indices: [1], to: [[0.4, 0.025]] });
    const del = selectTool.key(selectTool.initial(), c, { key: 'Delete', shift: false, alt: false, ctrl: false });
    expect(first(del!.effects, 'commit').op).toEqual({ type: 'deleteVertex', index: 1 });
    const many = selectTool.key(selectTool.initial(), ctx({ selection: [1, 3] }), { key: 'Delete', shift: false, alt: false, ctrl: false });
    expect(first(many!.effects, 'commit').op).toEqual({ type: 'replaceSection', points: [[0, 0], [1, 0]] });
  });

  it('a drag shows the readout at the grabbed vertex and hides it on release', () => {
    const c = ctx({ selection: [1] });
    const d = selectTool.down(selectTool.initial(), c, at([0.5, 0.025]));
    const m = selectTool.move(d.state, c, at([0.5, 0.03]));
    expect(find(m.effects, 'readout')).toEqual([{ kind: 'readout', vertex: 1 }]);
    const u = selectTool.up(m.state, c, at([0.5, 0.03]));
    expect(find(u.effects, 'readout')).toEqual([{ kind: 'readout', vertex: null }]);
  });

  it('arrow keys move by the step of their axis: up by stepY, right by stepX; Alt ÷10, Shift ×10', () => {
    const c = ctx({ selection: [1], snap: { grid: true, stepX: 0.01, stepY: 0.001, angleStepDeg: 0 } });
    const key = (k: string, mods: { shift?: boolean; alt?: boolean } = {}) =>
      first(selectTool.key(selectTool.initial(), c, { key: k, shift: !!mods.shift, alt: !!mods.alt, ctrl: false })!.effects, 'commit').op;
    expect(key('ArrowUp')).toEqual({ type: 'moveVertices', indices: [1], to: [[0.5, 0.026]] });
    expect(key('ArrowRight')).toEqual({ type: 'moveVertices', indices: [1], to: [[0.51, 0.025]] });
    expect(key('ArrowDown', { alt: true })).toEqual({ type: 'moveVertices', indices: [1], to: [[0.5, 0.0249]] });
    expect(key('ArrowUp', { shift: true })).toEqual({ type: 'moveVertices', indices: [1], to: [[0.5, 0.035]] });
  });

  it('[K2] read-only: selecting works, dragging does not', () => {
    const c = ctx({ readOnly: true, selection: [1] });
    const d = selectTool.down(selectTool.initial(), c, at([0.5, 0.025]));
    const m = selectTool.move(d.state, c, at([0.5, 0.05]));
    expect(find(m.effects, 'preview')).toEqual([]);
    expect(selectTool.key(selectTool.initial(), c, { key: 'ArrowUp', shift: false, alt: false, ctrl: false })).toBeNull();
  });
});

describe('draw tool', () => {
  it('places snapped vertices and closes on the first one with one replaceSection', () => {
    const c = ctx({ snap: { grid: true, stepX: 0.1, stepY: 0.1, angleStepDeg: 0 } });
    let s = drawTool.initial();
    for (const p of [[0.02, -0.01], [0.48, 0.12], [1.03, 0.01], [0.52, -0.09]] as Point[]) s = drawTool.down(s, c, at(p)).state;
    expect(s.path).toEqual([[0, 0], [0.5, 0.1], [1, 0], [0.5, -0.1]]);
    const close = drawTool.down(s, c, at([0.001, 0.001]));
    expect(close.state.path).toEqual([]);
    const op = first(close.effects, 'commit').op;
    expect(op).toEqual({ type: 'replaceSection', points: [[0, 0], [0.5, 0.1], [1, 0], [0.5, -0.1]] });
    expect(applyOp(defaultSketchDocument(), withOpId(op)).ok).toBe(true);
  });

  it('Enter closes, Backspace removes the last vertex, Escape abandons', () => {
    let s = drawTool.initial();
    for (const p of [[0, 0], [0.5, 0.1], [1, 0]] as Point[]) s = drawTool.down(s, ctx(), at(p)).state;
    const back = drawTool.key(s, ctx(), { key: 'Backspace', shift: false, alt: false, ctrl: false })!;
    expect(back.state.path).toHaveLength(2);
    const enterTooFew = drawTool.key(back.state, ctx(), { key: 'Enter', shift: false, alt: false, ctrl: false })!;
    expect(find(enterTooFew.effects, 'commit')).toEqual([]);
    const enter = drawTool.key(s, ctx(), { key: 'Enter', shift: false, alt: false, ctrl: false })!;
    expect(find(enter.effects, 'commit')).toHaveLength(1);
    const esc = drawTool.key(s, ctx(), { key: 'Escape', shift: false, alt: false, ctrl: false })!;
    expect(esc.state.path).toEqual([]);
  });
});

describe('draw tool stops after a polygon closes', () => {
  it('closing commits once and hands back to Select (the next click does not start a new section)', () => {
    let s = drawTool.initial();
    for (const p of [[0, 0], [0.5, 0.1], [1, 0]] as Point[]) s = drawTool.down(s, ctx(), at(p)).state;
    const closed = drawTool.down(s, ctx(), at([0, 0]));
    expect(find(closed.effects, 'commit')).toHaveLength(1);
    expect(find(closed.effects, 'tool')).toEqual([{ kind: 'tool', id: 'select' }]);
    expect(first(closed.effects, 'hint').text).toMatch(/3 vertices drawn; Select is on/);
    // The tool switch cancels the (now empty) draw tool: that keeps the hint.
    expect(drawTool.cancel(closed.state).effects).toEqual([]);
  });

  it('a path that would cross itself is not closed: it stays, with the reason', () => {
    let s = drawTool.initial();
    for (const p of [[0, 0], [1, 0.1], [1, 0], [0, 0.1]] as Point[]) s = drawTool.down(s, ctx(), at(p)).state;
    const enter = drawTool.key(s, ctx(), { key: 'Enter', shift: false, alt: false, ctrl: false })!;
    expect(find(enter.effects, 'commit')).toEqual([]);
    expect(find(enter.effects, 'tool')).toEqual([]);
    expect(enter.state.path).toHaveLength(4);
    expect(first(enter.effects, 'hint').text).toMatch(/^Not closed: facet .* would cross/);
  });
});

describe('insert, delete and move-section tools', () => {
  it('insert puts a vertex on the clicked facet, right after its first vertex', () => {
    const step = insertTool.down(insertTool.initial(), ctx(), at([0.25, 0.0128]));
    const commit = first(step.effects, 'commit');
    expect(commit.op.type).toBe('insertVertex');
    if (commit.op.type !== 'insertVertex') return;
    expect(commit.op.index).toBe(1);
    expect(commit.op.at[0]).toBeCloseTo(0.25, 3);
    expect(commit.op.at[1]).toBeCloseTo(0.0125, 4);
    expect(commit.select).toEqual([1]);
  });

  it('delete removes the clicked vertex and ignores empty space', () => {
    expect(first(deleteTool.down(deleteTool.initial(), ctx(), at([1, 0])).effects, 'commit').op).toEqual({ type: 'deleteVertex', index: 2 });
    expect(deleteTool.down(deleteTool.initial(), ctx(), at([2, 2])).effects).toEqual([]);
  });

  it('[K1] move-section drags all vertices by a grid-snapped offset and commits once', () => {
    const c = ctx({ snap: { grid: true, stepX: 0.1, stepY: 0.1, angleStepDeg: 0 } });
    const d = moveSectionTool.down(moveSectionTool.initial(), c, at([0.5, 0]));
    const m = moveSectionTool.move(d.state, c, at([0.73, 0.18]));
    expect(first(m.effects, 'preview').points![0]).toEqual([0.2, 0.2]);
    const u = moveSectionTool.up(m.state, c, at([0.73, 0.18]));
    expect(first(u.effects, 'commit').op).toEqual({ type: 'moveVertices', indices: [0, 1, 2, 3], to: [[0.2, 0.2], [0.7, 0.225], [1.2, 0.2], [0.7, 0.175]] });
  });

  it('move-section commits nothing when a colleague added or removed a vertex during the drag (the move was for another outline)', () => {
    const c = ctx();
    const d = moveSectionTool.down(moveSectionTool.initial(), c, at([0.5, 0]));
    const m = moveSectionTool.move(d.state, c, at([0.7, 0.1]));
    const fewer = moveSectionTool.up(m.state, ctx({ points: wedge.slice(0, 3) }), at([0.7, 0.1]));
    expect(find(fewer.effects, 'commit')).toEqual([]);
    expect(find(fewer.effects, 'preview')).toEqual([{ kind: 'preview', points: null }]);
    const more = moveSectionTool.up(m.state, ctx({ points: [...wedge, [0.2, -0.01]] }), at([0.7, 0.1]));
    expect(find(more.effects, 'commit')).toEqual([]);
  });
});
