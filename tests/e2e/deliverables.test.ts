import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { mailMessages, sketches, users } from '../../server/db/schema.ts';
import { DEMO_PASSWORD, DEMO_PEOPLE, DEMO_SKETCHES } from '../../server/db/seed.ts';
import { loadsCsvHeader } from '../../shared/flight/loadsExport.ts';
import { analyseSketch } from '../../shared/flight/analyseSketch.ts';
import { RESULTS_CAUTION } from '../../shared/model/caution.ts';
import { sketchCase } from '../../shared/model/sketch.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { ARTIFACTS_DIR, screenshot, signInDemo, textOf } from '../helpers/browser.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';

const root = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern fin root'))!;

/**
 * What people take away from a sketch: loads per facet as CSV (this design point or all), the
 * canvas picture with its caption, the study table's loads in N and N·m, and the sketch on a
 * phone (390 × 844) from a mention e-mail's link, with the sketches table at that width.
 */
describe('deliverables: loads CSV, the captioned picture, study loads, the phone view', () => {
  let world: BrowserWorld;
  let database: TestDatabase;
  let server: RunningServer;
  let sketchId: string;

  beforeAll(async () => {
    world = await startBrowserWorld({ mail: true, browsers: 2 });
    ({ database, server } = world);
    const root = await database.db.query.sketches.findFirst({ where: eq(sketches.title, 'Tern fin root — double wedge, 5% thick, ridge at 40%') });
    sketchId = root!.id;
  });
  afterAll(async () => world?.close());

  const download = async (testId: string, name: string) => {
    const { page } = firstItem(world.browsers);
    await page.getByTestId('open-export').click();
    const [file] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
    const target = path.join(ARTIFACTS_DIR, name);
    await file.saveAs(target);
    return { fileName: file.suggestedFilename(), body: readFileSync(target) };
  };

  it('exports loads per facet for the shown design point and for all three, with units in the headers', async () => {
    const { page } = firstItem(world.browsers);
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
    expect(text).toMatch(/# Design point,"Burnout","M 2\.6, alpha 4 deg, gamma 1\.4, altitude 12000 m; status ok; p_inf 19\d{3}\.\d+ Pa/);
    expect(text).toContain('Inviscid preliminary estimate');

    const all = await download('export-loadsCsvAll', 'loads-all.csv');
    const allText = all.body.toString('utf8');
    for (const name of ['Burnout', 'Max q', 'Pull-up']) expect(allText.split('\n').filter((l) => l.startsWith(`"${name}",`))).toHaveLength(5);
  });

  it('the canvas picture has a caption band with the title, condition, theory and caution', async () => {
    const { page } = firstItem(world.browsers);
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
    const { page } = firstItem(world.browsers);
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

  it('a mention e-mail\'s link opens the read-only phone view at 390 × 844 with the pin\'s thread, the wave map and the coefficients', async () => {
    const ines = itemAt(world.browsers, 0).page;
    const priya = itemAt(world.browsers, 1);
    // Ines pins the lower nose shock and mentions Priya (through the API, as the editor's composer does).
    const priyaRow = await database.db.query.users.findFirst({ where: eq(users.email, itemAt(DEMO_PEOPLE, 2).email) });
    const shock = analyseSketch(sketchCase(root.document)).result!.waves.find((w) => w.id === 'wave_lower_0')!;
    const at = [shock.origin[0] + (shock.end[0] - shock.origin[0]) / 4, shock.origin[1] + (shock.end[1] - shock.origin[1]) / 4];
    const status = await ines.evaluate(
      async ({ sketchId, at, mention }) => {
        const res = await fetch(`/api/sketches/${sketchId}/pins`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'x-shockwright-request': '1' },
          body: JSON.stringify({ target: { kind: 'wave', waveId: 'wave_lower_0', at }, body: '@Priya Vance does the nose shock stay attached at pull-up?', mentions: [mention] }),
        });
        return res.status;
      },
      { sketchId, at, mention: priyaRow!.id },
    );
    expect(status).toBe(201);
    const mails = async () => (await database.db.select().from(mailMessages)).filter((m) => m.toAddresses.includes(itemAt(DEMO_PEOPLE, 2).email));
    await expect.poll(async () => (await mails()).length, { timeout: 20_000 }).toBe(1);
    const link = /https?:\/\/\S+\?pin=(pin_[a-z0-9]{20})/.exec(firstItem(await mails()).textBody)!;

    // Priya opens it on her phone, signed out: sign in, then straight to the sketch, read-only.
    const page = priya.page;
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto(link[0]);
    await page.getByTestId('sign-in-email').fill(itemAt(DEMO_PEOPLE, 2).email);
    await page.getByTestId('sign-in-password').fill(DEMO_PASSWORD);
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('sketch-phone').waitFor();
    expect(new URL(page.url()).pathname).toBe(`/sketches/${sketchId}/phone`);
    await expect.poll(() => textOf(page, 'phone-thread'), { timeout: 20_000 }).toContain('does the nose shock stay attached at pull-up?');
    expect(await page.getByTestId('phone-thread').locator('.phone__reply').count()).toBe(1);
    expect(await textOf(page, 'phone-title')).toBe(root.title);
    await expect.poll(() => page.getByTestId('phone-map').getAttribute('data-wave-count')).not.toBe('0');
    expect(await page.getByTestId('phone-map').getAttribute('data-pin-count')).toBe('1');
    expect(await textOf(page, 'phone-coef-cl')).toMatch(/^cl\s*0\.\d+/);
    expect(await textOf(page, 'phone-caution')).toBe(RESULTS_CAUTION);
    // Nothing wider than the screen: no sideways scrolling.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    expect(await page.getByTestId('phone-full-editor').count()).toBe(1);
    expect(await page.getByTestId('phone-point').inputValue()).toBe(root.document.selectedPointId);
    await screenshot(page, 'phone-sketch-from-mention');
    await page.getByTestId('phone-pins').scrollIntoViewIfNeeded();
    await page.getByTestId('phone-pins').screenshot({ path: path.join(ARTIFACTS_DIR, 'phone-sketch-thread.png') });

    // Another design point: solved on the phone, its wave map drawn.
    await page.getByTestId('phone-point').selectOption({ label: 'Pull-up' });
    await expect.poll(() => textOf(page, 'phone-condition')).toContain('M 2.4, α 9°');
    await expect.poll(() => page.getByTestId('phone-map').getAttribute('data-wave-count')).not.toBe('0');
    await screenshot(page, 'phone-sketch-pull-up');
  });

  it('the sketches table at 390 px: one card per sketch, no sideways scrolling, a tap opens the phone view', async () => {
    const page = itemAt(world.browsers, 1).page;
    await page.goto(`${server.url}/`);
    await page.getByTestId('sketch-table').waitFor();
    await page.getByTestId(`card-${sketchId}`).waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    expect(await textOf(page, `card-${sketchId}`)).toMatch(/4 vertices, t\/c 5\.0 % · M 2\.6, α 4°/);
    await screenshot(page, 'phone-home');
    await page.getByTestId(`open-${sketchId}`).click();
    await page.getByTestId('sketch-phone').waitFor();
    // The full editor stays one tap away.
    await page.getByTestId('phone-full-editor').click();
    await page.getByTestId('sketch-editor').waitFor();
  });
});
