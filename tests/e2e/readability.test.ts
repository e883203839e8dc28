import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';
import type { Page } from 'playwright-core';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE } from '../../server/db/seed.ts';
import { sketches } from '../../server/db/schema.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo } from '../helpers/browser.ts';
import { expectClose } from '../helpers/expectClose.ts';

/**
 * Readability of what a reader sees, measured on the colours Chromium computes: read-only fields
 * (a viewer's condition and loads forms) keep a contrast of at least 4.5:1, and links are in the
 * app's colours (never the browser's default blue or purple) with the same contrast.
 *
 * Contrast is computed here from WCAG 2.x: relative luminance of sRGB (channels linearised with
 * the 0.04045 threshold, weighted 0.2126, 0.7152, 0.0722) and the ratio (L1 + 0.05) / (L2 + 0.05),
 * L1 the lighter (WCAG 2.1, "relative luminance" and "contrast ratio" definitions; 4.5:1 is
 * success criterion 1.4.3 for normal text).
 */

type Rgba = [number, number, number, number];

function parseRgba(css: string): Rgba {
  const m = /^rgba?\(([\d.]+),\s*([\d.]+),\s*([\d.]+)(?:,\s*([\d.]+))?\)$/.exec(css.trim());
  if (!m) throw new Error(`not a computed colour: ${css}`);
  return [Number(m[1]), Number(m[2]), Number(m[3]), m[4] === undefined ? 1 : Number(m[4])];
}

/** `top` composited over the opaque `bottom` (source-over). */
function over(top: Rgba, bottom: Rgba): Rgba {
  const a = top[3];
  return [top[0] * a + bottom[0] * (1 - a), top[1] * a + bottom[1] * (1 - a), top[2] * a + bottom[2] * (1 - a), 1];
}

function luminance([r, g, b]: Rgba): number {
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

function contrast(a: Rgba, b: Rgba): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (hi + 0.05) / (lo + 0.05);
}

/** Text colour and the layers of background under an element (innermost first), as computed. */
async function coloursOf(page: Page, selector: string) {
  return page.locator(selector).evaluateAll((els) =>
    els
      .filter((el) => (el as HTMLElement).offsetParent !== null)
      .map((el) => {
        const layers: string[] = [];
        for (let n: Element | null = el; n; n = n.parentElement) layers.push(getComputedStyle(n).backgroundColor);
        const style = getComputedStyle(el);
        return { text: (el as HTMLInputElement).value || el.textContent?.trim() || '', colour: style.color, fill: style.getPropertyValue('-webkit-text-fill-color'), layers };
      }),
  );
}

/** The ratio for one element: its text colour over its composited background (white page below all). */
function ratioOf(c: { colour: string; fill: string; layers: string[] }): number {
  let bg: Rgba = [255, 255, 255, 1];
  for (const layer of [...c.layers].reverse()) bg = over(parseRgba(layer), bg);
  const textColour = parseRgba(c.fill && c.fill !== c.colour && c.fill !== 'currentcolor' ? c.fill : c.colour);
  return contrast(over(textColour, bg), bg);
}

describe('readable read-only fields and links (WCAG 2.x contrast, computed in the test)', () => {
  let world: BrowserWorld;
  let server: RunningServer;
  let page: Page;
  let sketchId: string;

  beforeAll(async () => {
    world = await startBrowserWorld();
    server = world.server;
    page = firstItem(world.browsers).page;
    const root = await world.database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin root — double wedge, 5% thick, ridge at 40%') });
    sketchId = root!.id;
  });
  afterAll(async () => world?.close());

  it('the formula: 21:1 for black on white, 4.48:1 for #777 on white (WCAG 2.1 examples, from memory)', () => {
    expectClose(contrast([0, 0, 0, 1], [255, 255, 255, 1]), 21, 1e-12);
    expectClose(contrast([119, 119, 119, 1], [255, 255, 255, 1]), 4.48, 0.005);
  });

  it('a viewer\'s read-only condition and loads fields read at 4.5:1 or more', async () => {
    await signInDemo(page, itemAt(DEMO_PEOPLE, 3).email, server.url);
    await page.goto(`${server.url}/sketches/${sketchId}`);
    await page.getByTestId('loads-panel').waitFor();
    await page.locator('.condition__more summary').click();
    const fields = await coloursOf(page, 'input:disabled, .ant-select-disabled .ant-select-selection-item');
    expect(fields.length).toBeGreaterThanOrEqual(5);
    for (const f of fields) expect(ratioOf(f), `read-only field showing “${f.text}”: ${f.colour} on ${f.layers.slice(0, 3).join(' / ')}`).toBeGreaterThanOrEqual(4.5);
    await screenshot(page, 'readability-viewer-fields');
  });

  it('links on the editor and the sketches table are in the app\'s colours, at 4.5:1 or more', async () => {
    for (const [path, ready] of [
      [`/sketches/${sketchId}`, '[data-testid="sketch-canvas"]'],
      ['/', '[data-testid^="sketch-row-"]'],
    ] as const) {
      await page.goto(`${server.url}${path}`);
      // The page's content is there (not only the header), so its links are.
      await page.locator(ready).first().waitFor();
      await expect.poll(async () => (await coloursOf(page, 'a')).length).toBeGreaterThan(2);
      const links = await coloursOf(page, 'a');
      expect(links.length).toBeGreaterThan(2);
      for (const l of links) {
        // Chromium's defaults for unstyled links (blue) and visited ones (purple).
        expect(['rgb(0, 0, 238)', 'rgb(85, 26, 139)'], `link “${l.text}” has the browser's default colour`).not.toContain(l.colour);
        expect(ratioOf(l), `link “${l.text}”: ${l.colour} on ${l.layers.slice(0, 3).join(' / ')}`).toBeGreaterThanOrEqual(4.5);
      }
    }
  });
});
