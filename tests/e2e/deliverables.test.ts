import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { sketches } from '../../server/db/schema.ts';
import { DEMO_PEOPLE } from '../../server/db/seed.ts';
import { loadsCsvHeader } from '../../shared/flight/loadsExport.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { ARTIFACTS_DIR, screenshot, signInDemo, textOf } from '../helpers/browser.ts';

/**
 * What people take away from a sketch: loads per facet as CSV (this design point or all), the
 * canvas picture with its caption, and the study table's loads in N and N·m.
 */
describe('deliverables: loads CSV, the captioned picture, study loads', () => {
  let world: BrowserWorld;
  let database: TestDatabase;
  let server: RunningServer;
  let sketchId: string;

  beforeAll(async () => {
    world = await startBrowserWorld();
    ({ database, server } = world);
    const root = await database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin root — double wedge, 5% thick, ridge at 40%') });
    sketchId = root!.id;
  });
  afterAll(async () => world?.close());

  const download = async (testId: string, name: string) => {
    const { page } = world.browsers[0];
    await page.getByTestId('open-export').click();
    const [file] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
    const target = path.join(ARTIFACTS_DIR, name);
    await file.saveAs(target);
    return { fileName: file.suggestedFilename(), body: readFileSync(target) };
  };

  it('exports loads per facet for the shown design point and for all three, with units in the headers', async () => {
    const { page } = world.browsers[0];
    await signInDemo(page, DEMO_PEOPLE[0].email, server.url);
    await page.goto(`${server.url}/sketches/${sketchId}`);
    await page.getByTestId('design-points').waitFor();
    await expect.poll(() => textOf(page, 'dp-status-2'), { timeout: 30_000 }).toBe('ok');

    const one = await download('export-loadsCsv', 'loads-burnout.csv');
    expect(one.fileName).toBe('Tern-fin-root-double-wedge-5-thick-ridge-at-40-Burnout-loads-si.csv');
    const text = one.body.toString('utf8');
    const lines = text.trim().split('\n');
    expect(lines.find((l) => l.startsWith('design_point,'))!.split(',')).toEqual(loadsCsvHeader('si'));
    // The fin root is a double wedge: four facets and the total.
    expect(lines.filter((l) => l.startsWith('"Burnout",'))).toHaveLength(5);
    expect(text).toMatch(/# Design point "Burnout": M 2\.6, alpha 4 deg, gamma 1\.4, altitude 12000 m; status ok; p_inf 19\d{3}\.\d+ Pa/);
    expect(text).toContain('Inviscid preliminary estimate');

    const all = await download('export-loadsCsvAll', 'loads-all.csv');
    const allText = all.body.toString('utf8');
    for (const name of ['Burnout', 'Max q', 'Pull-up']) expect(allText.split('\n').filter((l) => l.startsWith(`"${name}",`))).toHaveLength(5);
  });

  it('the canvas picture has a caption band with the title, condition, theory and caution', async () => {
    const { page } = world.browsers[0];
    const canvasBox = (await page.getByTestId('sketch-canvas').boundingBox())!;
    const png = await download('export-png', 'picture-with-caption.png');
    expect(png.fileName).toMatch(/-wave-map\.png$/);
    // PNG header: width and height at bytes 16–23; the band adds four 18 px lines and padding (×2).
    const width = png.body.readUInt32BE(16);
    const height = png.body.readUInt32BE(20);
    expect(width).toBe(Math.round(canvasBox.width) * 2);
    expect(height - Math.round(canvasBox.height) * 2).toBe(2 * (16 + 18 * 4));
  });

  it('a study at the design point\'s altitude shows lift, drag and moments in N/m and N, and in lbf/ft after the switch to US units', async () => {
    const { page } = world.browsers[0];
    await page.goto(`${server.url}/sketches/${sketchId}/studies`);
    await page.getByTestId('study-form').waitFor();
    await page.getByTestId('study-mach-start').fill('2');
    await page.getByTestId('study-mach-end').fill('3');
    await page.getByTestId('study-mach-step').fill('0.5');
    await page.getByTestId('study-name').click();
    await page.getByTestId('study-run').click();
    const table = page.getByTestId('study-table');
    await table.waitFor({ timeout: 30_000 });
    await expect.poll(() => textOf(page, 'study-loads-caption')).toMatch(/over the 0\.18 m span, on the 0\.32 m chord/);
    const heads = await table.locator('thead th').allTextContents();
    for (const h of ['lift (N/m)', 'drag (N/m)', 'moment (N·m/m)', 'lift (N)', 'drag (N)', 'moment (N·m)']) expect(heads).toContain(h);
    await screenshot(page, 'deliverables-study-loads-si');
    await page.getByTestId('units-switch').getByText('US').click();
    await expect.poll(() => table.locator('thead th').allTextContents()).toContain('lift (lbf/ft)');
    expect(await table.locator('thead th').allTextContents()).toContain('moment (lbf·ft)');
    await page.getByTestId('units-switch').getByText('SI').click();
    await expect.poll(() => table.locator('thead th').allTextContents()).toContain('lift (N/m)');
  });
});
