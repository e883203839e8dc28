import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE } from '../../server/db/seed.ts';
import { sketches } from '../../server/db/schema.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo, textOf, vertexOnScreen, type BrowserSession } from '../helpers/browser.ts';
import { firstItems, itemAt } from '../../shared/util/invariant.ts';



const text = textOf;

describe('live collaboration in two browsers', () => {
  let database: TestDatabase;
  let server: RunningServer;
  let ines: BrowserSession;
  let tomasz: BrowserSession;
  let sketchId: string;

  let world: BrowserWorld;

  beforeAll(async () => {
    world = await startBrowserWorld({ browsers: 2 });
    ({ database, server } = world);
    [ines, tomasz] = firstItems(world.browsers, 2);
    const fin = await database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin root — double wedge, 5% thick, ridge at 40%') });
    sketchId = fin!.id;
  });
  afterAll(async () => world?.close());

  it('both open the same sketch and see each other present', async () => {
    await signInDemo(ines.page, DEMO_PEOPLE[0].email, server.url);
    await signInDemo(tomasz.page, itemAt(DEMO_PEOPLE, 1).email, server.url);
    for (const { page } of [ines, tomasz]) {
      await page.goto(`${server.url}/sketches/${sketchId}`);
      await page.getByTestId('sketch-canvas').waitFor();
    }
    for (const { page } of [ines, tomasz]) {
      await expect.poll(() => text(page, 'connection-state')).toContain('Live');
      await page.getByTestId('person-Ines Marlow').waitFor();
      await page.getByTestId('person-Tomasz Reyes').waitFor();
    }
  });

  it('one drags a vertex; the other sees the cursor and the new section and wave map', async () => {
    const a = ines.page;
    const b = tomasz.page;
    const clBefore = await text(b, 'coef-exact-cl');
    const wavesBefore = await b.getByTestId('sketch-canvas').getAttribute('data-wave-count');
    const yBefore = await b.getByTestId('vertex-y-1').inputValue();

    const from = await vertexOnScreen(a, 1);
    await a.mouse.move(from.x, from.y);
    await a.mouse.down();
    for (let k = 1; k <= 10; k++) await a.mouse.move(from.x, from.y - 4 * k);
    // While Ines drags, Tomasz sees her cursor (the presence layer draws it; the page exposes
    // the count of remote cursors for tests).
    await expect.poll(() => b.getByTestId('sketch-canvas').getAttribute('data-remote-cursors')).toBe('1');
    await a.mouse.up();

    await expect.poll(() => b.getByTestId('vertex-y-1').inputValue(), { timeout: 10_000 }).not.toBe(yBefore);
    await expect.poll(() => text(b, 'coef-exact-cl'), { timeout: 10_000 }).not.toBe(clBefore);
    expect(await b.getByTestId('vertex-y-1').inputValue()).toBe(await a.getByTestId('vertex-y-1').inputValue());
    expect(Number(await b.getByTestId('sketch-canvas').getAttribute('data-wave-count'))).toBeGreaterThan(0);
    expect(wavesBefore).not.toBeNull();
    await expect.poll(() => text(a, 'save-state')).toContain('Saved');
    await screenshot(a, 'collab-lead-after-drag');
    await screenshot(b, 'collab-other-sees-drag');
    // The server stored it: the revision moved on.
    const row = await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) });
    expect(row!.revision).toBeGreaterThan(0);
  });

  it('a walkthrough: Ines leads, Tomasz’s view follows hers; he can step out and back in', async () => {
    const a = ines.page;
    const b = tomasz.page;
    await a.getByTestId('walkthrough-start').click();
    await expect.poll(() => text(a, 'walkthrough-state')).toContain('You are leading');
    await expect.poll(() => text(b, 'walkthrough-state')).toContain('Ines Marlow leads a walkthrough');
    // Ines zooms in twice; Tomasz's canvas takes the same scale.
    await a.getByTestId('sketch-canvas').hover();
    await a.keyboard.press('+');
    await a.keyboard.press('+');
    const scaleOf = async (p: Page) => Number((await p.getByTestId('sketch-canvas').getAttribute('data-view'))!.split(' ')[0]);
    await expect.poll(async () => Math.abs((await scaleOf(b)) - (await scaleOf(a))) / (await scaleOf(a)), { timeout: 10_000 }).toBeLessThan(1e-6);
    await screenshot(b, 'collab-follower');
    await b.getByTestId('walkthrough-step-out').click();
    await b.getByTestId('walkthrough-rejoin').waitFor();
    const leadZoom = () => b.getByTestId('walkthrough-state').getAttribute('data-lead-zoom');
    const zoomBefore = await leadZoom();
    await a.keyboard.press('-');
    await expect.poll(leadZoom).not.toBe(zoomBefore); // Tomasz has received Ines's new view…
    expect(await scaleOf(b)).not.toBeCloseTo(await scaleOf(a), 6); // …and kept his own
    await b.getByTestId('walkthrough-rejoin').click();
    await expect.poll(async () => Math.abs((await scaleOf(b)) - (await scaleOf(a))) / (await scaleOf(a)), { timeout: 10_000 }).toBeLessThan(1e-6);
    // Ines hands the lead to Tomasz (the select loads on its own once there is someone to hand
    // over to); he leads, she follows, and he ends it.
    await a.getByTestId('walkthrough-hand-over').click();
    await a.locator('.ant-select-item-option[title="Tomasz Reyes"]').click();
    await expect.poll(() => text(b, 'walkthrough-state')).toContain('You are leading');
    await expect.poll(() => text(a, 'walkthrough-state')).toContain('Tomasz Reyes leads a walkthrough');
    await b.getByTestId('walkthrough-stop').click();
    await expect.poll(() => a.getByTestId('walkthrough-state').count()).toBe(0);
    await expect.poll(() => b.getByTestId('walkthrough-state').count()).toBe(0);
  });

  it('a pin placed by one person appears in the other’s open pin list without a reload (server notice)', async () => {
    const b = tomasz.page;
    await b.getByTestId('toggle-review').click();
    await b.getByTestId('review-pins').waitFor();
    const before = await b.locator('[data-testid^="pin-item-"]').count();
    // Ines pins through the API from her own signed-in page.
    const status = await ines.page.evaluate(async (id) => {
      const res = await fetch(`/api/sketches/${id}/pins`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-shockwright-request': '1' },
        body: JSON.stringify({ target: { kind: 'facet', facet: 0, at: [0.2, 0.02] }, body: 'Leading-edge facet: check the shock margin at Mach 1.6.' }),
      });
      return res.status;
    }, sketchId);
    expect(status).toBe(201);
    await expect.poll(() => b.locator('[data-testid^="pin-item-"]').count(), { timeout: 10_000 }).toBe(before + 1);
    expect(await b.getByTestId('pin-list').textContent()).toContain('check the shock margin');
    await screenshot(b, 'collab-live-pin');
    expect(ines.foreignRequests).toEqual([]);
    expect(tomasz.foreignRequests).toEqual([]);
  });
});
