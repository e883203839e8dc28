/**
 * The caution every results view and every exported result carries (README: "Caution").
 * One constant so the wording cannot drift between the editor, exports and reports.
 */
export const RESULTS_CAUTION =
  'Inviscid preliminary estimate — verify by test or higher-fidelity analysis; defer to applicable codes and licensed engineering practice.';
