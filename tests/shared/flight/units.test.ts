import { reached } from '../../helpers/reached.ts';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatQuantity, fromDisplay, QUANTITIES, toDisplay, unitLabel, type Quantity } from '../../../shared/flight/units.ts';
import { expectCloseRel } from '../../helpers/expectClose.ts';

describe('units', () => {
  it('round-trips every quantity between SI and US customary', () => {
    const checked = reached('unit round trips');
    fc.assert(
      fc.property(fc.constantFrom(...(Object.keys(QUANTITIES) as Quantity[])), fc.double({ min: -1e9, max: 1e9, noNaN: true }), (q, v) => {
        const back = fromDisplay(toDisplay(v, q, 'us'), q, 'us');
        checked.hit();
        expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 1e-12 + 1e-300);
      }),
      { numRuns: 300 },
    );
    checked.expectAtLeast(300);
  });

  it.each([
    ['length', 1, 3.280839895, 'ft'],
    ['pressure', 101_325, 2116.2166, 'lbf/ft²'],
    ['density', 1.225, 0.0023769, 'slug/ft³'],
    ['force', 4.4482216152605, 1, 'lbf'],
    ['temperature', 288.15, 518.67, '°R'],
  ] as const)('%s: %f SI is %f %s (NIST SP 811 factors; sea-level values from the 1976 standard, from memory)', (q, si, us, label) => {
    expectCloseRel(toDisplay(si, q, 'us'), us, 2e-5);
    expect(unitLabel(q, 'us')).toBe(label);
  });

  it('formats with the unit label', () => {
    expect(formatQuantity(12_345.6, 'forcePerSpan', 'si')).toBe('12,350 N/m');
    expect(formatQuantity(0.3048, 'length', 'us', 3)).toBe('1 ft');
  });
});
