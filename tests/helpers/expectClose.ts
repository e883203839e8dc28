import { expect } from 'vitest';

/**
 * Asserts |actual − expected| ≤ tol (absolute). The one closeness helper every numeric test
 * uses, so a failure always prints the same three numbers.
 */
export function expectClose(actual: number, expected: number, tol: number): void {
  const ok = Number.isFinite(actual) && Math.abs(actual - expected) <= tol;
  if (!ok) {
    expect.fail(`expected ${actual} to be within ${tol} of ${expected} (off by ${actual - expected})`);
  }
}

/** Relative version: |actual − expected| ≤ rel·|expected|. */
export function expectCloseRel(actual: number, expected: number, rel: number): void {
  expectClose(actual, expected, Math.abs(expected) * rel);
}
