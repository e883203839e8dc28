import { expect } from 'vitest';

/**
 * Counts the cases of a property test that reached its assertion, so that a generator that
 * mostly produces inputs the property skips cannot pass unnoticed: call `hit()` just before the
 * assertions and `expectAtLeast(min)` after `fc.assert`. (fast-check re-runs the predicate while
 * shrinking a failure; that only happens when the property already failed.) No Node types: the
 * client tests (DOM project) use it too.
 */
export function reached(name: string) {
  let count = 0;
  return {
    hit(): void {
      count++;
    },
    get count(): number {
      return count;
    },
    expectAtLeast(min: number): void {
      if ((globalThis as { process?: { env: Record<string, string | undefined> } }).process?.env.SHOW_REACHED) console.log(`${name}: ${count} reached (minimum ${min})`);
      expect(count, `${name}: ${count} cases reached the assertion; at least ${min} must`).toBeGreaterThanOrEqual(min);
    },
  };
}
