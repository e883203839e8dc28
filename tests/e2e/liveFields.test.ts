import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { and, eq, isNotNull } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE } from '../../server/db/seed.ts';
import { sketchEdits, sketches } from '../../server/db/schema.ts';
import { selectedPoint, type SketchDocument } from '../../shared/model/sketch.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo, textOf, type BrowserSession } from '../helpers/browser.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';

/**
 * Two people typing in the same form fields at once (useFieldEdits [F1]–[F5]): nobody's typing
 * is thrown away and nobody silently overwrites a colleague's value with a stale copy.
 * Ines and Tomasz are two browser profiles (two sessions) on one server.
 */
describe('form fields while a colleague edits (two browsers)', () => {
  let world: BrowserWorld;
  let database: TestDatabase;
  let server: RunningServer;
  let ines: Page;
  let tomasz: Page;
  let inesSession: BrowserSession;
  let sketchId: string;

  const stored = async () => {
    const row = await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) });
    return { doc: row!.document as SketchDocument, revision: row!.revision };
  };
  const value = (page: Page, id: string) => page.getByTestId(id).inputValue();
  const saved = (page: Page) => expect.poll(() => textOf(page, 'save-state'), { timeout: 20_000 }).toContain('Saved');
  /** Clicks a neutral spot (the vertices heading): the focused field loses focus. */
  const clickAway = (page: Page) => page.locator('.editor__heading').click();

  beforeAll(async () => {
    world = await startBrowserWorld({ browsers: 2 });
    ({ database, server } = world);
    inesSession = firstItem(world.browsers);
    ines = itemAt(world.browsers, 0).page;
    tomasz = itemAt(world.browsers, 1).page;
    const tip = await database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin tip — hexagonal, 4% thick') });
    sketchId = tip!.id;
  });
  afterAll(async () => world?.close());

  it('both open the same sketch, live, and see each other', async () => {
    await signInDemo(ines, DEMO_PEOPLE[0].email, server.url);
    await signInDemo(tomasz, itemAt(DEMO_PEOPLE, 1).email, server.url);
    for (const page of [ines, tomasz]) {
      await page.goto(`${server.url}/sketches/${sketchId}`);
      await page.getByTestId('sketch-canvas').waitFor();
      await expect.poll(() => textOf(page, 'connection-state'), { timeout: 20_000 }).toContain('Live');
    }
    // Names in conflicts come from the people list.
    await ines.getByTestId('person-Tomasz Reyes').waitFor();
    await tomasz.getByTestId('person-Ines Marlow').waitFor();
  });

  it('[F1][F2] a vertex cell reached with Enter and left untouched sends nothing: the colleague’s value stands everywhere', async () => {
    // Ines sets vertex 1's y and presses Enter: the focus moves down to vertex 2's y (0.02).
    await ines.getByTestId('vertex-y-1').fill('0.021');
    await ines.getByTestId('vertex-y-1').press('Enter');
    await expect.poll(() => ines.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('vertex-y-2');
    expect(await value(ines, 'vertex-y-2')).toBe('0.02');
    // Tomasz sets vertex 2's y meanwhile.
    await tomasz.getByTestId('vertex-y-2').fill('0.023');
    await tomasz.getByTestId('vertex-y-2').press('Enter');
    // Ines's open cell follows and says who changed it.
    await expect.poll(() => value(ines, 'vertex-y-2'), { timeout: 10_000 }).toBe('0.023');
    await expect.poll(async () => (await ines.getByTestId('field-changed-note').textContent())?.trim()).toBe('Tomasz Reyes changed vertex 2 y to 0.023 just now.');
    await screenshot(ines, 'fields-cell-follows-colleague');
    // Ines clicks elsewhere: nothing goes out, Tomasz's value stays everywhere.
    await clickAway(ines);
    await saved(ines);
    await saved(tomasz);
    const { doc } = await stored();
    expect(doc.section.points[1]).toEqual([0.25, 0.021]);
    expect(doc.section.points[2]).toEqual([0.75, 0.023]);
    expect(await value(tomasz, 'vertex-y-2')).toBe('0.023');
    expect(await value(ines, 'vertex-y-2')).toBe('0.023');
    // The log holds the two changes people made, one coordinate each [O5]; nothing from the untouched cell.
    const applied = await database.db.select({ op: sketchEdits.op }).from(sketchEdits).where(and(eq(sketchEdits.sketchId, sketchId), isNotNull(sketchEdits.revision)));
    expect(applied.map((e) => e.op)).toEqual([
      expect.objectContaining({ type: 'setVertexCoordinate', index: 1, axis: 'y', value: 0.021 }),
      expect.objectContaining({ type: 'setVertexCoordinate', index: 2, axis: 'y', value: 0.023 }),
    ]);
  });

  it('[F3] a colleague’s change under the typing keeps it, names them, sends nothing on blur, and Keep mine sends it', async () => {
    const cell = ines.getByTestId('vertex-y-4');
    await cell.fill('-0.024');
    await tomasz.getByTestId('vertex-y-4').fill('-0.022');
    await tomasz.getByTestId('vertex-y-4').press('Enter');
    await saved(tomasz);
    await ines.getByTestId('field-conflict').waitFor({ timeout: 10_000 });
    expect(await ines.getByTestId('field-conflict').textContent()).toContain('Tomasz Reyes changed vertex 4 y to -0.022 while you were typing -0.024');
    expect(await cell.inputValue()).toBe('-0.024');
    await screenshot(ines, 'fields-vertex-conflict');
    // Enter and leaving the cell do not decide.
    await cell.press('Enter');
    await clickAway(ines);
    await saved(ines);
    expect((await stored()).doc.section.points[4]).toEqual([0.75, -0.022]);
    expect(await cell.inputValue()).toBe('-0.024');
    // Ines keeps hers: it goes out, and Tomasz sees it.
    await ines.getByTestId('conflict-keep-mine').click();
    await expect.poll(async () => (await stored()).doc.section.points[4], { timeout: 10_000 }).toEqual([0.75, -0.024]);
    await expect.poll(() => value(tomasz, 'vertex-y-4'), { timeout: 10_000 }).toBe('-0.024');
    expect(await ines.getByTestId('field-conflict').count()).toBe(0);
  });

  it('[F3] Mach typed without Enter survives a colleague moving a vertex, then commits exactly Mach', async () => {
    const mach = tomasz.locator('input#condition-mach');
    await mach.fill('3.4');
    // Ines moves vertex 5 through the table meanwhile.
    await ines.getByTestId('vertex-y-5').fill('-0.021');
    await ines.getByTestId('vertex-y-5').press('Enter');
    await clickAway(ines);
    await expect.poll(() => value(tomasz, 'vertex-y-5'), { timeout: 10_000 }).toBe('-0.021');
    expect(await mach.inputValue()).toBe('3.4');
    await screenshot(tomasz, 'fields-mach-kept-while-colleague-edits');
    await mach.press('Enter');
    await expect.poll(async () => selectedPoint((await stored()).doc).condition.mach, { timeout: 10_000 }).toBe(3.4);
    await expect.poll(() => ines.locator('input#condition-mach').inputValue(), { timeout: 10_000 }).toBe('3.4');
    expect((await stored()).doc.section.points[5]).toEqual([0.25, -0.021]);
  });

  it('[F3] the same condition field changed by both: a conflict that Use theirs settles without sending anything', async () => {
    const alphaT = tomasz.locator('input#condition-alphaDeg');
    await alphaT.fill('5');
    await ines.locator('input#condition-alphaDeg').fill('3');
    await ines.locator('input#condition-alphaDeg').press('Enter');
    await tomasz.getByTestId('field-conflict').waitFor({ timeout: 10_000 });
    expect(await tomasz.getByTestId('field-conflict').textContent()).toContain('Ines Marlow changed Incidence α to 3 while you were typing 5');
    await screenshot(tomasz, 'fields-condition-conflict');
    const before = (await stored()).revision;
    await tomasz.getByTestId('conflict-take-theirs').click();
    await expect.poll(() => alphaT.inputValue()).toBe('3');
    await clickAway(tomasz);
    await saved(tomasz);
    const after = await stored();
    expect(selectedPoint(after.doc).condition.alphaDeg).toBe(3);
    expect(after.revision).toBe(before);
    expect(inesSession.foreignRequests).toEqual([]);
  });
});
