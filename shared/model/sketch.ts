import { z } from 'zod';
import { idSchema } from './ids.ts';
import { firstItem } from '../util/invariant.ts';
import { textSchema } from './text.ts';

/**
 * The sketch document: what one sketch stores and what collaborators edit. Declared once here
 * and validated at every edge (API, socket ops, seed). Geometry is in body axes, chord units are
 * whatever the author drew in (the solver normalises by the chord).
 */
export const pointSchema = z.tuple([z.number().finite(), z.number().finite()]);
export type Point = z.infer<typeof pointSchema>;

/** Altitudes the standard atmosphere covers (geometric, m). */
export const ALTITUDE_MIN_M = 0;
export const ALTITUDE_MAX_M = 86_000;

export const conditionSchema = z.strictObject({
  mach: z.number({ error: 'must be a number' }).gt(1, 'must be above 1 (supersonic)').lte(50, 'must be at most 50'),
  alphaDeg: z.number({ error: 'must be a number' }).gt(-90, 'must be above −90°').lt(90, 'must be below 90°'),
  gamma: z.number({ error: 'must be a number' }).gt(1, 'must be above 1').lte(5 / 3, 'must be at most 5/3').default(1.4),
  /** Geometric altitude for dimensional loads and friction (U.S. Standard Atmosphere 1976). */
  altitudeM: z.number().min(ALTITUDE_MIN_M, 'must be at least 0 m').max(ALTITUDE_MAX_M, 'must be at most 86 km').nullable().default(null),
});
export type Condition = z.infer<typeof conditionSchema>;

/** Flap deflection, degrees; positive = trailing edge down. */
export const flapDeflectionDegSchema = z
  .number({ error: 'must be a number' })
  .gte(-45, 'must be at least −45°')
  .lte(45, 'must be at most 45°');

/**
 * The flap of a sketch: where it is hinged. How far it is deflected belongs to each design
 * point (`DesignPoint.flapDeflectionDeg`), so one sketch can hold cruise at 0° and a pull-up at 8°.
 */
export const flapSchema = z.strictObject({
  /** Hinge position as a fraction of chord from the nose. */
  hingeXOverC: z.number({ error: 'must be a number' }).gt(0, 'must be inside the chord').lt(1, 'must be inside the chord'),
});
export type Flap = z.infer<typeof flapSchema>;

/** The flap as version 1 documents stored it: hinge and the (one) deflection. */
export const legacyFlapSchema = flapSchema.extend({ deflectionDeg: flapDeflectionDegSchema });
export type LegacyFlap = z.infer<typeof legacyFlapSchema>;

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
 * quadratic part (the self-intersection check) and the cost of one edit.
 * Documents, ops, coordinates files, the solve input and socket selections all use this one.
 */
export const MAX_SECTION_VERTICES = 2000;
/**
 * Largest coordinate (either axis, either sign) an edit may give a vertex: far beyond a unit
 * chord or a section kept in metres (loads chord ≤ 1000 m), and well inside what the repeat
 * and crossing checks resolve (they scale with the section's size).
 */
export const MAX_SECTION_COORDINATE = 1e6;
export const MIN_SECTION_VERTICES = 3;

/** The vertices of a section (3 to MAX_SECTION_VERTICES points). */
export const sectionPointsSchema = z
  .array(pointSchema)
  .min(MIN_SECTION_VERTICES, `a section needs at least ${MIN_SECTION_VERTICES} vertices`)
  .max(MAX_SECTION_VERTICES, `at most ${MAX_SECTION_VERTICES} vertices`);

/**
 * Text a person names things with (design point names): one line of printable characters. NUL,
 * other control characters and unpaired UTF-16 surrogates are refused here, at the edge, with
 * the field's name, so nothing unstorable reaches PostgreSQL.
 */
// eslint-disable-next-line no-control-regex
const CONTROL_OR_LONE_SURROGATE = /[\u0000-\u001f\u007f]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Most design points one sketch holds (each is solved on every edit). */
export const MAX_DESIGN_POINTS = 12;
/** Longest design point name. */
export const DESIGN_POINT_NAME_MAX = 60;

/** A design point's id [M1]: `point_` and 20 letters or digits (unique within its document [D1]). */
export const designPointIdSchema = idSchema('point', 'design point');

export const designPointNameSchema = textSchema()
  .trim()
  .min(1, 'must not be empty')
  .max(DESIGN_POINT_NAME_MAX, `must be at most ${DESIGN_POINT_NAME_MAX} characters`)
  .refine((s) => !CONTROL_OR_LONE_SURROGATE.test(s), 'must be one line of printable characters');

/**
 * A design point: one named, full flight condition of the sketch (cruise, pull-up, max q…).
 * All of a sketch's points are solved together; the selected one drives the canvas.
 */
export const designPointSchema = z.strictObject({
  id: designPointIdSchema,
  name: designPointNameSchema,
  condition: conditionSchema,
  /** Flap deflection at this point, used when the sketch has a flap (kept when it is switched off). */
  flapDeflectionDeg: flapDeflectionDegSchema.default(0),
});
export type DesignPoint = z.infer<typeof designPointSchema>;

/**
 * The id of the design point a version 1 document becomes, and of a new sketch's first point.
 * Ids only need to be unique within one document, and an upgrade must give the same id every
 * time the same stored document is read (a client's edit names the point by it).
 */
export const FIRST_DESIGN_POINT_ID = 'point_aaaaaaaaaaaaaaaaaaaa';
/** The name of the design point a version 1 document becomes. */
export const FIRST_DESIGN_POINT_NAME = 'Design point 1';

const sectionSchema = z.strictObject({ points: sectionPointsSchema });
const momentPointSchema = pointSchema.nullable().default(null);
const notesSchema = textSchema().max(10_000, 'must be at most 10000 characters').default('');
const loadsSchema = loadsSettingsSchema.default({ chordM: 1, spanM: 1, friction: 'turbulent' });

/** Version 1 (one condition per sketch), as stored before design points. Read-only: it is upgraded. */
export const sketchDocumentV1Schema = z.strictObject({
  version: z.literal(1),
  section: sectionSchema,
  condition: conditionSchema,
  flap: legacyFlapSchema.nullable().default(null),
  momentPoint: momentPointSchema,
  notes: notesSchema,
  loads: loadsSchema,
});
export type SketchDocumentV1 = z.infer<typeof sketchDocumentV1Schema>;

/** Two names are the same design point name when they match ignoring case and outer spaces. */
export function sameDesignPointName(a: string, b: string): boolean {
  return a.trim().toLocaleLowerCase('en') === b.trim().toLocaleLowerCase('en');
}

/**
 * Version 2: several design points, one of them selected. Every object of the document refuses
 * keys it does not know (zod strict objects): an imported or saved document with a misspelt
 * field ("gama") is refused with the key's name instead of being solved with the default.
 * Invariants [D1]–[D3] (shared/model/README.md): point ids unique, names unique ignoring case,
 * the selected id names one of the points.
 */
export const sketchDocumentV2Schema = z
  .strictObject({
    version: z.literal(2),
    section: sectionSchema,
    designPoints: z
      .array(designPointSchema)
      .min(1, 'a sketch needs at least one design point')
      .max(MAX_DESIGN_POINTS, `at most ${MAX_DESIGN_POINTS} design points`),
    /** The design point the canvas, the stored wave map and new studies use. */
    selectedPointId: designPointIdSchema,
    flap: flapSchema.nullable().default(null),
    /** Moment reference point in body axes; null = quarter chord on the nose's y. */
    momentPoint: momentPointSchema,
    notes: notesSchema,
    loads: loadsSchema,
  })
  .superRefine((doc, ctx) => {
    const problem = designPointsProblem(doc.designPoints, doc.selectedPointId);
    if (problem) ctx.addIssue({ code: 'custom', path: problem.path, message: problem.message });
  });
export type SketchDocument = z.infer<typeof sketchDocumentV2Schema>;

/** [D1]–[D3] for a list of points and a selection; null when they hold. */
export function designPointsProblem(points: readonly DesignPoint[], selectedPointId: string): { path: (string | number)[]; message: string } | null {
  for (const [i, point] of points.entries()) {
    for (const [j, earlier] of points.slice(0, i).entries()) {
      if (earlier.id === point.id) return { path: ['designPoints', i, 'id'], message: `repeats the id of design point ${j}` };
      if (sameDesignPointName(earlier.name, point.name)) return { path: ['designPoints', i, 'name'], message: `repeats the name “${earlier.name}”` };
    }
  }
  if (!points.some((p) => p.id === selectedPointId)) return { path: ['selectedPointId'], message: 'must name one of the design points' };
  return null;
}

/** A version 1 document as version 2: its condition and flap deflection become one design point. */
export function upgradeV1(doc: SketchDocumentV1): SketchDocument {
  return {
    version: 2,
    section: doc.section,
    designPoints: [{ id: FIRST_DESIGN_POINT_ID, name: FIRST_DESIGN_POINT_NAME, condition: doc.condition, flapDeflectionDeg: doc.flap?.deflectionDeg ?? 0 }],
    selectedPointId: FIRST_DESIGN_POINT_ID,
    flap: doc.flap ? { hingeXOverC: doc.flap.hingeXOverC } : null,
    momentPoint: doc.momentPoint,
    notes: doc.notes,
    loads: doc.loads,
  };
}

/**
 * The sketch document at any edge (API bodies, socket ops, stored rows, snapshots, the edit
 * log): version 1 or 2 in, always version 2 out. A version 1 document is validated as version 1
 * (its messages name its own fields) and then upgraded.
 */
export const sketchDocumentSchema = z
  .discriminatedUnion('version', [sketchDocumentV1Schema, sketchDocumentV2Schema], {
    error: (issue) => (issue.code === 'invalid_union' ? 'version must be 1 or 2' : undefined),
  })
  .transform((doc): SketchDocument => (doc.version === 1 ? upgradeV1(doc) : doc));

export const sketchTitleSchema = textSchema().trim().min(1, 'must not be empty').max(200, 'must be at most 200 characters');

/** A new sketch: a modest symmetric double wedge at Mach 2, 2° incidence. */
export function defaultSketchDocument(): SketchDocument {
  return {
    version: 2,
    section: { points: [[0, 0], [0.5, 0.025], [1, 0], [0.5, -0.025]] },
    designPoints: [{ id: FIRST_DESIGN_POINT_ID, name: FIRST_DESIGN_POINT_NAME, condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: null }, flapDeflectionDeg: 0 }],
    selectedPointId: FIRST_DESIGN_POINT_ID,
    flap: null,
    momentPoint: null,
    notes: '',
    loads: { chordM: 1, spanM: 1, friction: 'turbulent' },
  };
}

/**
 * A stored document read back: version 1 documents become one design point, and documents
 * saved before a field existed get its default, so every reader sees the current shape.
 */
export function normalizeDocument(raw: unknown): SketchDocument {
  return sketchDocumentSchema.parse(raw);
}

/**
 * The sketch seen at one design point: one section at one condition, which is what an analysis
 * takes (`analyseSketch`, studies, reports). The flap carries that point's deflection.
 */
export interface SketchCase {
  section: { points: Point[] };
  condition: Condition;
  flap: LegacyFlap | null;
  momentPoint: Point | null;
  loads: LoadsSettings;
}

/** The selected design point (the document guarantees there is one [D3]). */
export function selectedPoint(doc: SketchDocument): DesignPoint {
  return doc.designPoints.find((p) => p.id === doc.selectedPointId) ?? firstItem(doc.designPoints);
}

/** A design point by id, or undefined. */
export function findDesignPoint(doc: SketchDocument, pointId: string): DesignPoint | undefined {
  return doc.designPoints.find((p) => p.id === pointId);
}

/** The case of design point `pointId` (default, and for an id the sketch does not have: the selected one). */
export function sketchCase(doc: SketchDocument, pointId?: string): SketchCase {
  const point = (pointId === undefined ? undefined : findDesignPoint(doc, pointId)) ?? selectedPoint(doc);
  return caseAt(doc, point);
}

/** The case of a given design point of `doc`. */
export function caseAt(doc: SketchDocument, point: DesignPoint): SketchCase {
  return {
    section: doc.section,
    condition: point.condition,
    flap: doc.flap ? { hingeXOverC: doc.flap.hingeXOverC, deflectionDeg: point.flapDeflectionDeg } : null,
    momentPoint: doc.momentPoint,
    loads: doc.loads,
  };
}
