/**
 * The caution every results view and every exported result carries (README: "Caution").
 * One constant so the wording cannot drift between the editor, exports and reports.
 */
export const RESULTS_CAUTION =
  'Inviscid preliminary estimate — verify by test or higher-fidelity analysis; defer to applicable codes and licensed engineering practice.';

/**
 * The same caution in short, for a place read together with the figures (under the results
 * panel's status line); the full sentence stays at the panel's foot and in every export.
 */
export const RESULTS_CAUTION_SHORT = 'Inviscid preliminary estimate — verify by test or higher-fidelity analysis; defer to codes and licensed practice.';
