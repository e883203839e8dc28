import { z } from 'zod';

/**
 * The sketch document: what one sketch stores and what collaborators edit. Declared once here
 * and validated at every edge (API, socket ops, seed). Geometry is in body axes, chord units are
 * whatever the author drew in (the solver normalises by the chord).
 */
export const pointSchema = z.tuple([z.number().finite(), z.number().finite()]);
export type Point = z.infer<typeof pointSchema>;

export const conditionSchema = z.strictObject({
  mach: z.number({ error: 'must be a number' }).gt(1, 'must be above 1 (supersonic)').lte(50, 'must be at most 50'),
  alphaDeg: z.number({ error: 'must be a number' }).gt(-90, 'must be above −90°').lt(90, 'must be below 90°'),
  gamma: z.number({ error: 'must be a number' }).gt(1, 'must be above 1').lte(5 / 3, 'must be at most 5/3').default(1.4),
  /** Geometric altitude for dimensional loads and friction (U.S. Standard Atmosphere 1976). */
  altitudeM: z.number().min(0, 'must be at least 0 m').max(86_000, 'must be at most 86 km').nullable().default(null),
});
export type Condition = z.infer<typeof conditionSchema>;

export const flapSchema = z.strictObject({
  /** Hinge position as a fraction of chord from the nose. */
  hingeXOverC: z.number().gt(0, 'must be inside the chord').lt(1, 'must be inside the chord'),
  /** Positive = trailing edge down. */
  deflectionDeg: z.number().gte(-45, 'must be at least −45°').lte(45, 'must be at most 45°'),
});
export type Flap = z.infer<typeof flapSchema>;

/** Friction regimes of the loads settings and studies ('none': wave drag only). */
export const FRICTION_SETTINGS = ['mixed', 'turbulent', 'laminar', 'none'] as const;

/** Transition Reynolds number accepted for mixed flow. */
export const TRANSITION_REYNOLDS_MIN = 1e3;
export const TRANSITION_REYNOLDS_MAX = 1e8;
export const transitionReynoldsSchema = z
  .number({ error: 'must be a number' })
  .min(TRANSITION_REYNOLDS_MIN, 'must be at least 1000')
  .max(TRANSITION_REYNOLDS_MAX, 'must be at most 1e8');

/** The physical section for dimensional loads and friction (defaults: 1 m by 1 m, turbulent). */
export const loadsSettingsSchema = z.strictObject({
  /** Physical chord of the section as drawn, m: the length of the reference chord. */
  chordM: z.number().gt(0, 'must be a positive length').max(1000, 'must be at most 1000 m').default(1),
  /** Span the section load acts over, m. */
  spanM: z.number().gt(0, 'must be a positive length').max(1000, 'must be at most 1000 m').default(1),
  /** Boundary-layer state for the friction estimate. */
  friction: z.enum(FRICTION_SETTINGS).default('turbulent'),
  /** Where a mixed boundary layer turns turbulent (Reynolds number on the length, free stream);
   *  absent = 5×10⁵. */
  transitionReynolds: transitionReynoldsSchema.optional(),
});
export type LoadsSettings = z.infer<typeof loadsSettingsSchema>;

/**
 * Most vertices a section may have [M2]: far more than a section needs, and it bounds the
 * quadratic parts (self-intersection check, wave-map crossings) and the cost of one edit.
 * Documents, ops, coordinates files, the solve input and socket selections all use this one.
 */
export const MAX_SECTION_VERTICES = 2000;
export const MIN_SECTION_VERTICES = 3;

/** The vertices of a section (3 to MAX_SECTION_VERTICES points). */
export const sectionPointsSchema = z
  .array(pointSchema)
  .min(MIN_SECTION_VERTICES, `a section needs at least ${MIN_SECTION_VERTICES} vertices`)
  .max(MAX_SECTION_VERTICES, `at most ${MAX_SECTION_VERTICES} vertices`);

/**
 * Every object of the document refuses keys it does not know (zod strict objects): an imported
 * or saved document with a misspelt field ("gama") is refused with the key's name instead of
 * being solved with the default.
 */
export const sketchDocumentSchema = z.strictObject({
  version: z.literal(1),
  section: z.strictObject({ points: sectionPointsSchema }),
  condition: conditionSchema,
  flap: flapSchema.nullable().default(null),
  /** Moment reference point in body axes; null = quarter chord on the nose's y. */
  momentPoint: pointSchema.nullable().default(null),
  notes: z.string().max(10_000).default(''),
  loads: loadsSettingsSchema.default({ chordM: 1, spanM: 1, friction: 'turbulent' }),
});
export type SketchDocument = z.infer<typeof sketchDocumentSchema>;

export const sketchTitleSchema = z.string().trim().min(1, 'must not be empty').max(200, 'must be at most 200 characters');

/** A new sketch: a modest symmetric double wedge at Mach 2, 2° incidence. */
export function defaultSketchDocument(): SketchDocument {
  return {
    version: 1,
    section: { points: [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]] },
    condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: null },
    flap: null,
    momentPoint: null,
    notes: '',
    loads: { chordM: 1, spanM: 1, friction: 'turbulent' },
  };
}

/**
 * A stored document read back: documents saved before a field existed get its default, so
 * every reader sees the current shape.
 */
export function normalizeDocument(raw: unknown): SketchDocument {
  return sketchDocumentSchema.parse(raw);
}
