import type { Db } from '../db/client.ts';
import { errorForLog } from '../log.ts';
import { newId } from '../../shared/model/ids.ts';
import { HttpError } from './errors.ts';
import * as repo from './repository.ts';

/**
 * Heavy work — server-side studies (up to STUDY_MAX_POINTS points) and PDF reports — is bounded
 * [H1]: each person runs at most `perUser` at a time over every instance on the database, and each
 * instance at most `total`, so a handful of maximal requests cannot take the CPU from everyone
 * else (studies compute in slices, and between slices the instance answers other requests,
 * /api/health included). A request over either bound is refused at once with 429 and a sentence
 * saying which bound and what to do — never queued, so refused work costs nothing.
 *
 * The person's slots live in PostgreSQL (`heavy_work_slots`) as leases, not as connections or
 * session locks, so the bound stays right in each way an instance can fail:
 * - it dies (SIGKILL, crash): its leases are no longer renewed and stop counting within
 *   HEAVY_SLOT_LEASE_MS;
 * - it hangs (stopped, swapping): the same, and when it wakes its next renewal finds the lease
 *   gone, so the work stops (the signal aborts) and a study never saves after its lease ran
 *   out (`slot.confirm()` right before the save);
 * - the database goes away: claims answer 503 (the work needs the database anyway), renewals
 *   fail and are tried again at the next beat — logged, never a process exit —, and once the
 *   database is back a lease that ran out meanwhile is treated as lost, never revived.
 * A connection-bound advisory lock would free a dead instance's slot at once, but a hung
 * instance's connection stays open and keeps it, and a dropped connection frees it while the
 * work still runs.
 *
 * The instance's bound is its own CPU, so it stays a count in memory.
 */
export interface HeavyWorkLimits {
  /** Heavy requests one person may have running at once, over every instance. */
  perUser: number;
  /** Heavy requests this instance runs at once, over everyone. */
  total: number;
}

export const DEFAULT_HEAVY_WORK: HeavyWorkLimits = { perUser: 2, total: 4 };

/** How long a slot stays held without being renewed: a dead or hung instance's slots are free after this. */
export const HEAVY_SLOT_LEASE_MS = 20_000;
/** How often an instance renews the leases of the slots it holds (a quarter of the lease). */
export const HEAVY_SLOT_RENEW_MS = 5_000;

/** What heavy work receives from its slot. */
export interface HeavySlot {
  /** Aborted when the slot was lost (its lease ran out before it could be renewed): stop, save nothing. */
  signal: AbortSignal;
  /** Renews the lease now; throws a 503 HttpError (and aborts `signal`) when the slot was lost. Call it right before saving. */
  confirm(): Promise<void>;
}

export interface HeavyWork {
  /** Runs `work` in a slot of `userId`'s, or throws a 429 HttpError when none is free. */
  run<T>(userId: string, what: string, work: (slot: HeavySlot) => Promise<T>): Promise<T>;
  /** Heavy requests running now on this instance (all people), slots claimed. */
  running(): number;
  /** The id this instance writes on its slots. */
  readonly instanceId: string;
  /** Stops renewing and gives back every slot this instance holds (at shutdown). */
  close(): Promise<void>;
}

interface Held {
  controller: AbortController;
}

export function createHeavyWork(
  db: Db,
  limits: HeavyWorkLimits,
  options: { log?: (line: string) => void; leaseMs?: number; renewMs?: number } = {},
): HeavyWork {
  const log = options.log ?? (() => {});
  const leaseMs = options.leaseMs ?? HEAVY_SLOT_LEASE_MS;
  const renewMs = options.renewMs ?? HEAVY_SLOT_RENEW_MS;
  const instanceId = newId('instance');
  /** Slots claimed and not yet given back, by slot id. */
  const held = new Map<string, Held>();
  /** Requests past the instance's bound check (claiming or running): the instance's bound counts these. */
  let reserved = 0;
  let timer: NodeJS.Timeout | undefined;
  let renewing = false;
  let renewalFailing = false;
  let closed = false;

  const lost = (id: string) => {
    const slot = held.get(id);
    if (!slot || slot.controller.signal.aborted) return;
    log(`[heavy] slot ${id} was lost (its lease ran out before it was renewed): the work stops`);
    slot.controller.abort(new HttpError(503, 'heavy_slot_lost', 'The server lost this work’s place among your heavy work (it could not renew it in time). Nothing was saved; please start it again.'));
  };

  /** One renewal of every held slot; a slot missing from the answer is lost. */
  const renew = async () => {
    if (renewing || held.size === 0) return;
    renewing = true;
    const ids = [...held.keys()];
    try {
      const still = await repo.renewHeavySlots(db, ids, leaseMs);
      if (renewalFailing) log('[heavy] slot leases renewed again');
      renewalFailing = false;
      for (const id of ids) if (!still.has(id)) lost(id);
    } catch (err) {
      // The database away is an expected state: the work goes on, the next beat tries again.
      if (!renewalFailing) log(`[heavy] could not renew slot leases (${errorForLog(err, false)}); trying again in ${renewMs / 1000} s`);
      renewalFailing = true;
    } finally {
      renewing = false;
    }
  };

  const schedule = () => {
    if (timer || closed) return;
    timer = setInterval(() => {
      if (held.size === 0) {
        clearInterval(timer);
        timer = undefined;
        return;
      }
      void renew();
    }, renewMs);
    timer.unref();
  };

  const perUserBusy = (mine: number, what: string) =>
    new HttpError(
      429,
      'busy',
      `You already have ${mine} studies or reports being computed (at most ${limits.perUser} at a time per person); ${what} can start when one of them has finished.`,
      { retryAfterSeconds: 5 },
    );

  return {
    instanceId,
    async run(userId, what, work) {
      if (reserved >= limits.total) {
        // Both bounds may be reached: the person's own is the one they can do something about.
        const mine = await repo.countHeavySlots(db, userId);
        if (mine >= limits.perUser) throw perUserBusy(mine, what);
        throw new HttpError(429, 'busy', `The server is computing ${reserved} studies and reports right now, as many as it runs at once; try ${what} again in a few seconds.`, { retryAfterSeconds: 5 });
      }
      // Reserved before the first await, so requests arriving together cannot all pass the check.
      reserved += 1;
      const id = newId('slot');
      try {
        const claim = await repo.claimHeavySlot(db, { id, userId, instanceId, leaseMs }, limits.perUser);
        if (!claim.claimed) throw perUserBusy(claim.held, what);
      } catch (err) {
        reserved -= 1;
        throw err;
      }
      const controller = new AbortController();
      held.set(id, { controller });
      schedule();
      const slot: HeavySlot = {
        signal: controller.signal,
        async confirm() {
          if (!controller.signal.aborted) {
            const still = await repo.renewHeavySlots(db, [id], leaseMs);
            if (!still.has(id)) lost(id);
          }
          if (controller.signal.aborted) throw controller.signal.reason;
        },
      };
      try {
        return await work(slot);
      } finally {
        held.delete(id);
        reserved -= 1;
        // Given back at once so the person may start another anywhere; when the database is
        // away the lease runs out by itself.
        await repo.releaseHeavySlot(db, id).catch((err: unknown) => log(`[heavy] could not give slot ${id} back (its lease will run out): ${errorForLog(err, false)}`));
      }
    },
    running: () => held.size,
    async close() {
      closed = true;
      clearInterval(timer);
      timer = undefined;
      await repo.releaseInstanceHeavySlots(db, instanceId).catch((err: unknown) => log(`[heavy] could not give this instance's slots back (their leases will run out): ${errorForLog(err, false)}`));
    },
  };
}
