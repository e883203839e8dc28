import { HttpError } from './errors.ts';

/**
 * Heavy work — server-side studies (up to STUDY_MAX_POINTS points) and PDF reports — is bounded
 * in this instance [H1]: each person runs at most `perUser` at a time, and the instance at most
 * `total`, so a handful of maximal requests cannot take the CPU from everyone else (studies
 * compute in slices, and between slices the instance answers other requests, /api/health
 * included). A request over either bound is refused at once with 429 and a sentence saying
 * which bound and what to do — never queued, so refused work costs nothing.
 *
 * A slot is held from the start of the work until it settles. A study whose request is closed
 * (the tab closed, the request cancelled) stops at its next slice and settles, freeing its slot;
 * a report is short and runs to its end.
 */
export interface HeavyWorkLimits {
  /** Heavy requests one person may have running at once. */
  perUser: number;
  /** Heavy requests this instance runs at once, over everyone. */
  total: number;
}

export const DEFAULT_HEAVY_WORK: HeavyWorkLimits = { perUser: 2, total: 4 };

export interface HeavyWork {
  /** Runs `work` in a slot of `userId`'s, or throws a 429 HttpError when none is free. */
  run<T>(userId: string, what: string, work: () => Promise<T>): Promise<T>;
  /** Heavy requests running now (all people). */
  running(): number;
}

export function createHeavyWork(limits: HeavyWorkLimits): HeavyWork {
  const perUser = new Map<string, number>();
  let total = 0;
  return {
    async run(userId, what, work) {
      const mine = perUser.get(userId) ?? 0;
      if (mine >= limits.perUser) {
        throw new HttpError(
          429,
          'busy',
          `You already have ${mine} studies or reports being computed (at most ${limits.perUser} at a time per person); ${what} can start when one of them has finished.`,
          { retryAfterSeconds: 5 },
        );
      }
      if (total >= limits.total) {
        throw new HttpError(429, 'busy', `The server is computing ${total} studies and reports right now, as many as it runs at once; try ${what} again in a few seconds.`, { retryAfterSeconds: 5 });
      }
      perUser.set(userId, mine + 1);
      total += 1;
      try {
        return await work();
      } finally {
        total -= 1;
        const left = (perUser.get(userId) ?? 1) - 1;
        if (left > 0) perUser.set(userId, left);
        else perUser.delete(userId);
      }
    },
    running: () => total,
  };
}
