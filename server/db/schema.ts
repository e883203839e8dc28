import {
  type AnyPgColumn,
  bigserial,
  check,
  customType,
  doublePrecision,
  index,
  uniqueIndex,
  integer,
  jsonb,
  json,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  varchar,
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { UNIT_SYSTEMS } from '../../shared/flight/units.ts';
import { ANALYSIS_STATUSES } from '../../shared/model/analysis.ts';
import { ROLES } from '../../shared/model/roles.ts';
import { PIN_STATUSES, REVIEW_OUTCOMES, REVIEW_STATUSES, SKETCH_EVENT_KINDS, SNAPSHOT_KINDS } from '../../shared/model/review.ts';
import { AUDIT_ACTIONS } from '../../shared/model/teams.ts';
import { EDIT_STATUSES } from '../../shared/protocol/messages.ts';

/**
 * The database schema: the source of truth. Properties are camelCase, columns snake_case; every
 * id is text carrying its kind (`user_…`, `team_…`, `sketch_…`, see shared/model/ids.ts).
 * Migrations are generated from this file by `npm run db:generate` into drizzle/.
 */

const bytea = customType<{ data: Buffer }>({ dataType: () => 'bytea' });

const timestamps = {
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
};

// Database enums are built from the shared vocabularies, so a word added to a list reaches the
// database through a generated migration instead of a second hand-kept copy.
export const roleEnum = pgEnum('role', ROLES);
export const unitSystemEnum = pgEnum('unit_system', UNIT_SYSTEMS);
export const reviewStatusEnum = pgEnum('review_status', REVIEW_STATUSES);
export const reviewOutcomeEnum = pgEnum('review_outcome', REVIEW_OUTCOMES);
export const analysisStatusEnum = pgEnum('analysis_status', ANALYSIS_STATUSES);
export const auditActionEnum = pgEnum('audit_action', AUDIT_ACTIONS);
export const editStatusEnum = pgEnum('edit_status', EDIT_STATUSES);
export const sketchEventKindEnum = pgEnum('sketch_event_kind', SKETCH_EVENT_KINDS);

export const users = pgTable('users', {
  id: text('id').primaryKey(),
  /** Stored lower-cased; unique. */
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  /** argon2id PHC string. */
  passwordHash: text('password_hash').notNull(),
  /** Display units for dimensional results (shared/flight/units.ts). */
  unitSystem: unitSystemEnum('unit_system').notNull().default('si'),
  ...timestamps,
});

export const teams = pgTable('teams', {
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  ...timestamps,
});

export const memberships = pgTable(
  'memberships',
  {
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: roleEnum('role').notNull(),
    ...timestamps,
  },
  (t) => [primaryKey({ columns: [t.teamId, t.userId] }), index('memberships_user_idx').on(t.userId)],
);

export const sketches = pgTable(
  'sketches',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    title: text('title').notNull(),
    /** The sketch document (shared/model/sketch.ts `SketchDocument`), validated before every write. */
    document: jsonb('document').notNull(),
    /** Incremented by one for every applied edit; the realtime protocol orders ops by it. */
    revision: integer('revision').notNull().default(0),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    updatedBy: text('updated_by').references(() => users.id, { onDelete: 'set null' }),
    /** Status of the last server solve (`ANALYSIS_STATUSES`: ok, detached, …, invalid), null before the first solve. */
    lastSolveStatus: analysisStatusEnum('last_solve_status'),
    /** The stored (server-computed) result of the last solve. */
    lastResult: jsonb('last_result'),
    /**
     * The revision `last_result` and `last_solve_status` were computed on (null: unknown, before
     * results were tagged). The solve runs after an edit commits, so it may trail `revision`
     * briefly; a stored result is never replaced by an older one.
     */
    resultRevision: integer('result_revision'),
    reviewStatus: reviewStatusEnum('review_status').notNull().default('draft'),
    /**
     * The approval in force while the status is approved (a row of review_outcomes, which names
     * its revision [A1]); null otherwise. "Changed since approval" is revision > its revision.
     */
    approvalId: text('approval_id').references((): AnyPgColumn => reviewOutcomes.id, { onDelete: 'set null' }),
    /*
     * The sketches table's summary of `document` (shared/flight/sketchSummary.ts), written in the
     * same statement as the document by every writer (server/db/sketchSummary.ts
     * `sketchSummaryColumns`), so the team's list never reads documents. `summary_revision` is
     * the revision it was computed at: a trigger (migrations 0011, 0012) refuses a write of this
     * version's that leaves it behind; null on a row stored before the columns, and behind on a
     * row an instance of the version before wrote during an upgrade (both filled by
     * `backfillSketchSummaries` at every start or by the next write; until then the list reads
     * the row's document).
     */
    vertexCount: integer('vertex_count'),
    /** t/c, the solver's measure; null for a degenerate section (as the API says). */
    thicknessRatio: doublePrecision('thickness_ratio'),
    selectedMach: doublePrecision('selected_mach'),
    selectedAlphaDeg: doublePrecision('selected_alpha_deg'),
    designPointCount: integer('design_point_count'),
    selectedPointName: text('selected_point_name'),
    summaryRevision: integer('summary_revision'),
    ...timestamps,
  },
  (t) => [
    index('sketches_team_idx').on(t.teamId),
    check(
      'sketches_summary_whole',
      sql`${t.summaryRevision} is null or (${t.vertexCount} is not null and ${t.selectedMach} is not null and ${t.selectedAlphaDeg} is not null and ${t.designPointCount} is not null and ${t.selectedPointName} is not null)`,
    ),
  ],
);

/**
 * Team invitations. Only a SHA-256 of the token is stored: the token itself exists only in the
 * e-mailed link. Single use (acceptedAt), valid until expiresAt (7 days), revocable.
 */
export const invitations = pgTable(
  'invitations',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    role: roleEnum('role').notNull(),
    tokenHash: text('token_hash').notNull().unique(),
    invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    acceptedBy: text('accepted_by').references(() => users.id, { onDelete: 'set null' }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('invitations_team_idx').on(t.teamId)],
);

/** Password reset tokens (hash only), single use, valid one hour. */
export const passwordResets = pgTable('password_resets', {
  id: text('id').primaryKey(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text('token_hash').notNull().unique(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * Sign-ups waiting for their address to be confirmed. Signing up answers the same whether or not
 * the address has an account (no account discovery), so the account is created only when the
 * link mailed to the address is followed. Only a SHA-256 of the token is stored; single use,
 * valid SIGN_UP_TTL_MS.
 */
export const signUps = pgTable(
  'sign_ups',
  {
    id: text('id').primaryKey(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    teamName: text('team_name').notNull(),
    /** argon2id PHC string of the chosen password. */
    passwordHash: text('password_hash').notNull(),
    tokenHash: text('token_hash').notNull().unique(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('sign_ups_email_idx').on(t.email)],
);

/** Messages received by the development SMTP sink (server/mail/sink.ts). */
export const mailMessages = pgTable(
  'mail_messages',
  {
    id: text('id').primaryKey(),
    fromAddress: text('from_address').notNull(),
    toAddresses: text('to_addresses').array().notNull(),
    subject: text('subject').notNull(),
    textBody: text('text_body').notNull(),
    htmlBody: text('html_body'),
    raw: text('raw').notNull(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('mail_received_idx').on(t.receivedAt)],
);

/** Who did what to whom in a team (membership changes), newest first on the members page. */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    actorId: text('actor_id').references(() => users.id, { onDelete: 'set null' }),
    /** What happened (`AUDIT_ACTIONS`: team.created, member.invited, invitation.revoked, …). */
    action: auditActionEnum('action').notNull(),
    targetUserId: text('target_user_id').references(() => users.id, { onDelete: 'set null' }),
    targetEmail: text('target_email'),
    detail: jsonb('detail').notNull().default({}),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('audit_team_idx').on(t.teamId, t.createdAt)],
);

/** Key/value facts about this database (e.g. when the demo was seeded). */
export const appMeta = pgTable('app_meta', {
  key: text('key').primaryKey(),
  value: jsonb('value').notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * express-session store table, in the layout connect-pg-simple expects. Declared here so that
 * drizzle-kit owns it (and never tries to drop it).
 */
export const sessions = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6, withTimezone: false }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);


/**
 * Hit counters for rate limits (sign-in, password reset, invitations), shared by every server
 * instance on this database. One row per limiter key; the window restarts after resetAt.
 */
export const rateLimits = pgTable('rate_limits', {
  key: text('key').primaryKey(),
  hits: integer('hits').notNull(),
  resetAt: timestamp('reset_at', { withTimezone: true }).notNull(),
});

/**
 * Heavy-work slots held now [H1], shared by every server instance on the database, so a person's
 * bound holds however many instances serve them. A slot is a lease: its instance renews it while
 * the work runs and deletes it when the work settles; a row whose `lease_until` has passed (its
 * instance died, hung or lost the database) no longer counts and is deleted by the next claim.
 */
export const heavyWorkSlots = pgTable(
  'heavy_work_slots',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** The server process holding the slot (a new id each time a process starts). */
    instanceId: text('instance_id').notNull(),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull().defaultNow(),
    leaseUntil: timestamp('lease_until', { withTimezone: true }).notNull(),
  },
  (t) => [index('heavy_work_slots_user_idx').on(t.userId, t.leaseUntil)],
);

/**
 * The edit log of every sketch: one row per edit the realtime channel received, applied or not.
 * Applied rows carry the revision they produced (replayed to reconnecting clients); the
 * (sketch, op id) pair is unique, which is what makes a re-sent op harmless.
 */
export const sketchEdits = pgTable(
  'sketch_edits',
  {
    id: text('id').primaryKey(),
    sketchId: text('sketch_id')
      .notNull()
      .references(() => sketches.id, { onDelete: 'cascade' }),
    opId: text('op_id').notNull(),
    /** Null when rejected. */
    revision: integer('revision'),
    userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
    /** The op as applied (after rebasing), or as received when rejected. */
    op: jsonb('op').notNull(),
    /** `EDIT_STATUSES`: applied, rebased or rejected. */
    status: editStatusEnum('status').notNull(),
    reason: text('reason'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('sketch_edits_op_idx').on(t.sketchId, t.opId), index('sketch_edits_revision_idx').on(t.sketchId, t.revision)],
);

/** Who leads the walkthrough of a sketch, if anyone (shared by every server instance). */
export const walkthroughs = pgTable('walkthroughs', {
  sketchId: text('sketch_id')
    .primaryKey()
    .references(() => sketches.id, { onDelete: 'cascade' }),
  leadUserId: text('lead_user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  startedAt: timestamp('started_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Payloads over 8 KB that @socket.io/postgres-adapter passes between instances. */
export const socketIoAttachments = pgTable('socket_io_attachments', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  createdAt: timestamp('created_at', { withTimezone: true }).defaultNow(),
  payload: bytea('payload'),
});

export const pinStatusEnum = pgEnum('pin_status', PIN_STATUSES);

/**
 * Review pins: a comment placed on a point, a facet or a wave of a sketch, opening a thread.
 * `target` is shared/model/review.ts `PinTarget` (validated on the way in).
 */
export const pins = pgTable(
  'pins',
  {
    id: text('id').primaryKey(),
    sketchId: text('sketch_id')
      .notNull()
      .references(() => sketches.id, { onDelete: 'cascade' }),
    authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
    target: jsonb('target').notNull(),
    status: pinStatusEnum('status').notNull().default('open'),
    resolvedBy: text('resolved_by').references(() => users.id, { onDelete: 'set null' }),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    ...timestamps,
  },
  (t) => [index('pins_sketch_idx').on(t.sketchId, t.createdAt)],
);

/** The messages of a pin's thread; the first one is the pin's opening comment. */
export const pinReplies = pgTable(
  'pin_replies',
  {
    id: text('id').primaryKey(),
    pinId: text('pin_id')
      .notNull()
      .references(() => pins.id, { onDelete: 'cascade' }),
    authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
    body: text('body').notNull(),
    /** Members @mentioned (each got an e-mail notice). */
    mentions: text('mentions').array().notNull().default([]),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('pin_replies_pin_idx').on(t.pinId, t.createdAt)],
);

export const snapshotKindEnum = pgEnum('snapshot_kind', SNAPSHOT_KINDS);

/** Named, restorable versions of a sketch: title, document and the stored result at a revision. */
export const snapshots = pgTable(
  'snapshots',
  {
    id: text('id').primaryKey(),
    sketchId: text('sketch_id')
      .notNull()
      .references(() => sketches.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    note: text('note').notNull().default(''),
    kind: snapshotKindEnum('kind').notNull().default('manual'),
    revision: integer('revision').notNull(),
    title: text('title').notNull(),
    document: jsonb('document').notNull(),
    result: jsonb('result'),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('snapshots_sketch_idx').on(t.sketchId, t.createdAt)],
);

/**
 * What happened to a sketch besides edits (edits are read from sketch_edits): pins, replies,
 * resolutions, snapshots, restores, imports, review requests, status changes. The activity feed
 * merges both.
 */
export const sketchEvents = pgTable(
  'sketch_events',
  {
    id: text('id').primaryKey(),
    sketchId: text('sketch_id')
      .notNull()
      .references(() => sketches.id, { onDelete: 'cascade' }),
    actorId: text('actor_id').references(() => users.id, { onDelete: 'set null' }),
    /** `SKETCH_EVENT_KINDS`: pin.created, snapshot.restored, review.approved, … */
    kind: sketchEventKindEnum('kind').notNull(),
    detail: jsonb('detail').notNull().default({}),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('sketch_events_sketch_idx').on(t.sketchId, t.createdAt)],
);

/**
 * The review history of a sketch, kept whole: every approval, request for changes and owner's
 * reset, each naming the revision it was given to [A1]. The actor's name is copied so the
 * record still says who when the account is gone.
 */
export const reviewOutcomes = pgTable(
  'review_outcomes',
  {
    id: text('id').primaryKey(),
    sketchId: text('sketch_id')
      .notNull()
      .references(() => sketches.id, { onDelete: 'cascade' }),
    outcome: reviewOutcomeEnum('outcome').notNull(),
    revision: integer('revision').notNull(),
    actorId: text('actor_id').references(() => users.id, { onDelete: 'set null' }),
    actorName: text('actor_name').notNull(),
    note: text('note').notNull().default(''),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('review_outcomes_sketch_idx').on(t.sketchId, t.createdAt)],
);

/**
 * Studies: a sweep of one sketch over Mach × α × flap deflection. The server computes the
 * results itself (shared/flight/study.ts) from the sketch at `revision`; `definition` is
 * shared/model/study.ts `StudyDefinition`, `results` its packed `StudyResults`.
 */
export const studies = pgTable(
  'studies',
  {
    id: text('id').primaryKey(),
    sketchId: text('sketch_id')
      .notNull()
      .references(() => sketches.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    definition: jsonb('definition').notNull(),
    results: jsonb('results').notNull(),
    /** The sketch revision the study was computed on. */
    revision: integer('revision').notNull(),
    points: integer('points').notNull(),
    /** Status counts ({ ok: n, detached: n, … }), for lists without loading the rows. */
    counts: jsonb('counts').notNull().default({}),
    elapsedMs: integer('elapsed_ms'),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [index('studies_sketch_idx').on(t.sketchId, t.createdAt)],
);
