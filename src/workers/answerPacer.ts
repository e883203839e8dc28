/**
 * When the solver worker hands a solve's answer to the page. Each answer costs the worker a
 * structured clone of the whole analysis (at 200 vertices ~2.5 ms, mostly the wave map) and the
 * page's main thread as much again to read it, and while the worker clones it cannot start the
 * next solve: during a drag that delay lands on the next pointer move. The worker paints the
 * scene after every solve regardless, so the page needs answers only for its panels, the limit
 * labels and the legend.
 *
 * - Outside a drag, answers go out at most every `intervalMs`, the newest each time (solves
 *   that follow each other closely — typing in a field — are thinned, not delayed).
 * - During a drag (`drag`: the request solved only the selected design point for a preview),
 *   the answer waits until the pointer pauses: it goes out when no newer answer arrived for
 *   `intervalMs`. The panels refresh at pauses anyway (useSettled), and the limit labels
 *   follow at the pause (the legend follows the painted scene's range, reported apart).
 * - The last answer of a burst always arrives, and an answer from outside a drag (the release)
 *   replaces a held drag answer.
 */
export interface AnswerPacer<T> {
  offer(answer: T, drag: boolean): void;
}

export interface PacerClock {
  now(): number;
  /** Runs `fn` after `ms`; returns a function that cancels it. */
  after(ms: number, fn: () => void): () => void;
}

export const systemClock: PacerClock = {
  now: () => performance.now(),
  after(ms, fn) {
    const id = setTimeout(fn, ms);
    return () => clearTimeout(id);
  },
};

export function answerPacer<T>(send: (answer: T) => void, intervalMs: number, clock: PacerClock = systemClock): AnswerPacer<T> {
  let lastSentAt = -Infinity;
  let held: T | null = null;
  let cancel: (() => void) | null = null;

  const sendHeld = () => {
    cancel = null;
    const answer = held;
    held = null;
    if (answer === null) return;
    lastSentAt = clock.now();
    send(answer);
  };

  return {
    offer(answer, drag) {
      held = answer;
      if (drag) {
        // Wait for a pause: each newer answer starts the wait again.
        cancel?.();
        cancel = clock.after(intervalMs, sendHeld);
        return;
      }
      const wait = lastSentAt + intervalMs - clock.now();
      if (wait <= 0) {
        cancel?.();
        sendHeld();
        return;
      }
      // Within the interval: the newest goes out when it ends (a held drag answer's pause wait
      // is replaced by the interval's end).
      cancel?.();
      cancel = clock.after(wait, sendHeld);
    },
  };
}
