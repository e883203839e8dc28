import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE } from '../../server/db/seed.ts';
import { sketches, snapshots } from '../../server/db/schema.ts';
import { normalizeDocument, type SketchDocument } from '../../shared/model/sketch.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo, textOf } from '../helpers/browser.ts';
import { firstItems, itemAt } from '../../shared/util/invariant.ts';

const FIXTURES = path.resolve(import.meta.dirname, '../fixtures/coordinates');

/**
 * Importing a real coordinates file with two people in the sketch: Tomasz (editor) picks a
 * binary file (refused), then a two-block file in millimetres; he sees the outline, chord, t/c
 * and point count before anything changes, keeps the physical chord and confirms. Ines (owner)
 * sees the new section live; Tomasz's one undo puts the old section and loads chord back for
 * both, and the automatic snapshot holds the sketch as it was.
 */
describe('coordinates import: file → preview → confirm → undo', () => {
  let world: BrowserWorld;
  let database: TestDatabase;
  let server: RunningServer;
  let ines: Page;
  let tomasz: Page;
  let sketchId: string;
  let original: SketchDocument;

  const stored = async () => {
    const row = await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) });
    return { doc: normalizeDocument(row!.document), revision: row!.revision };
  };
  const rows = (page: Page) => page.locator('[data-testid^="vertex-row-"]').count();

  beforeAll(async () => {
    world = await startBrowserWorld({ browsers: 2 });
    ({ database, server } = world);
    [ines, tomasz] = firstItems(world.browsers.map((b) => b.page), 2);
    const tip = await database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin tip — hexagonal, 4% thick') });
    sketchId = tip!.id;
    original = normalizeDocument(tip!.document);
  });
  afterAll(async () => world?.close());

  it('both open the fin tip live', async () => {
    await signInDemo(ines, DEMO_PEOPLE[0].email, server.url);
    await signInDemo(tomasz, itemAt(DEMO_PEOPLE, 1).email, server.url);
    for (const page of [ines, tomasz]) {
      await page.goto(`${server.url}/sketches/${sketchId}`);
      await page.getByTestId('sketch-canvas').waitFor();
      await expect.poll(() => textOf(page, 'connection-state'), { timeout: 30_000 }).toContain('Live');
      expect(await rows(page)).toBe(original.section.points.length);
    }
  });

  it('a binary file is refused as "not a text file" with its line, and nothing changes', async () => {
    const before = await stored();
    await tomasz.getByTestId('open-import').click();
    await tomasz.getByTestId('import-file').setInputFiles({
      name: 'tern-fin-root.xlsx',
      mimeType: 'application/octet-stream',
      buffer: Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00, 0x08, 0x00, 0x00, 0x00, 0x21, 0x00, 0x9a, 0xff, 0x0a, 0x00]),
    });
    await tomasz.getByTestId('import-issues').waitFor();
    expect(await textOf(tomasz, 'import-issues')).toContain('Line 1: not a text file (it holds NUL bytes).');
    expect(await tomasz.getByTestId('import-confirm').isDisabled()).toBe(true);
    expect(await stored()).toEqual(before);
  });

  it('a two-block file in mm: the preview shows outline, chord, t/c and count, and nothing changes before confirming', async () => {
    const before = await stored();
    await tomasz.getByTestId('import-file').setInputFiles(path.join(FIXTURES, 'tern-fin-root-two-blocks-mm.dat'));
    await tomasz.getByTestId('import-preview').waitFor();
    expect(await textOf(tomasz, 'import-count')).toBe('16');
    expect(await textOf(tomasz, 'import-chord')).toBe('320 mm = 0.32 m');
    expect(await textOf(tomasz, 'import-tc')).toBe('5 %');
    expect(await textOf(tomasz, 'import-layout')).toBe('two blocks: 9 upper and 9 lower points');
    expect(await textOf(tomasz, 'import-unit-why')).toBe('First choice: the title says millimetres.');
    // Keep the physical size: the outline in metres, 0.32 m into the loads.
    await tomasz.getByTestId('import-scale-keep').click();
    await expect.poll(() => textOf(tomasz, 'import-changes')).toContain('the loads chord becomes 0.32 m (now');
    expect(await tomasz.getByTestId('import-preview').locator('circle').count()).toBe(16);
    await screenshot(tomasz, 'import-preview-two-blocks-mm');
    // Nothing has changed yet, for anyone.
    expect(await stored()).toEqual(before);
    expect(await rows(ines)).toBe(original.section.points.length);
  });

  it('confirming replaces the section and sets the loads chord in one edit that Ines sees live, after an automatic snapshot', async () => {
    const before = await stored();
    await tomasz.getByTestId('import-confirm').click();
    await expect.poll(() => rows(tomasz), { timeout: 30_000 }).toBe(16);
    await expect.poll(() => rows(ines), { timeout: 30_000 }).toBe(16);
    expect(await ines.getByTestId('vertex-x-8').inputValue()).toBe('0.32');
    // Tomasz's view fits the new section (0.32 m long, drawn in metres) on the canvas.
    const box = (await tomasz.getByTestId('sketch-canvas').boundingBox())!;
    const viewScale = async () => Number((await tomasz.getByTestId('sketch-canvas').getAttribute('data-view'))!.split(' ')[0]);
    // Wait for the fit itself: before it, the old view (unit chord) also holds 0.32 m within the
    // width, at less than a third of it.
    await expect
      .poll(async () => {
        const width = 0.32 * (await viewScale());
        return width <= box.width && width > box.width / 3;
      })
      .toBe(true);
    const after = await stored();
    expect(after.revision).toBe(before.revision + 1);
    expect(after.doc.loads.chordM).toBe(0.32);
    expect(after.doc.designPoints).toEqual(before.doc.designPoints);
    const snaps = await database.db.query.snapshots.findMany({ where: eq(snapshots.sketchId, sketchId) });
    expect(snaps.map((s) => [s.name, s.kind, s.revision])).toEqual([['Before importing tern-fin-root-two-blocks-mm.dat', 'before_import', before.revision]]);
    await expect.poll(() => tomasz.getByTestId('undo').isDisabled()).toBe(false);
    await screenshot(tomasz, 'import-confirmed');
  });

  it('one undo puts the previous section and loads chord back for everyone', async () => {
    await tomasz.getByTestId('undo').click();
    await expect.poll(() => rows(ines), { timeout: 30_000 }).toBe(original.section.points.length);
    await expect.poll(() => rows(tomasz)).toBe(original.section.points.length);
    await expect.poll(async () => (await stored()).doc.section.points, { timeout: 30_000 }).toEqual(original.section.points);
    expect((await stored()).doc.loads).toEqual(original.loads);
    expect((await stored()).doc.designPoints).toEqual(original.designPoints);
    await screenshot(ines, 'import-undone-seen-by-colleague');
    // Redo brings the import back.
    await tomasz.getByTestId('redo').click();
    await expect.poll(async () => (await stored()).doc.section.points.length, { timeout: 30_000 }).toBe(16);
    expect((await stored()).doc.loads.chordM).toBe(0.32);
  });
});
