/** Client timing constants, one place, unit in the name. */

/** Quiet time after the last edit before the sketch is saved. */
export const AUTOSAVE_DEBOUNCE_MS = 800;

/** Wait before retrying a save that failed for a reason other than a conflict. */
export const AUTOSAVE_RETRY_MS = 5_000;

/** During a drag the results panel and status line refresh once the pointer has paused this long (the canvas always). */
export const PANEL_SETTLE_DURING_DRAG_MS = 120;

/** How long the reason for a refused canvas edit stays over the canvas. */
export const REJECTION_SHOWN_MS = 6_000;
