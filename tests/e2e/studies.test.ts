import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { sketches } from '../../server/db/schema.ts';
import { DEMO_PEOPLE, DEMO_SKETCHES } from '../../server/db/seed.ts';
import { RESULTS_CAUTION } from '../../shared/model/caution.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { ARTIFACTS_DIR, screenshot, signInDemo, type BrowserSession } from '../helpers/browser.ts';
import { pdfPageCount, pdfText, pdfToPng } from '../helpers/pdf.ts';
import { firstItem } from '../../shared/util/invariant.ts';

const CANARD = DEMO_SKETCHES.find((s) => s.title.startsWith('Tern canard'))!;


describe('studies and the PDF report in Chromium', () => {
  let database: TestDatabase;
  let server: RunningServer;
  let browser: BrowserSession;
  let sketchId: string;

  let world: BrowserWorld;

  beforeAll(async () => {
    world = await startBrowserWorld();
    ({ database, server } = world);
    browser = firstItem(world.browsers);
    sketchId = firstItem(await database.db.select({ id: sketches.id }).from(sketches).where(eq(sketches.title, CANARD.title))).id;
  });
  afterAll(async () => world?.close());

  it('runs a study in the worker: the progress bar fills, the table and the per-Mach summary appear', async () => {
    const { page } = browser;
    await signInDemo(page, DEMO_PEOPLE[0].email, server.url);
    browser.consoleErrors.length = 0; // the signed-out check before sign-in answers 401 by design
    await page.goto(`${server.url}/sketches/${sketchId}/studies`);
    await page.getByTestId('study-form').waitFor();
    // The canard has a flap: Mach 1.5–4 by 0.25 (11) × α −10…10 by 1 (21) × 5 deflections.
    expect(await page.getByTestId('study-count').textContent()).toContain('= 1,155 points');
    await page.getByTestId('study-run').click();
    const progress = page.getByTestId('study-progress');
    await progress.waitFor();
    await expect.poll(() => progress.getAttribute('data-done'), { timeout: 30_000 }).toBe('yes');
    expect(await progress.locator('.ant-progress-bg').getAttribute('style')).toContain('width: 100%');
    expect(await page.getByTestId('study-progress-text').textContent()).toMatch(/Done in \d+ ms in this browser/);
    expect(await page.getByTestId('study-status-line').textContent()).toContain('1,155 points');
    await page.getByTestId('study-table').waitFor();
    expect(await page.getByTestId('study-table').textContent()).toContain('1,155 points');
    expect(await page.getByTestId('study-summary').locator('tbody tr').count()).toBe(11);
    expect(await page.getByTestId('study-results').textContent()).toContain(RESULTS_CAUTION);
    // With the status line, above the table: seen without scrolling past the results.
    const caution = (await page.getByTestId('study-results').getByTestId('results-caution').boundingBox())!;
    expect(caution.y).toBeLessThan((await page.getByTestId('study-table').boundingBox())!.y);
    await screenshot(page, 'studies-table');
    expect(browser.foreignRequests).toEqual([]);
  });

  it('sorts the table by L/D and cancels a long run part-way', async () => {
    const { page } = browser;
    const table = page.getByTestId('study-table');
    await table.locator('th', { hasText: 'L/D' }).first().click(); // ascending
    await table.locator('th', { hasText: 'L/D' }).first().click(); // descending
    // Columns: Mach, α, δ, status, cl, cd wave, cd friction, cd total, cm, x_cp/c, L/D (index 10).
    const ld = async (i: number) => Number((await table.locator('tbody tr.ant-table-row').nth(i).locator('td').nth(10).textContent())!.replace('−', '-'));
    const firstLd = await ld(0);
    const secondLd = await ld(1);
    expect(firstLd).toBeGreaterThanOrEqual(secondLd);
    expect(firstLd).toBeGreaterThan(3);

    // A big sweep (Mach 1.2–5 by 0.02 × α −10…10 by 0.5 × 5 δ ≈ 39,000 points is over the limit; use 0.05).
    await page.getByTestId('study-mach-start').fill('1.2');
    await page.getByTestId('study-mach-end').fill('5');
    await page.getByTestId('study-mach-step').fill('0.05');
    await page.getByTestId('study-alpha-step').fill('0.5');
    await expect.poll(() => page.getByTestId('study-count').textContent()).toContain('= 15,785 points');
    // Run, then Cancel as soon as it shows, from inside the page: a click from the test costs a
    // round trip that a loaded machine can stretch past the whole run.
    await page.evaluate(async () => {
      document.querySelector<HTMLElement>('[data-testid="study-run"]')!.click();
      const cancel = () => document.querySelector<HTMLElement>('[data-testid="study-cancel"]');
      while (!cancel()) await new Promise((r) => setTimeout(r, 0));
      cancel()!.click();
    });
    await expect.poll(() => page.getByTestId('study-progress-text').textContent(), { timeout: 30_000 }).toMatch(/Cancelled after [\d,]+ points/);
    await page.getByTestId('study-mach-step').fill('0.25');
    await page.getByTestId('study-alpha-step').fill('1');
    await page.getByTestId('study-mach-start').fill('1.5');
    await page.getByTestId('study-mach-end').fill('4');
    await page.getByTestId('study-name').click(); // commits the number inputs
    await expect.poll(() => page.getByTestId('study-count').textContent()).toContain('= 1,155 points');
  });

  it('opens the polar chart and the other charts', async () => {
    const { page } = browser;
    await page.getByRole('tab', { name: 'Polar' }).click();
    const chart = page.getByTestId('study-chart-polar');
    await chart.waitFor();
    await chart.locator('canvas').first().waitFor();
    expect(await chart.textContent()).toContain('Drag polar: cl against cd (wave + friction)');
    await screenshot(page, 'studies-polar');
    await page.getByRole('tab', { name: 'L/D–α' }).click();
    await page.getByTestId('study-chart-ld').locator('canvas').first().waitFor();
    await page.getByRole('tab', { name: 'Hinge moment' }).click();
    await page.getByTestId('study-chart-hinge').locator('canvas').first().waitFor();
    await screenshot(page, 'studies-hinge');
    expect(browser.consoleErrors).toEqual([]);
  });

  it('saves the study on the server, switches the loads to US units, and downloads the PDF report with the study', async () => {
    const { page } = browser;
    await page.getByTestId('study-name').fill('Canard envelope');
    await page.getByTestId('study-save').click();
    const list = page.getByTestId('study-list');
    // The server runs the 1,155 points again before it answers.
    await expect.poll(() => list.textContent(), { timeout: 20_000 }).toContain('Canard envelope');
    expect(await list.textContent()).toContain('1,155 points');
    expect(await page.getByTestId('study-report').textContent()).toContain('with this study');

    // Loads of the sketch's own condition, switched to US customary (kept on the server).
    expect(await page.getByTestId('fs-q').textContent()).toMatch(/ Pa$/);
    await page.getByTestId('units-switch').getByText('US').click();
    await expect.poll(() => page.getByTestId('fs-q').textContent()).toMatch(/ lbf\/ft²$/);
    expect(await page.getByTestId('force-lift-span').textContent()).toMatch(/ lbf\/ft$/);
    expect(await page.getByTestId('force-hinge-total').textContent()).toMatch(/ lbf·ft$/);
    await screenshot(page, 'studies-saved-us-units');
    await page.getByTestId('loads-panel').screenshot({ path: path.join(ARTIFACTS_DIR, 'studies-loads-panel-us.png') });

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('study-report').click()]);
    const file = path.join(ARTIFACTS_DIR, 'studies-report.pdf');
    await download.saveAs(file);
    const pdf = readFileSync(file);
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // Section report (4 pages: design points and wave map; condition, Cp chart, coefficients;
    // loads, per-facet table and the coordinates as analysed (the canard's flap deflected 5°);
    // the coordinates as drawn) + study charts (1) + the per-Mach table (11 Mach × 5 δ rows, onto
    // a second page); the 1,155 points themselves are not printed.
    expect(pdfPageCount(pdf)).toBe(7);
    const text = pdfText(pdf).replace(/\s+/g, ' ');
    expect(text).toContain('Section coordinates as analysed — flap deflected 5° about x/c = 0.7 (14 vertices)');
    expect(text).toContain('Section coordinates as drawn (12 vertices)');
    expect(text).toContain('Study: Canard envelope');
    expect(text).toContain('units: US customary');
    expect(text).toContain(RESULTS_CAUTION);
    const pngs = pdfToPng(pdf, ARTIFACTS_DIR, 'studies-report', 80);
    expect(pngs.map((p) => path.basename(p))).toEqual([1, 2, 3, 4, 5, 6, 7].map((n) => `studies-report-${n}.png`));
  });

  it('prints the results only (print stylesheet)', async () => {
    const { page } = browser;
    await page.getByRole('tab', { name: 'Table' }).click();
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByTestId('study-form').isVisible()).toBe(false);
    expect(await page.getByTestId('app-header').isVisible()).toBe(false);
    expect(await page.getByTestId('study-table').isVisible()).toBe(true);
    await screenshot(page, 'studies-print');
    await page.emulateMedia({ media: 'screen' });
  });
});
