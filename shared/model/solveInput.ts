import { z } from 'zod';
import { FIELD_EXTENT_CHORDS_DEFAULT, GAMMA_AIR } from '../solver/constants';
import { allCollinear, findRepeatedPoint, findSelfIntersection, signedArea } from './polygon';
import { MAX_SECTION_VERTICES } from './sketch';
import { itemAt } from '../util/invariant.ts';
import { textSchema } from './text';

/**
 * The solve input, shared by the API route, the CLI and the browser worker.
 *
 * `{ name?: text, section: { points: [[x,y],...] }, flow: { mach, alphaDeg, gamma? = 1.4 },
 *    reference?: { momentPoint?: [x,y], chord?: c, leadingEdge?: [x,y] },
 *    options?: { fieldExtentChords? = 1.5, fanRayStepDeg? = 1, waves? = true } }`
 *
 * Rules: 3 to 2000 finite points forming a simple polygon (no repeated point — closer than a
 * billionth of the section's size counts as repeated —, no self-intersection, non-zero area);
 * 1 < mach ≤ 50; |alphaDeg| < 90; 1 < gamma ≤ 5/3; 0 < fieldExtentChords ≤ 100; chord > 0;
 * 0 < fanRayStepDeg ≤ 180 (the wave map's fan discretisation, FAN_RAY_STEP_DEG_DEFAULT: the
 * most Prandtl-Meyer turning between two drawn rays of a fan, up to three interior rays).
 * Every object refuses keys it does not know, by name (`flow has an unknown key "gama"`), so a
 * misspelt field is never silently replaced by its default. Every message names the field and
 * says what is wrong.
 *
 * `reference` sets what the coefficients are referred to: the chord (default: the outline's
 * max x − min x), the leading edge x/c is measured from (default: the outline's nose) and the
 * moment point (default: a quarter of the reference chord aft of the leading edge, on its y).
 * A section with a deflected flap is solved on its deflected outline but referred to the section
 * as drawn, so its coefficients do not change with the flap's projected chord.
 */

/** Largest free-stream Mach number accepted. */
export const MACH_MAX = 50;
/** Largest |α| accepted, degrees (exclusive). */
export const ALPHA_LIMIT_DEG = 90;
/** Largest γ accepted (monatomic gas). */
export const GAMMA_MAX = 5 / 3;
/** Largest fan ray spacing accepted, degrees (any fan is then its head and tail ray). */
export const FAN_RAY_STEP_DEG_MAX = 180;
/** Largest wave-map field margin accepted, chords. */
export const FIELD_EXTENT_CHORDS_MAX = 100;

const fmt = (v: unknown): string => (typeof v === 'number' ? String(v) : JSON.stringify(v) ?? String(v));

/**
 * A zod object that refuses unknown keys with a sentence naming them and the keys it knows;
 * `shapeMessage` answers a value that is not an object at all.
 */
function strictObject<T extends z.ZodRawShape>(field: string, shape: T, shapeMessage: (input: unknown) => string) {
  const known = Object.keys(shape);
  return z.strictObject(shape, {
    error: (iss) =>
      iss.code === 'unrecognized_keys'
        ? unknownKeysMessage(field, iss.keys, known)
        : shapeMessage(iss.input),
  });
}

/** `flow has an unknown key "gama" (it takes mach, alphaDeg, gamma).` */
export function unknownKeysMessage(field: string, keys: readonly string[], known: readonly string[]): string {
  const list = keys.map((k) => JSON.stringify(k)).join(', ');
  return `${field} has ${keys.length === 1 ? 'an unknown key' : 'unknown keys'} ${list} (it takes ${known.join(', ')}).`;
}

const finite = (field: string) =>
  z.number({
    error: (iss) =>
      iss.input === undefined ? `${field} is missing.` : `${field} must be a finite number; got ${fmt(iss.input)}.`,
  });

const pointSchema = (field: string) =>
  z.tuple([finite(`${field}[0] (x)`), finite(`${field}[1] (y)`)], {
    error: (iss) =>
      iss.input === undefined
        ? `${field} is missing.`
        : `${field} must be a pair [x, y] of finite numbers; got ${fmt(iss.input)}.`,
  });

/** Points of a section: validated one by one so that messages carry the index. */
const pointsSchema = z
  .array(z.unknown(), {
    error: (iss) =>
      iss.input === undefined
        ? 'section.points is missing: give the section as a list of [x, y] points.'
        : 'section.points must be a list of [x, y] points.',
  })
  .transform((raw, ctx) => {
    if (raw.length > MAX_SECTION_VERTICES) {
      ctx.addIssue({
        code: 'custom',
        message: `section.points has ${raw.length} points; at most ${MAX_SECTION_VERTICES} are accepted.`,
      });
      return z.NEVER;
    }
    const out: [number, number][] = [];
    raw.forEach((p, i) => {
      const ok =
        Array.isArray(p) &&
        p.length === 2 &&
        typeof p[0] === 'number' &&
        typeof p[1] === 'number' &&
        Number.isFinite(p[0]) &&
        Number.isFinite(p[1]);
      if (!ok) {
        ctx.addIssue({
          code: 'custom',
          path: [i],
          message: `section.points[${i}] must be a pair [x, y] of finite numbers; got ${fmt(p)}.`,
        });
      } else out.push([p[0] as number, p[1] as number]);
    });
    if (out.length !== raw.length) return z.NEVER;
    if (out.length < 3) {
      ctx.addIssue({
        code: 'custom',
        message: `section.points needs at least 3 points to enclose a section; got ${out.length}.`,
      });
      return z.NEVER;
    }
    const repeated = findRepeatedPoint(out);
    if (repeated) {
      const [a, b] = repeated;
      const pa = itemAt(out, a);
      const pb = itemAt(out, b);
      ctx.addIssue({
        code: 'custom',
        path: [b],
        message:
          pa[0] === pb[0] && pa[1] === pb[1]
            ? `section.points[${b}] repeats section.points[${a}] (${fmt(pa)}); each vertex must be distinct.`
            : `section.points[${b}] ${fmt(pb)} is practically the same point as section.points[${a}] ` +
              `${fmt(pa)} (closer than a billionth of the section's size); each vertex must be distinct.`,
      });
      return z.NEVER;
    }
    if (allCollinear(out)) {
      ctx.addIssue({
        code: 'custom',
        message: 'section.points enclose no area (all points lie on one line).',
      });
      return z.NEVER;
    }
    const crossing = findSelfIntersection(out);
    if (crossing) {
      const n = out.length;
      const { edgeA, edgeB } = crossing;
      ctx.addIssue({
        code: 'custom',
        path: [edgeB],
        message:
          `section.points[${edgeB}]: the side from point ${edgeB} to point ${(edgeB + 1) % n} ` +
          `crosses or touches the side from point ${edgeA} to point ${(edgeA + 1) % n}; ` +
          'the section must be a simple polygon.',
      });
      return z.NEVER;
    }
    if (signedArea(out) === 0) {
      ctx.addIssue({
        code: 'custom',
        message: 'section.points enclose no area.',
      });
      return z.NEVER;
    }
    return out;
  });

export const solveInputSchema = strictObject(
  'The solve input',
  {
    /** A label for the case (batch files carry one); the solver ignores it. */
    name: textSchema({ error: (iss) => `name must be text; got ${fmt(iss.input)}.` })
      .max(500, { error: 'name must be at most 500 characters.' })
      .optional(),
    section: strictObject('section', { points: pointsSchema }, (input) =>
      input === undefined
        ? 'section is missing: give { "points": [[x, y], ...] }.'
        : 'section must be an object { "points": [[x, y], ...] }.',
    ),
    flow: strictObject(
      'flow',
      {
        mach: finite('flow.mach')
          .gt(1, { error: (iss) => `flow.mach must be above 1 (supersonic); got ${fmt(iss.input)}.` })
          .lte(MACH_MAX, { error: (iss) => `flow.mach must be at most ${MACH_MAX}; got ${fmt(iss.input)}.` }),
        alphaDeg: finite('flow.alphaDeg')
          .gt(-ALPHA_LIMIT_DEG, {
            error: (iss) => `flow.alphaDeg must lie strictly between −90 and 90 degrees; got ${fmt(iss.input)}.`,
          })
          .lt(ALPHA_LIMIT_DEG, {
            error: (iss) => `flow.alphaDeg must lie strictly between −90 and 90 degrees; got ${fmt(iss.input)}.`,
          }),
        gamma: finite('flow.gamma')
          .gt(1, { error: (iss) => `flow.gamma must be above 1; got ${fmt(iss.input)}.` })
          .lte(GAMMA_MAX, {
            error: (iss) => `flow.gamma must be at most 5/3 (a monatomic gas); got ${fmt(iss.input)}.`,
          })
          .default(GAMMA_AIR),
      },
      (input) =>
        input === undefined
          ? 'flow is missing: give { "mach": M, "alphaDeg": a }.'
          : 'flow must be an object { "mach": M, "alphaDeg": a, "gamma": g }.',
    ),
    reference: strictObject(
      'reference',
      {
        momentPoint: pointSchema('reference.momentPoint').optional(),
        chord: finite('reference.chord')
          .gt(0, { error: (iss) => `reference.chord must be a positive length; got ${fmt(iss.input)}.` })
          .optional(),
        leadingEdge: pointSchema('reference.leadingEdge').optional(),
      },
      () => 'reference must be an object { "momentPoint": [x, y], "chord": c, "leadingEdge": [x, y] }.',
    ).optional(),
    options: strictObject(
        'options',
        {
          fieldExtentChords: finite('options.fieldExtentChords')
            .gt(0, {
              error: (iss) => `options.fieldExtentChords must be above 0; got ${fmt(iss.input)}.`,
            })
            .lte(FIELD_EXTENT_CHORDS_MAX, {
              error: (iss) =>
                `options.fieldExtentChords must be at most ${FIELD_EXTENT_CHORDS_MAX}; got ${fmt(iss.input)}.`,
            })
            .default(FIELD_EXTENT_CHORDS_DEFAULT),
          fanRayStepDeg: finite('options.fanRayStepDeg')
            .gt(0, { error: (iss) => `options.fanRayStepDeg must be above 0 degrees; got ${fmt(iss.input)}.` })
            .lte(FAN_RAY_STEP_DEG_MAX, {
              error: (iss) => `options.fanRayStepDeg must be at most ${FAN_RAY_STEP_DEG_MAX} degrees; got ${fmt(iss.input)}.`,
            })
            .optional(),
          waves: z
            .boolean({ error: (iss) => `options.waves must be true or false; got ${fmt(iss.input)}.` })
            .default(true),
        },
        () => 'options must be an object { "fieldExtentChords": n, "fanRayStepDeg": d, "waves": true|false }.',
      )
      .prefault({}),
  },
  () => 'The solve input must be a JSON object with "section" and "flow".',
);

/** What the caller sends (defaults optional). */
export type SolveInputRaw = z.input<typeof solveInputSchema>;
/** The parsed input with defaults applied: what `solveSection` takes. */
export type SolveInput = z.output<typeof solveInputSchema>;

/** One validation problem: the field as a path (`section.points[3]`, `flow.mach`) and why. */
export interface SolveInputIssue {
  path: string;
  message: string;
}

export type ParseSolveInputResult =
  | { ok: true; value: SolveInput }
  | { ok: false; issues: SolveInputIssue[] };

/**
 * Validates and normalises an unknown value (e.g. a parsed JSON body) as a solve input.
 * Never throws; on failure each issue names its field (`input` for the whole value).
 */
export function parseSolveInput(raw: unknown): ParseSolveInputResult {
  const r = solveInputSchema.safeParse(raw);
  if (r.success) return { ok: true, value: r.data };
  return {
    ok: false,
    issues: r.error.issues.map((iss) => ({ path: formatPath(iss.path), message: iss.message })),
  };
}

/** ['section', 'points', 3] → 'section.points[3]'; [] → 'input'. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out ? `.${String(key)}` : String(key);
  }
  return out || 'input';
}
