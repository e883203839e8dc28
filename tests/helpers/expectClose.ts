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

/**
 * Checks a value against a table entry as the source prints it: within half a unit of the last
 * printed digit ("0.5774" → ±0.00005, "2.667" → ±0.0005, "29" → ±0.5), so a test never claims
 * more or less precision than its source has.
 */
export function expectPrinted(actual: number, printed: string): void {
  const [mantissa = '', exponent] = printed.toLowerCase().split('e'); // split always gives a first part
  const dot = mantissa.indexOf('.');
  const decimals = dot < 0 ? 0 : mantissa.length - dot - 1;
  const scale = exponent === undefined ? 1 : 10 ** Number(exponent);
  expectClose(actual, Number(printed), 0.5 * 10 ** -decimals * scale * (1 + 1e-12));
}

/** Relative version: |actual − expected| ≤ rel·|expected|. */
export function expectCloseRel(actual: number, expected: number, rel: number): void {
  expectClose(actual, expected, Math.abs(expected) * rel);
}
