import { z } from 'zod';
import { loadsSettingsSchema, pointSchema, sectionPointsSchema, sketchDocumentSchema } from './sketch.ts';
import { textSchema } from './text.ts';
import { designPointsAnalysisSchema } from './analysis.ts';

/** Where a pin sits: a free point, a facet (by its index) or a wave of the wave map (by its id). */
export const pinTargetSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('point'), at: pointSchema }),
  z.object({ kind: z.literal('facet'), facet: z.number().int().min(0), at: pointSchema }),
  z.object({ kind: z.literal('wave'), waveId: textSchema().min(1).max(64), label: textSchema().max(120).optional(), at: pointSchema }),
]);
export type PinTarget = z.infer<typeof pinTargetSchema>;

const bodySchema = textSchema({ error: 'is required' }).trim().min(1, 'must not be empty').max(5000, 'must be at most 5000 characters');
const mentionsSchema = z.array(z.string().regex(/^user_[a-z0-9]{20}$/, 'must be user ids')).max(20, 'at most 20 people').default([]);

export const createPinSchema = z.object({ target: pinTargetSchema, body: bodySchema, mentions: mentionsSchema });
export const replySchema = z.object({ body: bodySchema, mentions: mentionsSchema });

export const pinReplySchema = z.object({ id: z.string(), authorId: z.string().nullable(), authorName: z.string().nullable(), body: z.string(), mentions: z.array(z.string()), createdAt: z.string() });
export type PinReply = z.infer<typeof pinReplySchema>;

/** A pin's state: open until someone resolves it (reopening makes it open again). */
export const PIN_STATUSES = ['open', 'resolved'] as const;
export type PinStatus = (typeof PIN_STATUSES)[number];

/** Why a snapshot was kept: by hand, or automatically before a restore or an import. */
export const SNAPSHOT_KINDS = ['manual', 'before_restore', 'before_import'] as const;
export type SnapshotKind = (typeof SNAPSHOT_KINDS)[number];

export const pinSummarySchema = z.object({
  id: z.string(),
  sketchId: z.string(),
  target: pinTargetSchema,
  status: z.enum(PIN_STATUSES),
  authorName: z.string().nullable(),
  firstBody: z.string(),
  replyCount: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
  resolvedByName: z.string().nullable(),
});
export type PinSummary = z.infer<typeof pinSummarySchema>;

export const pinDetailSchema = pinSummarySchema.extend({ replies: z.array(pinReplySchema) });
export type PinDetail = z.infer<typeof pinDetailSchema>;

export const pinListQuerySchema = z.object({
  status: z.enum([...PIN_STATUSES, 'all']).default('all'),
  limit: z.coerce.number().int().min(1, 'must be at least 1').max(100, 'must be at most 100').default(20),
  offset: z.coerce.number().int().min(0, 'must be at least 0').default(0),
});

export const createSnapshotSchema = z.object({
  name: textSchema({ error: 'is required' }).trim().min(1, 'must not be empty').max(120, 'must be at most 120 characters'),
  note: textSchema().trim().max(2000, 'must be at most 2000 characters').default(''),
});

export const snapshotSummarySchema = z.object({
  id: z.string(),
  sketchId: z.string(),
  name: z.string(),
  note: z.string(),
  kind: z.enum(SNAPSHOT_KINDS),
  revision: z.number().int(),
  createdByName: z.string().nullable(),
  createdAt: z.string(),
});
export type SnapshotSummary = z.infer<typeof snapshotSummarySchema>;

export const snapshotDetailSchema = snapshotSummarySchema.extend({
  title: z.string(),
  document: sketchDocumentSchema,
  /** The stored result at that revision, read back through `storedAnalysisSchema` [AN1]. */
  result: designPointsAnalysisSchema.nullable(),
});
export type SnapshotDetail = z.infer<typeof snapshotDetailSchema>;

/**
 * An approval names the revision it was given to [A1]: who approved, which revision, when. A
 * sketch whose revision moved past its approved one is "changed since approval" until someone
 * approves again (`reviewState`).
 */
export const approvalSchema = z.object({
  revision: z.number().int(),
  byName: z.string().nullable(),
  at: z.string(),
});
export type Approval = z.infer<typeof approvalSchema>;

export const REVIEW_STATUSES = ['draft', 'in_review', 'approved'] as const;
export const reviewStatusSchema = z.enum(REVIEW_STATUSES);
export type ReviewStatus = z.infer<typeof reviewStatusSchema>;
export const setStatusSchema = z.object({ status: reviewStatusSchema });

export const reviewRequestSchema = z.object({
  reviewerIds: z.array(z.string().regex(/^user_[a-z0-9]{20}$/, 'must be user ids')).min(1, 'pick at least one reviewer').max(20, 'at most 20 reviewers'),
  message: textSchema().trim().max(2000, 'must be at most 2000 characters').default(''),
});

export const importSectionSchema = z.strictObject({
  points: sectionPointsSchema,
  /** The file's name, kept in the activity feed and the automatic snapshot's name. */
  fileName: textSchema().trim().max(200, 'must be at most 200 characters').default('coordinates file'),
  /** The file's physical chord (m) for the loads, when the import keeps or takes it; absent: loads unchanged. */
  loadsChordM: loadsSettingsSchema.shape.chordM.unwrap().optional(),
});
export type ImportSection = z.infer<typeof importSectionSchema>;

export const activityEntrySchema = z.object({
  id: z.string(),
  kind: z.string(),
  actorName: z.string().nullable(),
  /** One plain sentence ("Ines made 12 edits: moved vertices, set Mach"). */
  summary: z.string(),
  at: z.string(),
  /** For grouped edits: the first and last revision. */
  revisions: z.tuple([z.number().int(), z.number().int()]).nullable(),
  detail: z.record(z.string(), z.unknown()),
});
export type ActivityEntry = z.infer<typeof activityEntrySchema>;
