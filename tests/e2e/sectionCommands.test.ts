import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';
import type { Page } from 'playwright-core';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE } from '../../server/db/seed.ts';
import { sketches } from '../../server/db/schema.ts';
import { normalizeDocument } from '../../shared/model/sketch.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo, textOf } from '../helpers/browser.ts';

/**
 * Section commands in the editor: Tomasz thins the Tern fin root from 5 % to 4 % by number, moves
 * its ridge, sees a refusal by name, and one Undo each takes the commands back — saved for everyone.
 */
describe('section commands in the editor', () => {
  let world: BrowserWorld;
  let database: TestDatabase;
  let server: RunningServer;
  let page: Page;
  let sketchId: string;

  const stored = async () => {
    const row = await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) });
    return normalizeDocument(row!.document).section.points;
  };

  beforeAll(async () => {
    world = await startBrowserWorld();
    ({ database, server } = world);
    page = firstItem(world.browsers).page;
    const root = await database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin root — double wedge, 5% thick, ridge at 40%') });
    sketchId = root!.id;
  });
  afterAll(async () => world?.close());

  it('sets t/c to 4 % and moves the ridge to 50 %, each one saved edit; a bad value is refused by name', async () => {
    await signInDemo(page, itemAt(DEMO_PEOPLE, 1).email, server.url);
    await page.goto(`${server.url}/sketches/${sketchId}`);
    await page.getByTestId('sketch-canvas').waitFor();
    await expect.poll(() => textOf(page, 'connection-state'), { timeout: 30_000 }).toContain('Live');
    expect((await textOf(page, 'section-shape'))?.trim()).toBe('t/c 5 % · ridge 40 % · camber 0 %');
    await page.locator('[data-testid="section-commands"] summary').click();

    await page.getByTestId('cmd-tc-input').fill('4');
    await page.getByTestId('cmd-tc-apply').click();
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).toBe('0.02');
    await expect.poll(stored, { timeout: 30_000 }).toEqual([[0, 0], [0.4, 0.02], [1, 0], [0.4, -0.02]]);

    await page.getByTestId('cmd-ridge-input').fill('50');
    await page.getByTestId('cmd-ridge-apply').click();
    await expect.poll(() => page.getByTestId('vertex-x-1').inputValue()).toBe('0.5');
    expect((await textOf(page, 'section-shape'))?.trim()).toBe('t/c 4 % · ridge 50 % · camber 0 %');

    await page.getByTestId('cmd-factor-input').fill('−2');
    await page.getByTestId('cmd-factor-apply').click();
    expect(await textOf(page, 'cmd-message-factor')).toBe('The thickness factor must be a positive number.');
    await screenshot(page, 'section-commands');
  });

  it('Undo takes each command back, one step each, saved for everyone', async () => {
    await page.getByTestId('undo').click();
    await expect.poll(stored, { timeout: 30_000 }).toEqual([[0, 0], [0.4, 0.02], [1, 0], [0.4, -0.02]]);
    await page.getByTestId('undo').click();
    await expect.poll(stored, { timeout: 30_000 }).toEqual([[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]]);
    expect((await textOf(page, 'section-shape'))?.trim()).toBe('t/c 5 % · ridge 40 % · camber 0 %');
  });
});
