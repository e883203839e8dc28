import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatFixed, formatNumber, formatSigned, MINUS, parseFormatted } from '../../../shared/format/number.ts';
import { reached } from '../../helpers/reached.ts';

describe('formatNumber: one way to print a number for people', () => {
  it('writes ordinary magnitudes out, with a true minus sign and no e-notation', () => {
    expect(formatNumber(0.08061)).toBe('0.08061');
    expect(formatNumber(-0.0421)).toBe(`${MINUS}0.0421`);
    expect(formatNumber(-0.00013)).toBe(`${MINUS}0.00013`);
    expect(formatNumber(2.3e-5, 2)).toBe('0.000023');
    expect(formatNumber(1234.5678)).toBe('1,235');
    expect(formatNumber(999.94)).toBe('999.9');
    expect(formatNumber(12_345.678)).toBe('12,350');
    expect(formatNumber(-9_876_543.21, 7)).toBe(`${MINUS}9,876,543`);
    expect(formatNumber(0)).toBe('0');
    expect(formatNumber(-0)).toBe('0');
    expect(formatNumber(2)).toBe('2');
    expect(formatNumber(0.5, 3)).toBe('0.5');
  });

  it('typesets powers of ten only outside 10⁻⁵…10⁷', () => {
    expect(formatNumber(3.1e-8, 2)).toBe(`3.1 × 10${'⁻⁸'}`);
    expect(formatNumber(-4.25e-6, 3)).toBe(`${MINUS}4.25 × 10⁻⁶`);
    expect(formatNumber(12_345_678)).toBe('1.235 × 10⁷');
    expect(formatNumber(9_999_999)).toBe('1 × 10⁷'); // rounds up across the threshold
  });

  it('says what is missing or infinite', () => {
    expect(formatNumber(null)).toBe('—');
    expect(formatNumber(undefined)).toBe('—');
    expect(formatNumber(Number.NaN)).toBe('—');
    expect(formatNumber(Number.POSITIVE_INFINITY)).toBe('∞');
    expect(formatNumber(Number.NEGATIVE_INFINITY)).toBe(`${MINUS}∞`);
  });

  it('formatSigned always shows the sign of a difference; formatFixed keeps its decimals', () => {
    expect(formatSigned(0.0021)).toBe('+0.0021');
    expect(formatSigned(-0.013)).toBe(`${MINUS}0.013`);
    expect(formatSigned(0)).toBe('0');
    expect(formatFixed(-2.5, 1)).toBe(`${MINUS}2.5`);
    expect(formatFixed(-0.004, 1)).toBe('0.0');
    expect(formatFixed(12_345.25, 1)).toBe('12,345.3');
  });

  it('property: what it prints reads back within its significant figures, never with an “e”', () => {
    const hits = reached('formatNumber round trip');
    fc.assert(
      fc.property(fc.double({ min: -1e12, max: 1e12, noNaN: true }), fc.integer({ min: 1, max: 8 }), (v, digits) => {
        const text = formatNumber(v, digits);
        expect(text).not.toMatch(/e/i);
        expect(text).not.toContain('-');
        const back = parseFormatted(text);
        hits.hit();
        if (v === 0) expect(back).toBe(0);
        else expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 0.5 * 10 ** (1 - digits) * 1.000001);
      }),
      { numRuns: 2000 },
    );
    hits.expectAtLeast(2000);
  });
});
