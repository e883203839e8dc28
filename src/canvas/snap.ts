/** Snap settings as the toolbar holds them: the grid step may follow the visible grid. */
export interface CanvasSnap {
  grid: boolean;
  /** Chord units, or 'auto' = the spacing of the grid lines on screen. */
  gridStep: number | 'auto';
  /** 0 = off. */
  angleStepDeg: number;
}

export const DEFAULT_SNAP: CanvasSnap = { grid: true, gridStep: 'auto', angleStepDeg: 0 };
