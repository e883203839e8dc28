import type { Db } from '../db/client.ts';
import { isDatabaseUnavailable, sqlState } from '../db/errors.ts';
import { errorForLog } from '../log.ts';
import { newId } from '../../shared/model/ids.ts';
import { roleAtLeast, type Role } from '../../shared/model/roles.ts';
import { normalizeDocument, type SketchDocument } from '../../shared/model/sketch.ts';
import { applyEdit, transformPast, type SketchState } from '../../shared/protocol/transform.ts';
import type { EditOp, EditStatus } from '../../shared/protocol/messages.ts';
import { firstItem, invariant, itemAt } from '../../shared/util/invariant.ts';
import { editSketchAtomically, type BatchWrite, type EditLogRow, type LockedSketch } from './repository.ts';
import { createSolveQueue, type SolveQueue } from './solveQueue.ts';

export type EditOutcome =
  | { status: Exclude<EditStatus, 'rejected'>; revision: number; op: EditOp; duplicate: boolean }
  | { status: 'rejected'; reason: string; duplicate: boolean };

export interface EditInput {
  sketchId: string;
  userId: string;
  baseRevision: number;
  op: EditOp;
  /** Whole-document saves: refuse instead of rebasing when the base is stale. */
  requireBase?: boolean;
}

/** The document of one sketch at one revision, kept between batches so it is not read again. */
export interface CachedDocument {
  revision: number;
  document: SketchDocument;
}

/**
 * Decides a batch of edits on a locked sketch — the single place where revisions are assigned
 * [R2]: earlier outcomes of these op ids are repeated [R3], the callers' roles checked, stale
 * edits rebased past the log [R5], the edits applied in order in memory. Returns the outcomes,
 * what to write, and the final document (for the cache and the solve).
 */
export async function planBatch(
  sketchId: string,
  items: readonly EditInput[],
  locked: LockedSketch,
  cached: CachedDocument | null,
  loggedAfter: (revision: number) => Promise<Map<number, EditOp>>,
): Promise<{ write: BatchWrite; result: { outcomes: EditOutcome[]; state: { revision: number; document: SketchDocument } } }> {
  const seen = new Map<string, EditOutcome>();
  for (const e of locked.seen) {
    seen.set(
      e.op_id,
      e.status === 'rejected'
        ? { status: 'rejected', reason: e.reason ?? 'Rejected earlier.', duplicate: true }
        : { status: e.status, revision: e.revision!, op: e.op, duplicate: true },
    );
  }
  const roles = new Map<string, Role>(Object.entries(locked.roles));
  const staleBases = items.filter((i) => i.baseRevision < locked.revision && !seen.has(i.op.opId)).map((i) => i.baseRevision);
  const logged = staleBases.length ? await loggedAfter(Math.min(...staleBases)) : new Map<number, EditOp>();

  // The row is at the cached revision exactly when the query left the document out.
  const stored = locked.document === null && cached ? cached.document : normalizeDocument(locked.document);
  let state: SketchState = { title: locked.title, document: stored };
  let revision = locked.revision;
  let lastEditor: string | null = null;
  const rows: EditLogRow[] = [];
  const outcomes: EditOutcome[] = [];
  const reject = (item: EditInput, reason: string): EditOutcome => {
    const outcome: EditOutcome = { status: 'rejected', reason, duplicate: false };
    rows.push({ id: newId('op'), opId: item.op.opId, revision: null, userId: item.userId, op: item.op, status: 'rejected', reason });
    seen.set(item.op.opId, { ...outcome, duplicate: true });
    return outcome;
  };

  for (const item of items) {
    const earlier = seen.get(item.op.opId);
    if (earlier) {
      outcomes.push({ ...earlier, duplicate: true });
      continue;
    }
    const role = roles.get(item.userId) ?? null;
    if (!roleAtLeast(role, 'editor')) {
      outcomes.push(reject(item, role ? `Your role in this team is ${role}; editing needs the editor role.` : 'You are not a member of this sketch’s team.'));
      continue;
    }
    if (item.baseRevision > revision) {
      outcomes.push(reject(item, `Your edit claims revision ${item.baseRevision}, but the sketch is at ${revision}; reload it.`));
      continue;
    }
    let op = item.op;
    if (item.baseRevision < revision) {
      if (item.requireBase) {
        outcomes.push(reject(item, `The sketch changed since revision ${item.baseRevision} (now at ${revision}); reload it and apply your change again.`));
        continue;
      }
      const since: EditOp[] = [];
      for (let r = item.baseRevision + 1; r <= revision; r++) {
        const e = logged.get(r);
        if (!e) break;
        since.push(e);
      }
      if (since.length !== revision - item.baseRevision) {
        outcomes.push(reject(item, `Your edit was made on revision ${item.baseRevision}, too far behind to rebase; reload the sketch.`));
        continue;
      }
      const rebased = transformPast(op, since);
      if (!rebased.ok) {
        outcomes.push(reject(item, rebased.reason));
        continue;
      }
      op = rebased.op;
    }
    const next = applyEdit(state, op);
    if (!next.ok) {
      outcomes.push(reject(item, next.reason));
      continue;
    }
    state = next.state;
    revision += 1;
    lastEditor = item.userId;
    logged.set(revision, op);
    const status = item.baseRevision < revision - 1 ? 'rebased' : 'applied';
    rows.push({ id: newId('op'), opId: item.op.opId, revision, userId: item.userId, op, status, reason: null });
    const outcome: EditOutcome = { status, revision, op, duplicate: false };
    seen.set(item.op.opId, { ...outcome, duplicate: true });
    outcomes.push(outcome);
  }

  const sketch = revision !== locked.revision ? { title: state.title, document: state.document, revision, updatedBy: lastEditor } : null;
  return { write: { sketch, rows }, result: { outcomes, state: { revision, document: state.document } } };
}

/**
 * Per-sketch queues that feed the edit log: edits arriving while a batch is in its transaction
 * wait and go together in the next one (group commit), so a busy sketch costs a handful of
 * statements per batch rather than per edit. Order within a sketch is arrival order. After a
 * batch commits, the sketch is solved outside the lock (coalesced, see solveQueue.ts).
 */
export interface EditQueue {
  submit(input: EditInput): Promise<EditOutcome>;
  /** Solve a sketch whose stored result trails its revision (seen at a join). */
  solveLater(sketchId: string, revision: number, document: SketchDocument): void;
  /** Resolves once no solve is running or waiting. */
  settled(): Promise<void>;
}

export const MAX_EDIT_BATCH = 200;
/** Sketch documents kept between batches (per process). */
export const DOCUMENT_CACHE_SIZE = 100;
/** A batch that timed out waiting for the row lock is tried this many times in all. */
export const EDIT_LOCK_ATTEMPTS = 3;

/** The row lock was not granted in time (a frozen holder): nothing was written, try again. */
const isLockTimeout = (err: unknown) => sqlState(err) === '55P03';

export function createEditQueue(db: Db, options: { solves?: SolveQueue; log?: (line: string) => void } = {}): EditQueue {
  const log = options.log ?? (() => {});
  const solves = options.solves ?? createSolveQueue(db, log);
  type Waiting = { input: EditInput; resolve: (o: EditOutcome) => void; reject: (e: unknown) => void };
  const queues = new Map<string, { items: Waiting[]; running: boolean }>();
  const cache = new Map<string, CachedDocument>();
  /**
   * A lost database, a lost race (serialization failure, deadlock) or a lock or statement that
   * timed out (a frozen instance): the callers' answer ("could not process, retried"), not the
   * edit's fault.
   */
  const passing = (err: unknown) => isDatabaseUnavailable(err) || ['40001', '40P01', '55P03', '57014'].includes(sqlState(err) ?? '');

  /** An edit that failed on its own (not for a lost database) is rejected; nothing of it was written. */
  function refuse(b: Waiting, err: unknown): void {
    log(`[realtime] edit ${b.input.op.type} on ${b.input.sketchId} refused by the database: ${errorForLog(err, false)}`);
    b.resolve({ status: 'rejected', reason: 'This edit could not be stored (one of its values was refused); nothing of it was saved.', duplicate: false });
  }

  /** The batch, tried again while the row lock times out (up to EDIT_LOCK_ATTEMPTS in all). */
  async function applyWithRetry(sketchId: string, items: EditInput[]): Promise<EditOutcome[]> {
    for (let attempt = 1; ; attempt++) {
      try {
        return await applyBatch(sketchId, items);
      } catch (err) {
        if (!isLockTimeout(err) || attempt >= EDIT_LOCK_ATTEMPTS) throw err;
      }
    }
  }

  /** One edit in its own transaction. */
  async function applyAlone(b: Waiting): Promise<void> {
    try {
      // One outcome per input, in order.
      b.resolve(firstItem(await applyWithRetry(b.input.sketchId, [b.input])));
    } catch (err) {
      if (passing(err)) b.reject(err);
      else refuse(b, err);
    }
  }

  function remember(sketchId: string, entry: CachedDocument): void {
    cache.delete(sketchId);
    cache.set(sketchId, entry);
    if (cache.size > DOCUMENT_CACHE_SIZE) {
      const oldest = cache.keys().next(); // a Map keeps insertion order: the least recently used
      if (!oldest.done) cache.delete(oldest.value);
    }
  }

  async function applyBatch(sketchId: string, items: EditInput[]): Promise<EditOutcome[]> {
    const cached = cache.get(sketchId) ?? null;
    const ask = { opIds: [...new Set(items.map((i) => i.op.opId))], userIds: [...new Set(items.map((i) => i.userId))], cachedRevision: cached?.revision ?? null };
    const done = await editSketchAtomically(db, sketchId, ask, (locked, loggedAfter) => planBatch(sketchId, items, locked, cached, loggedAfter));
    if (!done) {
      cache.delete(sketchId);
      return items.map(() => ({ status: 'rejected' as const, reason: 'This sketch no longer exists.', duplicate: false }));
    }
    const changed = done.state.revision !== cached?.revision;
    remember(sketchId, done.state);
    if (changed && done.outcomes.some((o) => o.status !== 'rejected' && !o.duplicate)) solves.schedule(sketchId, done.state.revision, done.state.document);
    return done.outcomes;
  }

  async function drain(sketchId: string): Promise<void> {
    const q = queues.get(sketchId);
    invariant(q, `a queue exists for ${sketchId} while it drains`);
    q.running = true;
    try {
      while (q.items.length) {
        const batch = q.items.splice(0, MAX_EDIT_BATCH);
        try {
          const outcomes = await applyWithRetry(sketchId, batch.map((b) => b.input));
          batch.forEach((b, i) => b.resolve(itemAt(outcomes, i)));
        } catch (err) {
          // [R9] One edit the database refuses must not fail its neighbours: when a batch of
          // several fails for any reason but a lost database, race or timeout, each edit is tried on its own.
          if (passing(err)) for (const b of batch) b.reject(err);
          else if (batch.length === 1) refuse(firstItem(batch), err);
          else for (const b of batch) await applyAlone(b);
        }
      }
    } finally {
      q.running = false;
      queues.delete(sketchId);
    }
  }

  return {
    submit(input) {
      return new Promise((resolve, reject) => {
        let q = queues.get(input.sketchId);
        if (!q) {
          q = { items: [], running: false };
          queues.set(input.sketchId, q);
        }
        q.items.push({ input, resolve, reject });
        if (!q.running) void drain(input.sketchId);
      });
    },
    solveLater(sketchId, revision, document) {
      solves.schedule(sketchId, revision, document);
    },
    settled: () => solves.idle(),
  };
}
