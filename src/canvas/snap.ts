import type { SnapSettings } from './geometry';
import { formatNumber } from '@shared/format/number';
import { niceStep, niceStepBelow } from './grid';
import { scaleY, type View } from './view';

/** Snap settings as the toolbar holds them. */
export interface CanvasSnap {
  /** Snap positions on (Alt held frees one drag; S switches it). */
  grid: boolean;
  /** Chord units, or 'auto' = fine steps that follow the zoom and the section's thickness (`snapSteps`). */
  gridStep: number | 'auto';
  /** 0 = off. */
  angleStepDeg: number;
}

export const DEFAULT_SNAP: CanvasSnap = { grid: true, gridStep: 'auto', angleStepDeg: 0 };

/** An automatic step is at least this many pixels on screen, so each value can be reached by hand. */
export const SNAP_STEP_MIN_PX = 3;
/** An automatic x step is at most this fraction of the chord (x/c in 1 % steps or finer). */
export const SNAP_CHORD_FRACTION = 1 / 100;
/** An automatic y step is at most this fraction of the section's thickness (t/c in 2 % of itself or finer). */
export const SNAP_THICKNESS_FRACTION = 1 / 50;

/** What the automatic steps depend on, in chord units (the committed section's chord and thickness, or its height). */
export interface SnapScale {
  chord: number;
  thickness: number;
}

/**
 * The snap steps along x and y. A fixed step applies to both axes. 'auto' takes, per axis, the
 * roundest step (1, 2, 5 × 10^k) that is still at least SNAP_STEP_MIN_PX on screen, then no
 * coarser than 1/100 of the chord along x and 1/50 of the thickness along y: a 5 % section
 * fitted to the canvas moves its ridge in 0.001 c steps (t/c in 0.1 %), where the grid lines
 * are 0.05 c apart; zooming in makes the steps finer, and a vertical exaggeration makes y's
 * finer than x's.
 */
export function snapSteps(snap: CanvasSnap, view: View, section: SnapScale | null): Pick<SnapSettings, 'stepX' | 'stepY'> {
  if (snap.gridStep !== 'auto') return { stepX: snap.gridStep, stepY: snap.gridStep };
  let stepX = niceStep(SNAP_STEP_MIN_PX / view.scale);
  let stepY = niceStep(SNAP_STEP_MIN_PX / scaleY(view));
  if (section && section.chord > 0) stepX = Math.min(stepX, niceStepBelow(section.chord * SNAP_CHORD_FRACTION));
  if (section && section.thickness > 0) stepY = Math.min(stepY, niceStepBelow(section.thickness * SNAP_THICKNESS_FRACTION));
  return { stepX, stepY };
}

/**
 * "0.001 c" or "x 0.01 c, y 0.001 c" for the toolbar. The steps are in drawing units; `chord`
 * is the section's reference chord in those units (1 unless the section was imported at its
 * physical size, when the drawing is in metres), so the label always counts chords.
 */
export function stepsLabel(steps: Pick<SnapSettings, 'stepX' | 'stepY'>, chord = 1): string {
  const x = inChords(steps.stepX, chord);
  const y = inChords(steps.stepY, chord);
  return x === y ? `${x} c` : `x ${x} c, y ${y} c`;
}

/** A length in drawing units as chords, to 3 significant figures (exact for a unit chord). */
export function inChords(length: number, chord = 1): string {
  const unit = chord > 0 && Number.isFinite(chord) ? chord : 1;
  return unit === 1 ? String(length) : formatNumber(length / unit, 3);
}
