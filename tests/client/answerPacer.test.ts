import { describe, expect, it } from 'vitest';
import { answerPacer, type PacerClock } from '@/workers/answerPacer';

/** A clock the test moves by hand. */
function manualClock() {
  let t = 0;
  let timers: { at: number; fn: () => void; live: boolean }[] = [];
  const clock: PacerClock = {
    now: () => t,
    after(ms, fn) {
      const timer = { at: t + ms, fn, live: true };
      timers.push(timer);
      return () => (timer.live = false);
    },
  };
  const advance = (ms: number) => {
    const end = t + ms;
    for (;;) {
      const due = timers.filter((x) => x.live && x.at <= end).sort((a, b) => a.at - b.at)[0];
      if (!due) break;
      t = due.at;
      due.live = false;
      due.fn();
    }
    timers = timers.filter((x) => x.live);
    t = end;
  };
  return { clock, advance };
}

function setup() {
  const { clock, advance } = manualClock();
  const sent: { answer: number; at: number }[] = [];
  const pacer = answerPacer<number>((answer) => sent.push({ answer, at: clock.now() }), 80, clock);
  return { pacer, sent, advance };
}

describe('answerPacer: when the solver worker answers the page', () => {
  it('outside a drag: the first answer at once, then the newest at most every interval; the last of a burst always arrives', () => {
    const { pacer, sent, advance } = setup();
    pacer.offer(1, false);
    expect(sent).toEqual([{ answer: 1, at: 0 }]);
    // Typing: answers every 20 ms for 200 ms.
    for (let k = 2; k <= 11; k++) {
      advance(20);
      pacer.offer(k, false);
    }
    advance(500);
    expect(sent.map((s) => s.at)).toEqual([0, 80, 160, 240]);
    expect(sent.at(-1)!.answer).toBe(11);
    for (let k = 1; k < sent.length; k++) expect(sent[k]!.answer).toBeGreaterThan(sent[k - 1]!.answer);
  });

  it('during a drag: nothing while the pointer keeps moving, the newest once it pauses for the interval', () => {
    const { pacer, sent, advance } = setup();
    // 60 moves at 16 ms: nearly a second of continuous dragging.
    for (let k = 1; k <= 60; k++) {
      pacer.offer(k, true);
      advance(16);
    }
    expect(sent).toEqual([]);
    advance(80);
    expect(sent).toEqual([{ answer: 60, at: 60 * 16 - 16 + 80 }]);
    // A pause mid-drag answers; moving again holds the answers again.
    pacer.offer(61, true);
    advance(50);
    pacer.offer(62, true);
    advance(50);
    expect(sent).toHaveLength(1);
    advance(40);
    expect(sent.map((s) => s.answer)).toEqual([60, 62]);
  });

  it('the release (an answer from outside a drag) replaces a held drag answer and goes out at once', () => {
    const { pacer, sent, advance } = setup();
    pacer.offer(1, false);
    advance(500);
    for (let k = 2; k <= 10; k++) {
      pacer.offer(k, true);
      advance(16);
    }
    pacer.offer(11, false);
    expect(sent.map((s) => s.answer)).toEqual([1, 11]);
    advance(1000);
    // The held drag answer (10) never arrives after the release's.
    expect(sent.map((s) => s.answer)).toEqual([1, 11]);
  });

  it('a release right after an answer waits out the interval, and is still the one that arrives', () => {
    const { pacer, sent, advance } = setup();
    pacer.offer(1, true);
    advance(80);
    expect(sent.map((s) => s.answer)).toEqual([1]);
    advance(10);
    pacer.offer(2, false);
    expect(sent).toHaveLength(1);
    advance(70);
    expect(sent).toEqual([{ answer: 1, at: 80 }, { answer: 2, at: 160 }]);
  });
});
