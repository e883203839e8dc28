import { z } from 'zod';
import { pointSchema, sketchDocumentSchema, sketchTitleSchema } from './sketch.ts';
import { approvalSchema, reviewStateSchema, reviewStatusSchema } from './review.ts';
import { analysisStatusSchema, designPointsAnalysisSchema } from './analysis.ts';

/** Shape of one row of the team's sketches table. */
export const sketchSummarySchema = z.object({
  id: z.string(),
  teamId: z.string(),
  title: z.string(),
  revision: z.number().int(),
  vertexCount: z.number().int(),
  /** Thickness over chord of the section as drawn: the solver's t/c, normal to the chord line. */
  thicknessRatio: z.number().nullable(),
  mach: z.number(),
  alphaDeg: z.number(),
  /** How many design points the sketch holds, and the name of the selected one (whose Mach and α these are). */
  designPointCount: z.number().int().default(1),
  selectedPointName: z.string().default(''),
  lastSolveStatus: analysisStatusSchema.nullable(),
  updatedAt: z.string(),
  updatedByName: z.string().nullable(),
  reviewStatus: reviewStatusSchema.default('draft'),
  /** The approval in force (status approved), with the revision it was given to [A1]. */
  approval: approvalSchema.nullable().default(null),
  /** What people read: the status, or "changed since approval" once the revision moved past the approval [A2]. */
  reviewState: reviewStateSchema.default('draft'),
});
export type SketchSummary = z.infer<typeof sketchSummarySchema>;

export const sketchSchema = z.object({
  id: z.string(),
  teamId: z.string(),
  title: z.string(),
  revision: z.number().int(),
  document: sketchDocumentSchema,
  lastSolveStatus: analysisStatusSchema.nullable(),
  /** The server's own solve of this revision, read back through `storedAnalysisSchema` [AN1]. */
  lastResult: designPointsAnalysisSchema.nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  updatedByName: z.string().nullable(),
  reviewStatus: reviewStatusSchema.default('draft'),
  approval: approvalSchema.nullable().default(null),
  reviewState: reviewStateSchema.default('draft'),
});
export type Sketch = z.infer<typeof sketchSchema>;

/**
 * The answer to an import: the sketch after it, the revision the import made, and what the
 * section (and the loads chord, when the import set it) was just before — the client's one undo
 * step for the import puts that back as an ordinary edit, so it reaches everyone.
 */
export const importResultSchema = sketchSchema.extend({
  imported: z.object({
    revision: z.number().int(),
    before: z.object({ points: z.array(pointSchema), loadsChordM: z.number().optional() }),
  }),
});
export type ImportResult = z.infer<typeof importResultSchema>;

export const createSketchSchema = z.strictObject({
  title: sketchTitleSchema,
  document: sketchDocumentSchema.optional(),
});
export type CreateSketch = z.infer<typeof createSketchSchema>;

export const renameSketchSchema = z.strictObject({ title: sketchTitleSchema });

export const saveDocumentSchema = z.strictObject({
  document: sketchDocumentSchema,
  /** The revision the client edited; a mismatch is a 409 so no one overwrites unseen edits. */
  baseRevision: z.number().int().min(0),
});
export type SaveDocument = z.infer<typeof saveDocumentSchema>;
