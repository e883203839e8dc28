import { z } from 'zod';
import { idSchema } from './ids.ts';
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
const mentionsSchema = z.array(idSchema('user')).max(20, 'at most 20 people').default([]);

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
 * Review statuses as stored (one list for the database enum, the routers and the client):
 * draft → in review (an editor asked) → approved or changes requested (a reviewer's outcome);
 * an owner resets to draft.
 */
export const REVIEW_STATUSES = ['draft', 'in_review', 'changes_requested', 'approved'] as const;
export const reviewStatusSchema = z.enum(REVIEW_STATUSES);
export type ReviewStatus = z.infer<typeof reviewStatusSchema>;

/**
 * What people read: the stored status, except that an approval whose revision the sketch has
 * moved past reads "changed since approval" [A2]. Computed by comparing revisions (`reviewState`),
 * never stored, so every edit path (live, autosave, restore, import) counts without a hook.
 */
export const REVIEW_STATES = [...REVIEW_STATUSES, 'changed_since_approval'] as const;
export const reviewStateSchema = z.enum(REVIEW_STATES);
export type ReviewState = z.infer<typeof reviewStateSchema>;

/** The words for each state, shared by the editor, the home table and the PDF report. */
export const REVIEW_STATE_LABEL: Record<ReviewState, string> = {
  draft: 'Draft',
  in_review: 'In review',
  changes_requested: 'Changes requested',
  approved: 'Approved',
  changed_since_approval: 'Changed since approval',
};

/** What a review history entry records: an approval, a request for changes, an owner's reset. */
export const REVIEW_OUTCOMES = ['approved', 'changes_requested', 'reset'] as const;
export const reviewOutcomeSchema = z.enum(REVIEW_OUTCOMES);
export type ReviewOutcome = z.infer<typeof reviewOutcomeSchema>;

/**
 * An approval names the revision it was given to [A1]: who approved, which revision, when, with
 * the reviewer's note. `changedSince` is true once the sketch's revision is past it [A2].
 */
export const approvalSchema = z.object({
  revision: z.number().int(),
  byName: z.string().nullable(),
  at: z.string(),
  note: z.string().default(''),
  changedSince: z.boolean().default(false),
});
export type Approval = z.infer<typeof approvalSchema>;

/** The state people read, from the stored status, the approval in force and the sketch's revision [A2]. */
export function reviewState(status: ReviewStatus, approval: Pick<Approval, 'revision'> | null, revision: number): ReviewState {
  if (status === 'approved' && approval && revision > approval.revision) return 'changed_since_approval';
  return status;
}

const revisionSchema = z.number({ error: 'must be the revision you reviewed' }).int('must be a whole number').min(0, 'must be at least 0');
const outcomeNoteSchema = textSchema().trim().max(2000, 'must be at most 2000 characters');

/**
 * A reviewer's outcome names the revision they looked at: the server refuses it when the sketch
 * has moved on since (nobody approves what they have not seen) [A3].
 */
export const approveSchema = z.strictObject({ revision: revisionSchema, note: outcomeNoteSchema.default('') });
/**
 * An owner's reset of the review [A7]: it withdraws the approval in force (or the request for
 * changes, or the review request), so it happens only with an explicit confirmation in the body —
 * a stray or replayed request without it changes nothing.
 */
export const resetReviewSchema = z.strictObject({
  confirm: z.literal(true, {
    error: 'is required and must be true: resetting withdraws the approval in force (or the request for changes or for review) and sets the status back to draft',
  }),
});
export const requestChangesSchema = z.strictObject({
  revision: revisionSchema,
  note: textSchema({ error: 'is required: say what should change' }).trim().min(1, 'must say what should change').max(2000, 'must be at most 2000 characters'),
});

/** One entry of the review history, newest first: every approval, request for changes and reset. */
export const reviewHistoryEntrySchema = z.object({
  id: z.string(),
  outcome: reviewOutcomeSchema,
  revision: z.number().int(),
  byName: z.string().nullable(),
  note: z.string(),
  at: z.string(),
});
export type ReviewHistoryEntry = z.infer<typeof reviewHistoryEntrySchema>;

export const reviewRequestSchema = z.object({
  reviewerIds: z.array(idSchema('user')).min(1, 'pick at least one reviewer').max(20, 'at most 20 reviewers'),
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

/**
 * What the activity feed records besides edits (`sketch_events.kind`; one list for the database
 * enum, the writers, the feed's sentences and the client's marks). `status.changed` is only read:
 * it was written before review outcomes named their revision, and old feeds keep it.
 */
export const SKETCH_EVENT_KINDS = [
  'pin.created',
  'pin.replied',
  'pin.resolved',
  'pin.reopened',
  'snapshot.created',
  'snapshot.restored',
  'section.imported',
  'review.requested',
  'review.approved',
  'review.changes_requested',
  'review.reset',
  'status.changed',
] as const;
export type SketchEventKind = (typeof SKETCH_EVENT_KINDS)[number];
/** An activity feed entry's kind: a run of edits (read from the edit log), or a sketch event. */
export const ACTIVITY_KINDS = ['edits', ...SKETCH_EVENT_KINDS] as const;
export type ActivityKind = (typeof ACTIVITY_KINDS)[number];

export const activityEntrySchema = z.object({
  id: z.string(),
  kind: z.enum(ACTIVITY_KINDS),
  actorName: z.string().nullable(),
  /** One plain sentence ("Ines made 12 edits: moved vertices, set Mach"). */
  summary: z.string(),
  at: z.string(),
  /** For grouped edits: the first and last revision. */
  revisions: z.tuple([z.number().int(), z.number().int()]).nullable(),
  detail: z.record(z.string(), z.unknown()),
});
export type ActivityEntry = z.infer<typeof activityEntrySchema>;
