import { copyFileSync, mkdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE, DEMO_SKETCHES } from '../../server/db/seed.ts';
import { RESULTS_CAUTION, RESULTS_CAUTION_SHORT } from '../../shared/model/caution.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { ARTIFACTS_DIR, screenshot, signInDemo, textOf, vertexOnScreen, type BrowserSession } from '../helpers/browser.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';



const text = textOf;

describe('sketch editor in Chromium', () => {
  let server: RunningServer;
  let browser: BrowserSession;

  let world: BrowserWorld;

  beforeAll(async () => {
    world = await startBrowserWorld();
    ({ server } = world);
    browser = firstItem(world.browsers);
  });
  afterAll(async () => world?.close());

  it('lists the team’s sketches on the home table and filters them by search', async () => {
    const { page } = browser;
    await signInDemo(page, DEMO_PEOPLE[0].email, server.url);
    const rows = page.locator('[data-testid^="sketch-row-"]');
    await expect.poll(() => rows.count()).toBe(DEMO_SKETCHES.length);
    await page.getByTestId('home-search').fill('canard');
    await expect.poll(() => rows.count()).toBe(1);
    expect(await rows.first().textContent()).toContain('Tern canard');
    await page.getByTestId('home-search').fill('');
    await screenshot(page, 'editor-home');
  });

  it('at 1440×900 the text fits: home titles, the vertex table\'s values, the review tabs, the short caution with the coefficients', async () => {
    const { page } = browser;
    await page.setViewportSize({ width: 1440, height: 900 });
    // Home: no title is clamped (two lines at most, then an ellipsis; the demo's all fit).
    const clamped = await page.locator('.home__title-link').evaluateAll((links) => links.filter((l) => l.scrollHeight > l.clientHeight + 1).map((l) => l.textContent));
    expect(clamped).toEqual([]);
    await page.getByText('Tern canard').first().click();
    await page.getByTestId('vertex-table').waitFor();
    await expect.poll(() => text(page, 'results-status')).toBe('ok');
    // Every vertex value shows whole ("−0.0166667" included).
    const cut = await page.locator('.vertex-table__input').evaluateAll((inputs) => inputs.filter((i) => i.scrollWidth > i.clientWidth).map((i) => (i as HTMLInputElement).value));
    expect(await page.getByTestId('vertex-y-7').inputValue()).toBe('-0.0166667');
    expect(cut).toEqual([]);
    // The short caution is in the window, above the coefficients.
    const caution = (await page.getByTestId('results-caution-short').boundingBox())!;
    expect(caution.y + caution.height).toBeLessThanOrEqual(Math.min(900, (await page.getByTestId('coefficients').boundingBox())!.y));
    // The review panel's four tabs all show (none folded into the "…" menu).
    await page.getByTestId('toggle-review').click();
    await page.getByTestId('review-panel').waitFor();
    for (const name of ['Pins', 'Snapshots', 'Activity', 'Approvals']) await expect.poll(() => page.getByRole('tab', { name, exact: true }).isVisible()).toBe(true);
    const nav = (await page.locator('.review-panel__tabs .ant-tabs-nav-wrap').boundingBox())!;
    const approvals = (await page.getByRole('tab', { name: 'Approvals', exact: true }).boundingBox())!;
    expect(approvals.x + approvals.width).toBeLessThanOrEqual(nav.x + nav.width);
    await page.getByTestId('review-close').click();
    await page.setViewportSize({ width: 1400, height: 880 });
    await page.goto(`${server.url}/`);
    await page.getByTestId('sketch-table').waitFor();
  });

  it('creates a sketch from a template and shows its wave map, coefficients and the caution', async () => {
    const { page } = browser;
    await page.getByTestId('new-sketch').click();
    await page.getByTestId('template-hexagonal').click();
    // The test id lands on the number input itself or on its wrapper, depending on the component.
    const thickness = page.getByTestId('template-param-thicknessPercent').locator('xpath=descendant-or-self::input');
    await thickness.fill('5');
    await thickness.press('Tab');
    await expect.poll(() => page.getByTestId('create-title').inputValue()).toBe('Hexagonal — thickness ratio 5 % c, flat length 50 % c');
    await page.getByTestId('create-confirm').click();
    await page.getByTestId('sketch-canvas').waitFor();
    expect(await text(page, 'sketch-title')).toContain('Hexagonal — thickness ratio 5 % c');
    expect(await page.locator('[data-testid^="vertex-row-"]').count()).toBe(6);
    expect(await page.getByTestId('vertex-y-1').inputValue()).toBe('0.025');
    await expect.poll(() => text(page, 'results-status')).toBe('ok');
    expect(Number(await text(page, 'coef-exact-cl'))).toBeGreaterThan(0);
    expect(Number(await page.getByTestId('sketch-canvas').getAttribute('data-wave-count'))).toBeGreaterThan(0);
    expect(await text(page, 'results-caution')).toBe(RESULTS_CAUTION);
    // The short caution is seen with the coefficients: inside the 900 px window, above the table.
    const caution = (await page.getByTestId('results-caution-short').boundingBox())!;
    const table = (await page.getByTestId('coefficients').boundingBox())!;
    expect(await text(page, 'results-caution-short')).toBe(RESULTS_CAUTION_SHORT);
    expect(caution.y + caution.height).toBeLessThanOrEqual(page.viewportSize()!.height);
    expect(caution.y + caution.height).toBeLessThanOrEqual(table.y);
    await page.getByTestId('cp-chart').waitFor();
    await screenshot(page, 'editor-template');
    expect(browser.foreignRequests).toEqual([]);
  });

  it('drags a vertex: cl changes, one edit is saved, and undo/redo step it back and forth', async () => {
    const { page } = browser;
    const clBefore = await text(page, 'coef-exact-cl');
    const yBefore = await page.getByTestId('vertex-y-1').inputValue();
    const start = await vertexOnScreen(page, 1);
    // Act: press on vertex 1 (upper front shoulder) and drag it 30 px up in small steps.
    await page.mouse.move(start.x, start.y);
    await page.mouse.down();
    for (let i = 1; i <= 10; i++) await page.mouse.move(start.x, start.y - 3 * i);
    await page.mouse.up();
    // Assert: the table shows the new position, cl changed, and the edit was saved.
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).not.toBe(yBefore);
    const yAfter = await page.getByTestId('vertex-y-1').inputValue();
    expect(Number(yAfter)).toBeGreaterThan(Number(yBefore));
    await expect.poll(() => text(page, 'coef-exact-cl')).not.toBe(clBefore);
    const clAfter = await text(page, 'coef-exact-cl');
    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state'), { timeout: 10_000 }).toBe('saved');
    await screenshot(page, 'editor-drag');

    // Undo with the keyboard, redo with Ctrl+Shift+Z, undo again with the toolbar button.
    await page.getByTestId('sketch-canvas').focus();
    await page.keyboard.press('Control+z');
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).toBe(yBefore);
    await expect.poll(() => text(page, 'coef-exact-cl')).toBe(clBefore);
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).toBe(yAfter);
    await expect.poll(() => text(page, 'coef-exact-cl')).toBe(clAfter);
    await page.getByTestId('undo').click();
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).toBe(yBefore);
    await page.keyboard.press('Control+y');
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).toBe(yAfter);
    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state'), { timeout: 10_000 }).toBe('saved');

    // The saved document survives a reload.
    await page.reload();
    await page.getByTestId('vertex-y-1').waitFor();
    expect(await page.getByTestId('vertex-y-1').inputValue()).toBe(yAfter);
  });

  it('[DR6] a drag paints its previews with a drag\'s detail and, while the vertex is still held, the full picture once the pointer pauses', async () => {
    const { page } = browser;
    const canvas = page.getByTestId('sketch-canvas');
    await expect.poll(() => canvas.getAttribute('data-scene-detail')).toBe('full');
    // Every detail the worker reports from here on, in order (a slow machine may pause between moves).
    await canvas.evaluate((el) => {
      const seen: string[] = [];
      (window as unknown as { __details: string[] }).__details = seen;
      new MutationObserver(() => seen.push(el.getAttribute('data-scene-detail') ?? '')).observe(el, { attributes: true, attributeFilter: ['data-scene-detail'] });
    });
    const yBefore = await page.getByTestId('vertex-y-1').inputValue();
    const start = await vertexOnScreen(page, 1);
    await page.mouse.move(start.x, start.y);
    await page.mouse.down();
    for (let i = 1; i <= 12; i++) await page.mouse.move(start.x, start.y - 2 * i);
    // Still holding: the pointer has stopped, so the worker paints the scene in full again.
    await expect.poll(() => page.evaluate(() => (window as unknown as { __details: string[] }).__details.at(-1))).toBe('full');
    const details = await page.evaluate(() => (window as unknown as { __details: string[] }).__details);
    expect(details.indexOf('drag')).toBeGreaterThanOrEqual(0);
    expect(details.lastIndexOf('full')).toBeGreaterThan(details.indexOf('drag'));
    expect(await canvas.getAttribute('data-scene-detail')).toBe('full');
    await screenshot(page, 'editor-drag-paused');
    await page.mouse.up();
    // One edit; undo takes it back.
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).not.toBe(yBefore);
    await page.getByTestId('sketch-canvas').focus();
    await page.keyboard.press('Control+z');
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).toBe(yBefore);
  });

  it('edits a vertex in the table and refuses a crossing with the reason', async () => {
    const { page } = browser;
    const cell = page.getByTestId('vertex-x-1');
    await cell.fill('0.3');
    await cell.press('Enter');
    await expect.poll(() => page.getByTestId('vertex-x-1').inputValue()).toBe('0.3');
    // Move the nose aft of the tail: the closing facet from the lower surface would cross the
    // lower aft facet, wherever the previous test's drag left vertex 1.
    const nose = page.getByTestId('vertex-x-0');
    await nose.fill('1.2');
    await nose.press('Enter');
    await expect.poll(() => text(page, 'vertex-table-error')).toMatch(/not allowed: facet \d .* cross/);
    await nose.press('Escape');
    expect(await page.getByTestId('vertex-x-0').inputValue()).toBe('0');
  });

  it('imports a coordinates file: an error is listed with its line and nothing changes; a good file replaces the section', async () => {
    const { page } = browser;
    const countBefore = await page.locator('[data-testid^="vertex-row-"]').count();
    await page.getByTestId('open-import').click();
    await page.getByTestId('import-file').setInputFiles({
      name: 'tern-ramp.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from('# Tern ramp, bad file\nx,y\n0,0\n0.5,0.04\n1;0;2\n0.5,-0.04\n'),
    });
    await page.getByTestId('import-issues').waitFor();
    expect(await text(page, 'import-issues')).toContain('Line 5: expected two values (x y), found 3.');
    expect(await page.getByTestId('import-confirm').isDisabled()).toBe(true);
    await screenshot(page, 'editor-import-error');
    expect(await page.locator('[data-testid^="vertex-row-"]').count()).toBe(countBefore);

    await page.getByTestId('import-file').setInputFiles({
      name: 'tern-ramp.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from('x y\n0 0\n0.3 0.03\n0.7 0.03\n1 0\n0.5 -0.02\n'),
    });
    await page.getByTestId('import-ready').waitFor();
    await page.getByTestId('import-confirm').click();
    await expect.poll(() => page.locator('[data-testid^="vertex-row-"]').count()).toBe(5);
    expect(await page.getByTestId('vertex-y-2').inputValue()).toBe('0.03');
  });

  it('exports the section as CSV and the per-facet result with the caution', async () => {
    const { page } = browser;
    await page.getByTestId('open-export').click();
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-sectionCsv').click()]);
    expect(download.suggestedFilename()).toMatch(/-section\.csv$/);
    const csv = readFileSync((await download.path())!, 'utf8').trim().split('\n');
    expect(csv[0]).toMatch(/^# Shockwright section,"/);
    expect(csv.slice(2)).toEqual(['x,y', '0,0', '0.3,0.03', '0.7,0.03', '1,0', '0.5,-0.02']);

    await page.getByTestId('open-export').click();
    const [facets] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-facetCsv').click()]);
    const facetText = readFileSync((await facets.path())!, 'utf8');
    expect(facetText).toContain(`# ${RESULTS_CAUTION}`);
    expect(facetText.trim().split('\n').filter((l) => /^"(upper|lower)",/.test(l))).toHaveLength(5);

    // The canvas picture: a PNG at twice the canvas size with a caption band (title, design point
    // and condition, theory, caution: four 18 px lines and 8 px padding, all ×2).
    const box = (await page.getByTestId('sketch-canvas').boundingBox())!;
    await page.getByTestId('open-export').click();
    const [png] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-png').click()]);
    expect(png.suggestedFilename()).toMatch(/-wave-map\.png$/);
    const bytes = readFileSync((await png.path())!);
    expect(bytes.subarray(1, 4).toString('ascii')).toBe('PNG');
    expect(bytes.readUInt32BE(16)).toBe(2 * Math.floor(box.width));
    expect(bytes.readUInt32BE(20)).toBe(2 * Math.floor(box.height) + 2 * (16 + 18 * 4));
    mkdirSync(ARTIFACTS_DIR, { recursive: true });
    copyFileSync((await png.path())!, path.join(ARTIFACTS_DIR, 'editor-export.png'));
    expect(browser.foreignRequests).toEqual([]);
  });

  it('draws a limit at its vertex and says in the results what is not valid', async () => {
    const { page } = browser;
    await page.getByTestId('back-home').click();
    await page.getByRole('link', { name: /Booster fin/ }).click();
    await page.getByTestId('sketch-canvas').waitFor();
    await expect.poll(() => text(page, 'results-status')).toBe('detached');
    const validity = await text(page, 'results-validity');
    expect(validity).toContain('Nose shock detaches on the lower surface');
    expect(validity).toContain('Exact (shock-expansion) coefficients are not given');
    expect(await text(page, 'coef-exact-cl')).toBe('—');
    expect(await text(page, 'results-caution')).toBe(RESULTS_CAUTION);
    await screenshot(page, 'editor-detached');
  });

  it('duplicates, renames and deletes (after confirming) a sketch from the home table', async () => {
    const { page } = browser;
    await page.getByTestId('back-home').click();
    const rows = page.locator('[data-testid^="sketch-row-"]');
    await rows.first().waitFor();
    const before = await rows.count();
    const tip = rows.filter({ hasText: 'Tern fin tip' });
    await tip.locator('[data-testid^="duplicate-"]').click();
    await expect.poll(() => rows.count()).toBe(before + 1);
    const copy = rows.filter({ hasText: '(copy)' });
    expect(await copy.count()).toBe(1);

    await copy.locator('[data-testid^="rename-"]').click();
    await page.getByTestId('rename-title').fill('Tern fin tip — variant B');
    await page.getByTestId('rename-confirm').click();
    const renamed = rows.filter({ hasText: 'variant B' });
    await expect.poll(() => renamed.count()).toBe(1);

    await renamed.locator('[data-testid^="delete-"]').click();
    await page.getByTestId('confirm-delete').click();
    await expect.poll(() => rows.count()).toBe(before);
    expect(await rows.filter({ hasText: 'variant B' }).count()).toBe(0);
  });

  it('a viewer sees the table and the editor without editing controls', async () => {
    const { page } = browser;
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByTestId('sign-in-email').waitFor();
    await signInDemo(page, itemAt(DEMO_PEOPLE, 3).email, server.url);
    expect(await page.getByTestId('new-sketch').count()).toBe(0);
    expect(await page.locator('[data-testid^="rename-"]').count()).toBe(0);
    expect(await page.locator('[data-testid^="delete-"]').count()).toBe(0);
    await page.locator('[data-testid^="open-sketch_"]').first().click();
    await page.getByTestId('sketch-canvas').waitFor();
    expect(await text(page, 'status-line')).toContain('Read only');
    expect(await page.getByTestId('tool-draw').isDisabled()).toBe(true);
    expect(await page.getByTestId('open-import').count()).toBe(0);
    expect(await page.getByTestId('vertex-x-0').getAttribute('readonly')).not.toBeNull();
    expect(browser.foreignRequests).toEqual([]);
  });
});
