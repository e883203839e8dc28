/**
 * The canvas colour scale's contrast, computed here from the WCAG 2.1 definitions (relative
 * luminance of sRGB, contrast ratio), independently of src/canvas/colors.ts's own helper.
 */
import { describe, expect, it } from 'vitest';
import { CANVAS_BACKGROUND, contrastRatio, pressureColourAt } from '@/canvas/colors';
import { expectClose } from '../../helpers/expectClose';
import { firstItems } from '@shared/util/invariant';

/** WCAG 2.1 "relative luminance": sRGB channels linearised, weighted 0.2126, 0.7152, 0.0722. */
function luminance(hex: string): number {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex) ?? /^rgb\((\d+),\s*(\d+),\s*(\d+)\)$/.exec(hex);
  if (!m) throw new Error(`not a colour: ${hex}`);
  const [, c1, c2, c3] = firstItems(m, 4);
  const channels = hex.startsWith('#') ? [c1, c2, c3].map((h) => parseInt(h, 16)) : [c1, c2, c3].map(Number);
  const linear = channels.map((c) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  });
  const [r, g, b] = firstItems(linear, 3);
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** WCAG 2.1 "contrast ratio": (L1 + 0.05) / (L2 + 0.05), L1 the lighter. */
function ratio(a: string, b: string): number {
  const [hi, lo] = firstItems([luminance(a), luminance(b)].sort((x, y) => y - x), 2);
  return (hi + 0.05) / (lo + 0.05);
}

describe('pressure colour scale contrast (WCAG 2.1 formula, computed in the test)', () => {
  it('the formula gives 21:1 for white on black (WCAG 2.1, the maximum)', () => {
    expectClose(ratio('#ffffff', '#000000'), 21, 1e-12);
  });

  it('[C1] every colour of the scale keeps at least 3:1 against the canvas background, and the app\'s helper agrees', () => {
    let checked = 0;
    for (let i = 0; i <= 200; i++) {
      const colour = pressureColourAt(i / 200);
      const r = ratio(colour, CANVAS_BACKGROUND);
      expect(r).toBeGreaterThanOrEqual(3);
      // The app's helper uses the older 0.03928 threshold: identical for 8-bit channels.
      expectClose(contrastRatio(colour, CANVAS_BACKGROUND), r, 1e-9);
      checked++;
    }
    expect(checked).toBe(201);
  });
});
