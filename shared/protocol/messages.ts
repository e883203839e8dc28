import { z } from 'zod';
import { opIdSchema, sketchOpSchema, type SketchOp } from '../model/ops.ts';
import { textSchema } from '../model/text.ts';
import { MAX_SECTION_VERTICES, sketchDocumentSchema, sketchTitleSchema, pointSchema } from '../model/sketch.ts';
import { roleSchema } from '../model/roles.ts';
import { idSchema } from '../model/ids.ts';

/**
 * The realtime protocol between the editor and the server (socket.io). Every message is one
 * object on the `message` event, discriminated on `type`. Invariants (shared/protocol/README.md):
 *
 * - [R1] The server validates every inbound message with the schemas below; a bad one gets an
 *   `error` message with a reason and changes nothing.
 * - [R2] The server is authoritative: it orders edits, assigns revisions (+1 per applied edit),
 *   persists edit and document in one transaction, acks the sender, broadcasts to the room.
 * - [R3] Every edit carries a client op id; a repeated id is acked with the first outcome and
 *   never applied twice.
 * - [R4] Presence (cursor, selection, viewport) is volatile: relayed, throttled, never stored.
 */
/**
 * 2: single-field ops (setVertexCoordinate, setField). 3: sketch documents hold design points
 * (document version 2) and the design point ops. 4: `replaceSection` may carry `loadsChordM`
 * (a coordinates import at physical size, one undo step), and the server sends the revision
 * heartbeat [R7]. A page still speaking an older protocol is told to reload.
 */
export const PROTOCOL_VERSION = 4;

/**
 * What a `notice` says changed on a sketch (clients refetch that list) [M1]: the server's
 * events, this protocol and the client's per-topic counters all use this list.
 */
export const NOTICE_TOPICS = ['pins', 'snapshots', 'status', 'activity', 'studies'] as const;
export type NoticeTopic = (typeof NOTICE_TOPICS)[number];

/**
 * What became of an edit the server received [M1]: applied on the base it named, rebased over
 * edits that landed first, or rejected with a reason. The `ack` message and the edit log
 * (`sketch_edits.status`) use this list.
 */
export const EDIT_STATUSES = ['applied', 'rebased', 'rejected'] as const;
export type EditStatus = (typeof EDIT_STATUSES)[number];

const sketchIdSchema = idSchema('sketch');
const revisionSchema = z.number().int().min(0);

/** Renaming is an edit too (it is ordered and logged), though the title is not in the document. */
export const renameOpSchema = z.object({ type: z.literal('rename'), opId: opIdSchema, title: sketchTitleSchema });
export type RenameOp = z.infer<typeof renameOpSchema>;

/** A whole-document replacement (REST saves, imports, restores): logged like any edit. */
export const replaceDocumentOpSchema = z.object({ type: z.literal('replaceDocument'), opId: opIdSchema, document: sketchDocumentSchema });
export type ReplaceDocumentOp = z.infer<typeof replaceDocumentOpSchema>;

export const editOpSchema = z.discriminatedUnion('type', [...sketchOpSchema.options, renameOpSchema, replaceDocumentOpSchema]);
export type EditOp = SketchOp | RenameOp | ReplaceDocumentOp;

export const viewSchema = z.object({ center: pointSchema, zoom: z.number().positive().max(1e6) });
export type View = z.infer<typeof viewSchema>;

/** What a walkthrough lead points at. */
export const highlightSchema = z
  .object({ kind: z.enum(['wave', 'facet', 'vertex']), id: z.union([textSchema().max(64), z.number().int().min(0)]) })
  .nullable();
export type Highlight = z.infer<typeof highlightSchema>;

// ── client → server ───────────────────────────────────────────────────────────────────────────

export const joinMessageSchema = z.object({
  type: z.literal('join'),
  protocol: z.number().int(),
  sketchId: sketchIdSchema,
  /** Set when rejoining after a disconnect: the server replays what came after it. */
  lastRevision: revisionSchema.optional(),
});
export const leaveMessageSchema = z.object({ type: z.literal('leave'), sketchId: sketchIdSchema });
export const editMessageSchema = z.object({ type: z.literal('edit'), sketchId: sketchIdSchema, baseRevision: revisionSchema, op: editOpSchema });
export const presenceMessageSchema = z.object({
  type: z.literal('presence'),
  sketchId: sketchIdSchema,
  cursor: pointSchema.nullable(),
  selection: z.array(z.number().int().min(0)).max(MAX_SECTION_VERTICES),
});
export const resyncMessageSchema = z.object({ type: z.literal('resync'), sketchId: sketchIdSchema, lastRevision: revisionSchema.optional() });
export const walkthroughStartSchema = z.object({ type: z.literal('walkthroughStart'), sketchId: sketchIdSchema });
export const walkthroughStopSchema = z.object({ type: z.literal('walkthroughStop'), sketchId: sketchIdSchema });
export const walkthroughViewSchema = z.object({ type: z.literal('walkthroughView'), sketchId: sketchIdSchema, view: viewSchema, highlight: highlightSchema });
export const walkthroughHandOverSchema = z.object({ type: z.literal('walkthroughHandOver'), sketchId: sketchIdSchema, toUserId: textSchema().max(64) });

/** The home table watches a team's sketch list [T1] (membership checked by the server). */
export const watchTeamMessageSchema = z.object({ type: z.literal('watchTeam'), teamId: idSchema('team') });
export const unwatchTeamMessageSchema = z.object({ type: z.literal('unwatchTeam'), teamId: idSchema('team') });

export const clientMessageSchema = z.discriminatedUnion('type', [
  joinMessageSchema,
  leaveMessageSchema,
  editMessageSchema,
  presenceMessageSchema,
  resyncMessageSchema,
  walkthroughStartSchema,
  walkthroughStopSchema,
  walkthroughViewSchema,
  walkthroughHandOverSchema,
  watchTeamMessageSchema,
  unwatchTeamMessageSchema,
]);
export type ClientMessage = z.infer<typeof clientMessageSchema>;

// ── server → client ───────────────────────────────────────────────────────────────────────────

export const personSchema = z.object({
  connectionId: z.string(),
  userId: z.string(),
  name: z.string(),
  role: roleSchema,
  /** Display colour for cursor and name tag. */
  colour: z.string(),
});
export type Person = z.infer<typeof personSchema>;

export const walkthroughStateSchema = z
  .object({ leadUserId: z.string(), leadName: z.string(), startedAt: z.string() })
  .nullable();
export type WalkthroughState = z.infer<typeof walkthroughStateSchema>;

export const appliedEditSchema = z.object({ revision: revisionSchema, op: editOpSchema, userId: z.string().nullable() });
export type AppliedEdit = z.infer<typeof appliedEditSchema>;

export type ServerMessage =
  | {
      type: 'joined';
      sketchId: string;
      title: string;
      document: z.infer<typeof sketchDocumentSchema>;
      revision: number;
      people: Person[];
      walkthrough: WalkthroughState;
      you: Person;
    }
  /** Edits after the client's lastRevision, in order (reconnect, or a gap it asked to fill). */
  | { type: 'replay'; sketchId: string; edits: AppliedEdit[]; revision: number }
  /** The whole state, when the log cannot bridge the gap (or after a REST save). */
  | { type: 'snapshot'; sketchId: string; title: string; document: z.infer<typeof sketchDocumentSchema>; revision: number }
  | { type: 'ack'; sketchId: string; opId: string; status: Exclude<EditStatus, 'rejected'>; revision: number; op: EditOp }
  | { type: 'ack'; sketchId: string; opId: string; status: 'rejected'; reason: string }
  | ({ type: 'edit'; sketchId: string } & AppliedEdit)
  | { type: 'presence'; sketchId: string; connectionId: string; userId: string; cursor: [number, number] | null; selection: number[] }
  | { type: 'people'; sketchId: string; people: Person[] }
  /** Heartbeat: the sketch's latest revision; a client behind it resyncs [R7]. */
  | { type: 'revision'; sketchId: string; revision: number }
  | { type: 'walkthrough'; sketchId: string; state: WalkthroughState }
  | { type: 'walkthroughView'; sketchId: string; view: View; highlight: Highlight; leadUserId: string }
  /** Pins, snapshots, status, activity or studies of the sketch changed: refetch that list. */
  | { type: 'notice'; sketchId: string; topic: NoticeTopic }
  /**
   * My access to the sketch changed while I was in it: a new role, or none (removed from the team,
   * sketch deleted) — then the server has already taken me out of the room and sends nothing more.
   */
  | { type: 'access'; sketchId: string; role: z.infer<typeof roleSchema> | null; reason: string }
  /** The team's sketch list is watched from now on (answer to `watchTeam`) [T1]. */
  | { type: 'teamWatched'; teamId: string; role: z.infer<typeof roleSchema> }
  /** The team's sketch list changed — a sketch created, renamed, edited, deleted, its review status: refetch it [T2]. Names no sketch. */
  | { type: 'teamSketches'; teamId: string }
  /** My membership of a watched team changed: a new role, or none — then the watch has ended and nothing more comes [T3]. */
  | { type: 'teamAccess'; teamId: string; role: z.infer<typeof roleSchema> | null; reason: string }
  /** My list of teams grew (I joined a team, or created one): reload it [T5]. Sent to my own connections only. */
  | { type: 'teamsChanged' }
  | { type: 'error'; code: string; reason: string; about?: string };

/** socket.io typed event maps: one event each way. */
export interface ServerToClientEvents {
  message: (msg: ServerMessage) => void;
}
export interface ClientToServerEvents {
  message: (msg: ClientMessage) => void;
}

/** Timing constants (ms), one place. */
export const CURSOR_BROADCAST_INTERVAL_MS = 33;
export const WALKTHROUGH_VIEW_INTERVAL_MS = 50;
/** A cursor not refreshed for this long is hidden (its owner may have gone quiet). */
export const CURSOR_STALE_AFTER_MS = 5_000;
/** A revision gap not filled within this time makes the client ask for a resync. */
export const GAP_RESYNC_AFTER_MS = 1_000;
/** A join or resync left unanswered this long (the server could not reach its database) is sent again. */
export const REJOIN_RETRY_MS = 3_000;
/**
 * Each server instance tells its clients every open sketch's latest revision this often, so a
 * client that missed a broadcast (its instance died between commit and broadcast) heals
 * within about REVISION_HEARTBEAT_MS + GAP_RESYNC_AFTER_MS without anyone editing [R7].
 */
export const REVISION_HEARTBEAT_MS = 2_000;
/** Server heartbeat: a dropped connection is noticed within about PING_INTERVAL + PING_TIMEOUT. */
export const PING_INTERVAL_MS = 3_000;
export const PING_TIMEOUT_MS = 3_000;
/** Every server instance re-sends the people list of its rooms this often (heals misses). */
export const PEOPLE_REFRESH_MS = 5_000;
/** A team's watchers get at most one `teamSketches` notice this often (the last change always follows). */
export const TEAM_NOTICE_INTERVAL_MS = 1_000;
/** Longest op log the server replays on reconnect before sending a snapshot instead. */
export const MAX_REPLAY_EDITS = 500;
