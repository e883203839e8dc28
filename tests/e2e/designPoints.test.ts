import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE } from '../../server/db/seed.ts';
import { sketches } from '../../server/db/schema.ts';
import { readStoredAnalysis } from '../../shared/flight/storedAnalysis.ts';
import { normalizeDocument, selectedPoint } from '../../shared/model/sketch.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo, textOf } from '../helpers/browser.ts';
import { firstItems, itemAt } from '../../shared/util/invariant.ts';

/**
 * Design points with two people in one sketch: Tomasz (editor) adds, renames, edits, selects
 * and removes points; Ines (owner) sees every change live, and undo brings a removed point back
 * for everyone; Priya (reviewer) picks a point for her own view without changing the sketch.
 */
describe('design points, live between two editors and a reviewer', () => {
  let world: BrowserWorld;
  let database: TestDatabase;
  let server: RunningServer;
  let ines: Page;
  let tomasz: Page;
  let priya: Page;
  let sketchId: string;

  const stored = async () => {
    const row = await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) });
    return { doc: normalizeDocument(row!.document), revision: row!.revision, resultRevision: row!.resultRevision, result: readStoredAnalysis(row!.lastResult) };
  };
  /** The points' names in list order (a name being typed shows its field's value). */
  const pointNames = (page: Page) =>
    page
      .getByTestId('design-points')
      .locator('[data-point-id]')
      .evaluateAll((rows) => rows.map((r) => r.querySelector('[data-testid="design-point-name"]')?.textContent ?? r.querySelector('input')?.value ?? ''));
  const shownName = (page: Page) => textOf(page, 'condition-point');

  beforeAll(async () => {
    world = await startBrowserWorld({ browsers: 3 });
    ({ database, server } = world);
    [ines, tomasz, priya] = firstItems(world.browsers.map((b) => b.page), 3);
    const root = await database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin root — double wedge, 5% thick, ridge at 40%') });
    sketchId = root!.id;
  });
  afterAll(async () => world?.close());

  it('all three open the fin root live and see its three design points', async () => {
    await signInDemo(ines, DEMO_PEOPLE[0].email, server.url);
    await signInDemo(tomasz, itemAt(DEMO_PEOPLE, 1).email, server.url);
    await signInDemo(priya, itemAt(DEMO_PEOPLE, 2).email, server.url);
    for (const page of [ines, tomasz, priya]) {
      await page.goto(`${server.url}/sketches/${sketchId}`);
      await page.getByTestId('design-points').waitFor();
      await expect.poll(() => textOf(page, 'connection-state'), { timeout: 30_000 }).toContain('Live');
      expect(await pointNames(page)).toEqual(['Burnout', 'Max q', 'Pull-up']);
    }
    // The side-by-side table has a column per point, each solved.
    await expect.poll(() => textOf(ines, 'dp-status-2'), { timeout: 30_000 }).toBe('ok');
    expect(await ines.getByTestId('design-points-table').locator('thead th').allTextContents()).toEqual(['', 'Burnout', 'Max q', 'Pull-up']);
  });

  it('Tomasz adds a point and names it; Ines sees it appear, selected, with its results', async () => {
    await tomasz.getByTestId('design-point-add').click();
    const name = tomasz.getByTestId('design-point-name-input');
    await name.fill('Dash');
    await name.press('Enter');
    await expect.poll(() => pointNames(ines), { timeout: 20_000 }).toEqual(['Burnout', 'Dash', 'Max q', 'Pull-up']);
    await expect.poll(() => shownName(ines), { timeout: 20_000 }).toBe('Dash');
    // He changes its Mach; Ines's condition panel and table follow.
    await tomasz.locator('input#condition-mach').fill('3.4');
    await tomasz.locator('input#condition-mach').press('Enter');
    await expect.poll(() => ines.locator('input#condition-mach').inputValue(), { timeout: 20_000 }).toBe('3.4');
    await expect.poll(() => textOf(ines, 'dp-mach-1'), { timeout: 20_000 }).toBe('3.4');
    await screenshot(ines, 'design-points-added-by-colleague');
    // Stored: the document and the server's own solve of every point.
    await expect.poll(async () => (await stored()).doc.designPoints.map((p) => p.name), { timeout: 20_000 }).toEqual(['Burnout', 'Dash', 'Max q', 'Pull-up']);
    await expect.poll(async () => selectedPoint((await stored()).doc).condition.mach, { timeout: 20_000 }).toBe(3.4);
    // The server solves after the edit is committed and stores the result tagged with the
    // revision it belongs to [E1]: wait for the result to catch up with the document.
    await expect.poll(async () => { const s = await stored(); return s.resultRevision === s.revision; }, { timeout: 30_000 }).toBe(true);
    const { doc, result } = await stored();
    expect(result?.points.map((p) => p.name)).toEqual(['Burnout', 'Dash', 'Max q', 'Pull-up']);
    expect(result?.selectedPointId).toBe(doc.selectedPointId);
  });

  it('Priya (reviewer) picks Max q for her own view; the sketch and the others stay on Dash', async () => {
    await expect.poll(() => pointNames(priya), { timeout: 20_000 }).toEqual(['Burnout', 'Dash', 'Max q', 'Pull-up']);
    const before = (await stored()).revision;
    await priya.getByTestId('design-point-2').click();
    await expect.poll(() => shownName(priya)).toBe('Max q');
    expect(await priya.getByTestId('design-point-add').count()).toBe(0);
    await screenshot(priya, 'design-points-reviewer-own-view');
    expect(await shownName(ines)).toBe('Dash');
    expect((await stored()).revision).toBe(before);
  });

  it('Ines selects Pull-up for everyone; Tomasz removes it, then undoes that: it is back for all, selected again', async () => {
    await ines.getByTestId('design-point-3').click();
    await expect.poll(() => shownName(tomasz), { timeout: 20_000 }).toBe('Pull-up');
    await tomasz.getByTestId('design-point-remove').click();
    await tomasz.locator('.ant-popconfirm').getByRole('button', { name: 'Remove' }).click();
    await expect.poll(() => pointNames(ines), { timeout: 20_000 }).toEqual(['Burnout', 'Dash', 'Max q']);
    // The selection moved to the point before the removed one (it was last).
    await expect.poll(() => shownName(ines), { timeout: 20_000 }).toBe('Max q');
    await tomasz.keyboard.press('Control+z');
    await expect.poll(() => pointNames(ines), { timeout: 20_000 }).toEqual(['Burnout', 'Dash', 'Max q', 'Pull-up']);
    await expect.poll(() => shownName(ines), { timeout: 20_000 }).toBe('Pull-up');
    const { doc } = await stored();
    expect(doc.designPoints.find((p) => p.name === 'Pull-up')?.condition).toEqual({ mach: 2.4, alphaDeg: 9, gamma: 1.4, altitudeM: 10_000 });
  });

  it('a study started from a design point takes its altitude', async () => {
    await ines.getByTestId('design-point-study').first().click();
    await ines.getByTestId('study-form').waitFor();
    expect(await ines.getByTestId('study-design-point').textContent()).toContain('Pull-up');
    const altitude = await ines.getByTestId('study-altitude').evaluate((el) => (el instanceof HTMLInputElement ? el : el.querySelector('input'))!.value);
    expect(altitude).toBe('10000');
  });
});
