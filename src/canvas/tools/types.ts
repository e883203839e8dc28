import type { SketchOpDraft } from '@shared/model/ops';
import type { Point } from '@shared/model/sketch';
import { hitFacet, hitVertex, type Rect, type SnapSettings } from '../geometry';
import { isotropic, type View } from '../view';

/**
 * Editing tools are small state machines (idle → pointing → dragging …), one file each. A tool
 * gets the committed section, the selection, the view and the snap settings, and answers each
 * pointer or key event with its next state and a list of effects for the canvas to carry out.
 * Tools never touch Konva or the store; a drag keeps its preview in the effects and commits
 * one op on release.
 */
export const TOOL_IDS = ['select', 'draw', 'insert', 'delete', 'moveSection'] as const;
export type ToolId = (typeof TOOL_IDS)[number];

export interface ToolContext {
  points: readonly Point[];
  selection: readonly number[];
  view: View;
  snap: SnapSettings;
  readOnly: boolean;
}

export interface PointerInput {
  /** Pointer position in body axes (unsnapped). */
  world: Point;
  /** Pointer position on the canvas, pixels. */
  screen: [number, number];
  shift: boolean;
  /** Alt held: no snapping for this move. */
  alt: boolean;
}

export interface KeyInput {
  key: string;
  shift: boolean;
  alt: boolean;
  ctrl: boolean;
}

export type ToolEffect =
  /** Transient section to show (and solve live) instead of the committed one; null = none. */
  | { kind: 'preview'; points: Point[] | null }
  | { kind: 'select'; indices: number[] }
  /** One edit for the store; `select` is the selection to set after it applies. */
  | { kind: 'commit'; op: SketchOpDraft; select?: number[] }
  /** Marquee rectangle in body axes; null = none. */
  | { kind: 'marquee'; rect: Rect | null }
  /** The draw tool's open path and the rubber-band end; null = none. */
  | { kind: 'path'; points: Point[] | null; cursor: Point | null }
  /** A candidate point (insert tool) or null. */
  | { kind: 'ghost'; at: Point | null }
  /** A short hint for the status line; null clears it. */
  | { kind: 'hint'; text: string | null }
  /** Switch to another tool (the draw tool hands back to Select once a section is closed). */
  | { kind: 'tool'; id: ToolId }
  /** Show the section's t/c and ridge x/c (and this vertex's position) beside the dragged vertex; null = hide. */
  | { kind: 'readout'; vertex: number | null };

export interface ToolStep<S> {
  state: S;
  effects: ToolEffect[];
  /** CSS cursor for the canvas. */
  cursor?: string;
}

export interface Tool<S> {
  id: ToolId;
  label: string;
  /** Keyboard shortcut (single key, no modifier). */
  shortcut: string;
  /** One line on what the tool does, for its button's tooltip. */
  help: string;
  initial(): S;
  down(state: S, ctx: ToolContext, p: PointerInput): ToolStep<S>;
  move(state: S, ctx: ToolContext, p: PointerInput): ToolStep<S>;
  up(state: S, ctx: ToolContext, p: PointerInput): ToolStep<S>;
  /** A key while the canvas has focus; null = the tool does not use it. */
  key(state: S, ctx: ToolContext, k: KeyInput): ToolStep<S> | null;
  /** Leaves whatever the tool was doing (Escape, tool switch, pointer lost). */
  cancel(state: S): ToolStep<S>;
}

/** How close (pixels) the pointer must be to a vertex or facet to hit it. */
export const HIT_TOLERANCE_PX = 8;
/** How far (pixels) the pointer must travel before a press becomes a drag. */
export const DRAG_THRESHOLD_PX = 3;

export function hitTolerance(view: View): number {
  return HIT_TOLERANCE_PX / view.scale;
}

/** The vertex under the pointer (within HIT_TOLERANCE_PX on screen, whatever the exaggeration). */
export function vertexAt(ctx: Pick<ToolContext, 'points' | 'view'>, world: Point): number | null {
  return hitVertex(ctx.points, world, hitTolerance(ctx.view), isotropic(ctx.view));
}

/** The facet under the pointer and the nearest point on it (body axes). */
export function facetAt(ctx: Pick<ToolContext, 'points' | 'view'>, world: Point) {
  return hitFacet(ctx.points, world, hitTolerance(ctx.view), isotropic(ctx.view));
}

export function movedBeyondThreshold(a: readonly [number, number], b: readonly [number, number]): boolean {
  return Math.hypot(a[0] - b[0], a[1] - b[1]) > DRAG_THRESHOLD_PX;
}

/**
 * The nudge for an arrow key, body axes: one snap step along the arrow's axis (steps follow the
 * zoom and the thickness); Shift ×10 (coarse), Alt ÷10 (fine).
 */
export function nudgeBy(ctx: ToolContext, k: KeyInput, dir: readonly [number, number]): [number, number] {
  const factor = (k.shift ? 10 : 1) * (k.alt ? 0.1 : 1);
  return [dir[0] * ctx.snap.stepX * factor, dir[1] * ctx.snap.stepY * factor];
}

export const ARROWS: Record<string, [number, number]> = {
  ArrowLeft: [-1, 0],
  ArrowRight: [1, 0],
  ArrowUp: [0, 1],
  ArrowDown: [0, -1],
};
