import type { Db } from './db/client.ts';
import type { EventEmitter } from 'node:events';
import type { Mailer } from './mail/mailer.ts';
import type { EditQueue } from './realtime/editLog.ts';
import type { AppliedEdit, NoticeTopic } from '../shared/protocol/messages.ts';
import type { AccessFilter } from './realtime/access.ts';
import type { HeavyWork } from './http/heavyWork.ts';

/** Events services raise for the realtime layer (which relays them to every instance). */
export interface AppEvents {
  /** An edit was applied outside the socket channel (REST save, rename, restore). */
  sketchEdited: [sketchId: string, edit: AppliedEdit];
  /** Something besides the document changed (pins, snapshots, status): clients refetch it. */
  sketchNotice: [sketchId: string, topic: NoticeTopic];
  /**
   * Someone's access may have changed (sign-out, password reset, membership or role change, team
   * or sketch deleted): open sockets matching the filter re-check session and role at once.
   */
  accessChanged: [filter: AccessFilter];
  /** A team's sketch list changed in a way no sketch event carries (created, duplicated, deleted): home tables refetch [T2]. */
  teamSketchesChanged: [teamId: string];
  /** Someone's list of teams grew (an invitation accepted, a team created): their open home pages reload it [T5]. */
  teamsChanged: [userId: string];
}

export type { NoticeTopic } from '../shared/protocol/messages.ts';

/**
 * What services need besides their arguments: the database, outgoing mail and the public base
 * URL for links in e-mails. Built once in createApp and handed to routers.
 */
export interface AppContext {
  db: Db;
  mailer: Mailer;
  /** e.g. http://127.0.0.1:3000 — PUBLIC_URL, else the address the server listens on. */
  publicUrl(): string;
  log(line: string): void;
  /** Whether developer-only pages (the mailbox) exist. */
  devPages: boolean;
  /** Development only: accounts (lower-case e-mail) that may read every message in the mail sink. */
  mailboxOperators: ReadonlySet<string>;
  events: EventEmitter<AppEvents>;
  /** Every edit to a sketch document goes through here (ordered, batched, logged). */
  edits: EditQueue;
  /** Server-side studies and PDF reports run through here: bounded per person (over every instance) and per instance [H1]. */
  heavy: HeavyWork;
  /** Tests only (FAULT_STUDY_PAUSE_MS): extra wait between a server study's slices, so a study outlasts the test's steps. */
  studyPauseMs: number;
  /** Tests only (FAULT_STUDY_SLICE_POINTS): at most this many points per study slice. */
  studySlicePoints?: number;
}
