/** Client timing constants, one place, unit in the name. */

/** Quiet time after the last edit before the sketch is saved. */
export const AUTOSAVE_DEBOUNCE_MS = 800;

/** Wait before retrying a save that failed for a reason other than a conflict. */
export const AUTOSAVE_RETRY_MS = 5_000;

/** During a drag the results panel and status line refresh once the pointer has paused this long (the canvas always). */
export const PANEL_SETTLE_DURING_DRAG_MS = 120;

/** How long the reason for a refused canvas edit stays over the canvas. */
export const REJECTION_SHOWN_MS = 6_000;

/** After edits settle, fetch the server's stored solve of the new revision this much later. */
export const SERVER_RESULT_REFRESH_MS = 800;

/** How often the realtime channel checks for revision gaps and stale cursors. */
export const SYNC_TICK_MS = 250;

/** A walkthrough lead re-sends the view this often so late joiners line up. */
export const WALKTHROUGH_HEARTBEAT_MS = 1_000;

/** Longest the editor waits for an import's new section to arrive before fitting the view anyway. */
export const IMPORT_SHOWN_WAIT_MS = 5_000;
