import { z } from 'zod';
import { itemAt } from '../util/invariant.ts';
import { isIdOf } from './ids.ts';
import { textSchema } from './text.ts';
import { csvHeader, csvNote, csvRow } from '../format/csv.ts';
import { normalForceCoefficient, shownXcpOverC, XCP_UNDEFINED_NOTE } from '../flight/xcp.ts';
import { pageOf } from './teams.ts';
import { designPointIdSchema, FRICTION_SETTINGS, transitionReynoldsSchema } from './sketch.ts';
import { ANALYSIS_STATUSES } from './analysis.ts';

/**
 * A study: a sweep of one sketch over Mach × α × flap deflection at one altitude and friction
 * regime. Declared once here; the browser worker, the API and the stored rows all use these.
 *
 * Invariants (tests cite the ids):
 * - [ST1] A study point is computed by the same code as a single analysis (`analyseSketch` with
 *   `waves: false`): its numbers equal a single solve at that Mach, α and deflection.
 * - [ST2] Ranges expand start, start + step, … up to end inclusive (within 1e-9 of a step);
 *   Mach lists and flap deflections are sorted and de-duplicated; a sketch without a flap is
 *   swept at the one "no flap" deflection (null).
 * - [ST3] Stored and transferred rows keep 7 significant figures (`packStudyRows`).
 * - [ST4] At most STUDY_MAX_POINTS points per study.
 */

export const STUDY_MAX_POINTS = 20_000;
export const STUDY_MAX_MACH_VALUES = 100;
export const STUDY_MAX_ALPHA_VALUES = 721;
export const STUDY_MAX_FLAP_VALUES = 21;
/** Significant figures kept in packed rows ([ST3]). */
export const STUDY_SIGNIFICANT_DIGITS = 7;

const mach = z.number({ error: 'must be a number' }).gt(1, 'must be above 1 (supersonic)').lte(50, 'must be at most 50');
const alpha = z.number({ error: 'must be a number' }).gt(-90, 'must be above −90°').lt(90, 'must be below 90°');

export const machSpecSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('list'),
    values: z.array(mach).min(1, 'give at least one Mach number').max(STUDY_MAX_MACH_VALUES, `at most ${STUDY_MAX_MACH_VALUES} Mach numbers`),
  }),
  z.strictObject({ kind: z.literal('range'), start: mach, end: mach, step: z.number({ error: 'must be a number' }).gt(0, 'must be above 0') }),
]);
export type MachSpec = z.infer<typeof machSpecSchema>;

export const alphaRangeSchema = z.strictObject({
  startDeg: alpha,
  endDeg: alpha,
  stepDeg: z.number({ error: 'must be a number' }).gt(0, 'must be above 0'),
});
export type AlphaRange = z.infer<typeof alphaRangeSchema>;

export const studyFrictionSchema = z.enum(FRICTION_SETTINGS);

const definitionObject = z.strictObject({
  /**
   * The design point the study starts from: its γ, and its flap deflection when `flapDeg` is
   * empty. Absent: the sketch's selected point when the study runs.
   */
  designPointId: designPointIdSchema.optional(),
  mach: machSpecSchema,
  alpha: alphaRangeSchema,
  /** Flap deflections, degrees, trailing edge down positive; ignored when the sketch has no flap,
   *  and empty means "the design point's own deflection". */
  flapDeg: z
    .array(z.number({ error: 'must be a number' }).gte(-45, 'must be at least −45°').lte(45, 'must be at most 45°'))
    .max(STUDY_MAX_FLAP_VALUES, `at most ${STUDY_MAX_FLAP_VALUES} deflections`)
    .default([]),
  /** Geometric altitude for friction drag (1976 standard atmosphere); null = wave drag only. */
  altitudeM: z.number({ error: 'must be a number' }).min(0, 'must be at least 0 m').max(86_000, 'must be at most 86 km').nullable().default(null),
  friction: studyFrictionSchema.default('turbulent'),
  /** Transition Reynolds number for mixed friction; absent = 5×10⁵. */
  transitionReynolds: transitionReynoldsSchema.optional(),
});

export const studyDefinitionSchema = definitionObject.superRefine((def, ctx) => {
  if (def.mach.kind === 'range') {
    if (def.mach.end < def.mach.start) ctx.addIssue({ code: 'custom', path: ['mach', 'end'], message: 'must not be below the start' });
    else if (rangeCount(def.mach.start, def.mach.end, def.mach.step) > STUDY_MAX_MACH_VALUES) {
      ctx.addIssue({ code: 'custom', path: ['mach', 'step'], message: `gives more than ${STUDY_MAX_MACH_VALUES} Mach numbers; use a larger step` });
    }
  }
  if (def.alpha.endDeg < def.alpha.startDeg) ctx.addIssue({ code: 'custom', path: ['alpha', 'endDeg'], message: 'must not be below the start' });
  else if (rangeCount(def.alpha.startDeg, def.alpha.endDeg, def.alpha.stepDeg) > STUDY_MAX_ALPHA_VALUES) {
    ctx.addIssue({ code: 'custom', path: ['alpha', 'stepDeg'], message: `gives more than ${STUDY_MAX_ALPHA_VALUES} incidences; use a larger step` });
  }
  const n = machValues(def.mach).length * alphaValues(def.alpha).length * Math.max(1, new Set(def.flapDeg).size);
  if (n > STUDY_MAX_POINTS) ctx.addIssue({ code: 'custom', path: [], message: `the study has ${n} points; at most ${STUDY_MAX_POINTS} are allowed` });
});
export type StudyDefinition = z.infer<typeof studyDefinitionSchema>;
export type StudyDefinitionInput = z.input<typeof studyDefinitionSchema>;

/** Number of values of start, start + step, … ≤ end (inclusive within 1e-9 of a step). */
function rangeCount(start: number, end: number, step: number): number {
  if (!(step > 0) || end < start) return 0;
  return Math.floor((end - start) / step + 1e-9) + 1;
}

/** Values of a range, each rounded to 10 decimals so that 0.1-steps read as typed ([ST2]). */
export function rangeValues(start: number, end: number, step: number): number[] {
  const n = Math.min(rangeCount(start, end, step), 100_000);
  return Array.from({ length: n }, (_, i) => Number((start + i * step).toFixed(10)));
}

const sortedUnique = (values: number[]) => [...new Set(values)].sort((a, b) => a - b);

export function machValues(spec: MachSpec): number[] {
  return spec.kind === 'list' ? sortedUnique(spec.values) : rangeValues(spec.start, spec.end, spec.step);
}

export function alphaValues(range: AlphaRange): number[] {
  return rangeValues(range.startDeg, range.endDeg, range.stepDeg);
}

/** The deflections swept: null (no flap) for a sketch without one; else the study's, or the sketch's own. */
export function flapValues(flapDeg: number[], sketchFlapDeg: number | null): (number | null)[] {
  if (sketchFlapDeg === null) return [null];
  return flapDeg.length ? sortedUnique(flapDeg) : [sketchFlapDeg];
}

/** A study point's status is its analysis' status. */
export const STUDY_STATUSES = ANALYSIS_STATUSES;
export type StudyStatus = (typeof STUDY_STATUSES)[number];

/**
 * One point of a study. Coefficients per unit span over q∞·c (cm over q∞·c² about the sketch's
 * moment point, nose up positive; ch over q∞·c_f² about the hinge, positive trailing edge down).
 * Exact values are null unless the status is ok; the thin-section theories are given whenever
 * the solver gives them (they ignore the limits). cd is wave drag; cdFriction is null without an
 * altitude or with friction "none", and cdTotal = cd + (cdFriction ?? 0). Unpacked rows are
 * parsed by this schema, so a stored column of the wrong kind is an error, not a wrong number.
 */
const coefficient = z.number().nullable();
export const studyRowSchema = z.object({
  mach: z.number(),
  alphaDeg: z.number(),
  flapDeg: z.number().nullable(),
  status: z.enum(STUDY_STATUSES),
  cl: coefficient,
  cd: coefficient,
  cdFriction: coefficient,
  cdTotal: coefficient,
  cm: coefficient,
  xcpOverC: coefficient,
  /** cl / cdTotal (wave + friction where estimated). */
  liftToDrag: coefficient,
  /** cl / cd (wave drag only), the solver's figure. */
  liftToDragWave: coefficient,
  chExact: coefficient,
  chLinear: coefficient,
  chSecondOrder: coefficient,
  clLinear: coefficient,
  cdLinear: coefficient,
  cmLinear: coefficient,
  clSecondOrder: coefficient,
  cdSecondOrder: coefficient,
  cmSecondOrder: coefficient,
  /**
   * Section loads per unit span, SI, at the study's altitude on the sketch's physical chord
   * (`StudyResults.chordM`): lift, total drag (wave + friction), pitching moment and hinge moment
   * (cl·q∞·c, cdTotal·q∞·c, cm·q∞·c², ch·q∞·c_f²). Null without an altitude or when the exact
   * result is not valid; absent (null) in studies stored before these columns existed. For the
   * span, multiply by `StudyResults.spanM`.
   */
  liftNPerM: coefficient,
  dragNPerM: coefficient,
  momentNMPerM: coefficient,
  hingeMomentNMPerM: coefficient,
  /** Why the point is not ok: the first limit's sentence (or why it could not be solved). */
  limit: z.string().nullable(),
});
export type StudyRow = z.infer<typeof studyRowSchema>;

/** Column order of packed rows and CSV files. */
export const STUDY_COLUMNS = [
  'mach', 'alphaDeg', 'flapDeg', 'status', 'cl', 'cd', 'cdFriction', 'cdTotal', 'cm', 'xcpOverC', 'liftToDrag',
  'liftToDragWave', 'chExact', 'chLinear', 'chSecondOrder', 'clLinear', 'cdLinear', 'cmLinear', 'clSecondOrder',
  'cdSecondOrder', 'cmSecondOrder', 'liftNPerM', 'dragNPerM', 'momentNMPerM', 'hingeMomentNMPerM', 'limit',
] as const satisfies readonly (keyof StudyRow)[];

export type StudyColumn = (typeof STUDY_COLUMNS)[number];

/** One packed row: the values of STUDY_COLUMNS in order ([ST3]). */
export const packedRowSchema = z.array(z.union([z.number(), z.string(), z.null()]));
export type PackedRow = z.infer<typeof packedRowSchema>;

/** Per Mach: where the nose shock detaches, and the best L/D point for each deflection. */
export const studyMachSummarySchema = z.object({
  mach: z.number(),
  /** α above which the lower-surface nose shock detaches (its deflection α − φ exceeds θmax), degrees. */
  detachAlphaHighDeg: z.number().nullable(),
  /** α below which the upper-surface nose shock detaches (φ − α exceeds θmax), degrees. */
  detachAlphaLowDeg: z.number().nullable(),
  best: z.array(z.object({ flapDeg: z.number().nullable(), alphaDeg: z.number(), liftToDrag: z.number(), cl: z.number(), cdTotal: z.number() })),
});
export type StudyMachSummary = z.infer<typeof studyMachSummarySchema>;

/**
 * A study's results as the engine returns them, the server stores them (studies.results) and
 * the API sends them; read back through this schema at every edge (database row, API answer).
 */
export const studyResultsSchema = z.object({
  version: z.literal(1),
  machs: z.array(z.number()),
  alphasDeg: z.array(z.number()),
  flapsDeg: z.array(z.number().nullable()),
  altitudeM: z.number().nullable(),
  friction: studyFrictionSchema,
  /** Transition Reynolds number of mixed friction (absent in results stored before it existed). */
  transitionReynolds: z.number().optional(),
  /** The sketch's physical chord and span (m) the loads columns were computed on (absent before they existed). */
  chordM: z.number().optional(),
  spanM: z.number().optional(),
  /** Column names of `rows` (STUDY_COLUMNS when written; readers look columns up by name). */
  columns: z.array(z.enum(STUDY_COLUMNS)).readonly(),
  /** [ST3] packed rows, flap outermost, then Mach, then α (ascending). */
  rows: z.array(packedRowSchema),
  summaries: z.array(studyMachSummarySchema),
  counts: z.partialRecord(z.enum(STUDY_STATUSES), z.number().int().min(0)),
});
export type StudyResults = z.infer<typeof studyResultsSchema>;

/**
 * v to STUDY_SIGNIFICANT_DIGITS significant figures. Integer arithmetic with exact powers of ten
 * gives the double nearest the rounded decimal (what parsing toPrecision's text gives) at a
 * fraction of the cost: packing calls this a quarter of a million times for a large study.
 */
export function roundSignificant(v: number): number {
  if (v === 0) return 0; // also turns −0 into 0
  if (!Number.isFinite(v)) return v;
  const decimals = STUDY_SIGNIFICANT_DIGITS - 1 - Math.floor(Math.log10(Math.abs(v)));
  if (decimals > 22 || decimals < -22) return Number(v.toPrecision(STUDY_SIGNIFICANT_DIGITS));
  if (decimals >= 0) {
    const f = itemAt(POW10, decimals);
    return Math.round(v * f) / f;
  }
  const f = itemAt(POW10, -decimals);
  return Math.round(v / f) * f;
}
const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);
const round = roundSignificant;

/** Rows → arrays in STUDY_COLUMNS order, numbers to 7 significant figures ([ST3]). */
export function packStudyRows(rows: readonly StudyRow[]): PackedRow[] {
  return rows.map((r) => STUDY_COLUMNS.map((k) => (typeof r[k] === 'number' ? round(r[k] as number) : (r[k] as string | null))));
}

/** Packed rows → rows, columns looked up by name (a column missing from old results reads null); each row is parsed by `studyRowSchema`. */
export function unpackStudyRows(results: Pick<StudyResults, 'columns' | 'rows'>): StudyRow[] {
  const index = STUDY_COLUMNS.map((k) => [k, results.columns.indexOf(k)] as const);
  return results.rows.map((row) => studyRowSchema.parse(Object.fromEntries(index.map(([k, i]) => [k, row[i] ?? null]))));
}

// The x_cp/c rule lives in shared/flight/xcp.ts (every view and export uses it); re-exported here.
export { XCP_BAND, XCP_CN_MIN, XCP_UNDEFINED_NOTE } from '../flight/xcp.ts';

/** A row's x_cp/c when it means a location (rule in shared/flight/xcp.ts), else null. */
export function definedXcpOverC(row: Pick<StudyRow, 'xcpOverC' | 'cl' | 'cd' | 'alphaDeg'>): number | null {
  if (row.cl === null || row.cd === null) return null;
  return shownXcpOverC(row.xcpOverC, normalForceCoefficient(row.cl, row.cd, (row.alphaDeg * Math.PI) / 180));
}

// ---- API shapes ----

export const studyIdSchema = z.string().refine((s) => isIdOf('study', s), 'must be a study id');

export const createStudySchema = z.strictObject({
  name: textSchema().trim().min(1, 'must not be empty').max(200, 'must be at most 200 characters'),
  definition: studyDefinitionSchema,
});
export type CreateStudy = z.infer<typeof createStudySchema>;

export const studySummarySchema = z.object({
  id: z.string(),
  sketchId: z.string(),
  name: z.string(),
  definition: studyDefinitionSchema,
  revision: z.number().int(),
  points: z.number().int(),
  counts: z.partialRecord(z.enum(STUDY_STATUSES), z.number().int().min(0)),
  createdByName: z.string().nullable(),
  createdAt: z.string(),
});
export type StudySummary = z.infer<typeof studySummarySchema>;

export const studyDetailSchema = studySummarySchema.extend({ results: studyResultsSchema, elapsedMs: z.number().nullable() });
export type StudyDetail = z.infer<typeof studyDetailSchema>;

/** `{ items, total, limit, offset }` like every paginated list. */
export const studyPageSchema = pageOf(studySummarySchema);
export type StudyPage = z.infer<typeof studyPageSchema>;

/** Loads over the whole span in the CSV (per-span column × the results' span), SI. */
const SPAN_CSV_COLUMNS = [
  ['liftN', 'liftNPerM'],
  ['dragN', 'dragNPerM'],
  ['momentNM', 'momentNMPerM'],
  ['hingeMomentNM', 'hingeMomentNMPerM'],
] as const;

/** The study CSV's header: STUDY_COLUMNS, then the loads over the span. */
export const STUDY_CSV_COLUMNS = [...STUDY_COLUMNS, ...SPAN_CSV_COLUMNS.map(([k]) => k)] as const;

/**
 * A study as CSV: `#` lines (study, sketch, condition, caution, chord and span) then one row per point:
 * STUDY_COLUMNS, then the loads over the span (SI: N and N·m; per-span columns are N/m and
 * N·m/m, as their names say). Cells from `shared/format/csv.ts`.
 */
export function studyCsv(meta: { title: string; studyName: string; revision: number; caution: string }, results: StudyResults): string {
  const index = STUDY_COLUMNS.map((k) => results.columns.indexOf(k));
  const spanIndex = SPAN_CSV_COLUMNS.map(([, k]) => results.columns.indexOf(k));
  const span = results.spanM ?? null;
  const overSpan = (row: PackedRow) =>
    spanIndex.map((i) => {
      const v = i >= 0 ? row[i] : null;
      return typeof v === 'number' && span !== null ? roundSignificant(v * span) : null;
    });
  // x_cp/c: an empty cell where it is undefined (near-zero normal force), as the table's dash.
  const xcpAt = STUDY_COLUMNS.indexOf('xcpOverC');
  const cell = (row: PackedRow, k: number, i: number) => {
    if (i < 0) return null;
    const v = row[i] ?? null;
    if (k !== xcpAt) return v;
    const num = (c: StudyColumn) => {
      const j = results.columns.indexOf(c);
      const w = j >= 0 ? row[j] : null;
      return typeof w === 'number' ? w : null;
    };
    const alphaDeg = num('alphaDeg');
    return typeof v === 'number' && alphaDeg !== null ? definedXcpOverC({ xcpOverC: v, cl: num('cl'), cd: num('cd'), alphaDeg }) : null;
  };
  return [
    csvNote('Shockwright study', meta.studyName, 'sketch', meta.title, 'revision', meta.revision),
    csvNote(`altitude ${results.altitudeM === null ? 'none (wave drag only)' : `${results.altitudeM} m`}, friction ${results.friction}; alpha and flap in degrees (flap trailing edge down positive); ${XCP_UNDEFINED_NOTE}: empty`),
    csvNote(meta.caution),
    csvNote(`loads in SI: liftNPerM, dragNPerM (wave + friction) in N/m and momentNMPerM, hingeMomentNMPerM in N·m/m per unit span${results.chordM === undefined ? ' (not in this study: it was computed before they existed)' : ` on a ${results.chordM} m chord`}; liftN, dragN, momentNM, hingeMomentNM over the ${span === null ? 'span' : `${span} m span`}`),
    csvHeader(STUDY_CSV_COLUMNS),
    ...results.rows.map((row) => csvRow([...index.map((i, k) => cell(row, k, i)), ...overSpan(row)])),
    '',
  ].join('\n');
}
