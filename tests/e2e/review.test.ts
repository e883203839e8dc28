import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PEOPLE, DEMO_SKETCHES } from '../../server/db/seed.ts';
import { mailMessages, sketches } from '../../server/db/schema.ts';
import { analyseSketch } from '../../shared/flight/analyseSketch.ts';
import { sketchCase, type Point } from '../../shared/model/sketch.ts';
import { RESULTS_CAUTION } from '../../shared/model/caution.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo, textOf, worldOnScreen, type BrowserSession } from '../helpers/browser.ts';
import { firstItem, firstItems, itemAt } from '../../shared/util/invariant.ts';

const [INES, TOMASZ, PRIYA] = firstItems(DEMO_PEOPLE, 3);
const FIN = itemAt(DEMO_SKETCHES, 0);



const text = textOf;


describe('review workflow in Chromium: pins, threads, mentions, snapshots, status', () => {
  let database: TestDatabase;
  let server: RunningServer;
  let reviewer: BrowserSession;
  let editor: BrowserSession;
  let sketchId: string;
  let pinLink: string;

  let world: BrowserWorld;

  beforeAll(async () => {
    world = await startBrowserWorld({ mail: true, browsers: 2 });
    ({ database, server } = world);
    [reviewer, editor] = firstItems(world.browsers, 2);
    const fin = await database.db.query.sketches.findFirst({ where: eq(sketches.title, FIN.title) });
    sketchId = fin!.id;
  });
  afterAll(async () => world?.close());

  async function mailsTo(email: string) {
    const rows = await database.db.select().from(mailMessages);
    return rows.filter((m) => m.toAddresses.includes(email));
  }

  it('a reviewer pins a shock of the wave map and mentions the editor', async () => {
    const { page } = reviewer;
    await signInDemo(page, PRIYA.email, server.url);
    await page.getByTestId(`open-${sketchId}`).click();
    await page.getByTestId('sketch-canvas').waitFor();
    await expect.poll(() => page.getByTestId('sketch-canvas').getAttribute('data-wave-count')).not.toBe('0');
    // A reviewer cannot edit, set the status or save snapshots, but may pin.
    expect(await page.getByTestId('open-review-request').count()).toBe(0);
    expect(await text(page, 'review-status')).toBe('Draft');

    await page.getByTestId('toggle-review').click();
    await page.getByTestId('review-panel').waitFor();
    // The review panel takes the results panel's place; the caution stays under the wave map.
    expect(await page.getByTestId('review-caution').textContent()).toBe(RESULTS_CAUTION);
    await page.getByTestId('place-pin').click();
    await page.getByTestId('pin-placing').waitFor();

    // The lower surface's nose shock (M 2.6, α 4°: the lower facet turns the flow into itself),
    // a third of the way along its drawn line, well away from the section and the other waves.
    const shock = analyseSketch(sketchCase(FIN.document)).result!.waves.find((w) => w.id === 'wave_lower_0')!;
    expect(shock.kind).toBe('shock');
    const along: Point = [shock.origin[0] + (shock.end[0] - shock.origin[0]) / 3, shock.origin[1] + (shock.end[1] - shock.origin[1]) / 3];
    const at = await worldOnScreen(page, along);
    await page.mouse.click(at.x, at.y);
    await page.getByTestId('pin-draft').waitFor();
    expect(await text(page, 'pin-draft-target')).toBe('Oblique shock · lower surface, vertex 0');

    const box = page.getByTestId('pin-new').locator('textarea');
    await box.click();
    await page.keyboard.type('@Tom');
    await page.locator('.ant-mentions-dropdown-menu-item', { hasText: 'Tomasz Reyes' }).click();
    await page.keyboard.type('is this nose shock still attached if we pull to 6°?');
    expect(await text(page, 'pin-new-mentions')).toBe('E-mails a notice to Tomasz Reyes.');
    await page.getByTestId('pin-new-submit').click();

    await page.getByTestId('pin-thread').waitFor();
    expect(await text(page, 'pin-thread-target')).toBe('Oblique shock · lower surface, vertex 0');
    expect(await page.getByTestId('pin-reply-body').first().textContent()).toBe('@Tomasz Reyes is this nose shock still attached if we pull to 6°?');
    await expect.poll(() => page.getByTestId('sketch-canvas').getAttribute('data-pin-count')).toBe('1');
    expect(await text(page, 'open-pin-count')).toBe('1');
    await screenshot(page, 'review-pin-placed');
  });

  it('the mentioned editor gets an e-mail with a link to the pin', async () => {
    await expect.poll(async () => (await mailsTo(TOMASZ.email)).length, { timeout: 10_000 }).toBe(1);
    const mail = firstItem(await mailsTo(TOMASZ.email));
    expect(mail.subject).toBe(`Priya Vance mentioned you on “${FIN.title}”`);
    const link = /https?:\/\/\S+\?pin=pin_[a-z0-9]{20}/.exec(mail.textBody);
    expect(link).not.toBeNull();
    pinLink = link![0];
    expect(pinLink.startsWith(`${server.url}/sketches/${sketchId}?pin=`)).toBe(true);
    // No one else was mentioned; the author is never mailed about her own pin.
    expect(await mailsTo(PRIYA.email)).toEqual([]);
  });

  it('the editor opens the link in a second browser, sees the thread and answers', async () => {
    const { page } = editor;
    await signInDemo(page, TOMASZ.email, server.url);
    await page.goto(pinLink);
    await page.getByTestId('pin-thread').waitFor();
    expect(await text(page, 'pin-thread-target')).toBe('Oblique shock · lower surface, vertex 0');
    expect(await page.getByTestId('pin-reply-author').first().textContent()).toBe('Priya Vance');
    await page.getByTestId('pin-reply-box').locator('textarea').fill('Still attached at 6°: the lower nose turn is 9.6° well under the maximum deflection (above 30° at M 2.6).');
    await page.getByTestId('pin-reply-box-submit').click();
    await expect.poll(() => page.getByTestId('pin-reply').count()).toBe(2);
    expect(await page.getByTestId('pin-reply-author').nth(1).textContent()).toBe('Tomasz Reyes');
    await screenshot(page, 'review-editor-answers');
  });

  it('the reviewer sees the answer and resolves the pin; it moves to the resolved list', async () => {
    const { page } = reviewer;
    // Back to the list and into the thread again: it is fetched afresh.
    await page.getByTestId('pin-thread-back').click();
    const item = page.locator('[data-testid^="pin-item-"]').first();
    await expect.poll(() => item.textContent()).toContain('1 reply');
    await item.click();
    await expect.poll(() => page.getByTestId('pin-reply').count()).toBe(2);
    expect(await page.getByTestId('pin-reply-author').nth(1).textContent()).toBe('Tomasz Reyes');
    await page.getByTestId('pin-resolve').click();
    await expect.poll(() => text(page, 'pin-thread-status')).toBe('resolved');
    expect(await page.getByTestId('pin-thread').textContent()).toContain('Resolved by Priya Vance.');
    await page.getByTestId('pin-thread-back').click();
    await page.getByTestId('pin-list-empty').waitFor();
    await page.getByTestId('pin-filter').getByText('Resolved').click();
    await expect.poll(() => page.locator('[data-testid^="pin-item-"]').count()).toBe(1);
    expect(await page.getByTestId('open-pin-count').count()).toBe(0);
    await screenshot(page, 'review-pin-resolved');
    expect(reviewer.foreignRequests).toEqual([]);
    expect(editor.foreignRequests).toEqual([]);
  });

  it('the owner saves two snapshots, compares them and restores the first as a new revision', async () => {
    const { page } = reviewer;
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByTestId('sign-in-email').waitFor();
    await signInDemo(page, INES.email, server.url);
    await page.getByTestId(`open-${sketchId}`).click();
    await page.getByTestId('sketch-canvas').waitFor();
    await page.getByTestId('toggle-review').click();
    await page.getByRole('tab', { name: 'Snapshots' }).click();

    await page.getByTestId('snapshot-name').fill('Root as drawn');
    await page.getByTestId('snapshot-note').fill('Baseline before the ridge study.');
    await page.getByTestId('snapshot-save').click();
    await page.getByTestId('snapshot-saved').waitFor();

    // A thicker ridge: vertex 1 from y 0.025 to 0.035 in the table.
    const ridge = page.getByTestId('vertex-y-1');
    await ridge.fill('0.035');
    await ridge.press('Enter');
    await expect.poll(() => page.getByTestId('save-state').getAttribute('data-state'), { timeout: 10_000 }).toBe('saved');
    const revisionBefore = Number((await page.getByTestId('save-state').getAttribute('title'))?.replace(/\D/g, ''));
    await page.getByTestId('snapshot-name').fill('Thicker ridge');
    await page.getByTestId('snapshot-save').click();
    await expect.poll(() => text(page, 'snapshot-saved')).toContain('Thicker ridge');

    const rows = page.locator('[data-testid^="snapshot-snap_"]');
    await expect.poll(() => rows.count()).toBe(2);
    const drawn = rows.filter({ hasText: 'Root as drawn' });
    const thicker = rows.filter({ hasText: 'Thicker ridge' });
    expect(await drawn.textContent()).toContain('Ines Marlow');
    expect(await drawn.textContent()).toContain('saved');
    await drawn.locator('[data-testid^="pick-a-"]').click();
    await thicker.locator('[data-testid^="pick-b-"]').click();
    await page.getByTestId('snapshot-compare-open').click();
    // The comparison replaces the list (the button goes, the comparison comes). The button and
    // the comparison once shared a test id, and waiting for that id to go raced the comparison.
    await page.getByTestId('snapshot-compare').waitFor();
    await page.getByTestId('snapshot-compare-open').waitFor({ state: 'detached' });
    await page.locator('[data-testid="compare-exact"]').waitFor();

    // A thicker ridge at the same α: more wave drag, so cd grows (B − A > 0) in every theory.
    for (const theory of ['exact', 'linear', 'secondOrder']) {
      expect(await text(page, `compare-${theory}-cd-diff`)).toMatch(/^\+\d/);
    }
    expect(await text(page, 'compare-exact-cl-a')).not.toBe('—');
    expect(await page.getByTestId('review-panel').getByTestId('results-caution').textContent()).toBe(RESULTS_CAUTION);
    await screenshot(page, 'review-compare');

    await page.getByTestId('compare-back').click();
    await drawn.locator('[data-testid^="restore-"]').click();
    await page.getByText('Nothing is lost: the current state is first kept as an automatic snapshot').waitFor();
    await page.getByTestId('restore-confirm').click();
    await page.getByTestId('snapshot-restored').waitFor();
    await expect.poll(() => page.getByTestId('vertex-y-1').inputValue()).toBe('0.025');
    await expect.poll(async () => Number((await page.getByTestId('save-state').getAttribute('title'))?.replace(/\D/g, ''))).toBeGreaterThan(revisionBefore);
    const auto = rows.filter({ hasText: 'Before restoring “Root as drawn”' });
    await expect.poll(() => auto.count()).toBe(1);
    expect(await auto.getAttribute('data-kind')).toBe('before_restore');
    expect(await auto.textContent()).toContain('automatic, before a restore');
    expect(await auto.textContent()).toContain(`revision ${revisionBefore}`);

    // An import also keeps the sketch as it was in an automatic snapshot first.
    await page.getByTestId('open-import').click();
    await page.getByTestId('import-snapshot-note').waitFor();
    await page.getByTestId('import-file').setInputFiles({ name: 'tern-root-blunted.csv', mimeType: 'text/csv', buffer: Buffer.from('x y\n0 0\n0.4 0.025\n1 0\n0.4 -0.03\n') });
    await page.getByTestId('import-ready').waitFor();
    await page.getByTestId('import-confirm').click();
    await expect.poll(() => page.getByTestId('vertex-y-3').inputValue()).toBe('-0.03');
    const beforeImport = rows.filter({ hasText: 'Before importing tern-root-blunted.csv' });
    await expect.poll(() => beforeImport.count()).toBe(1);
    expect(await beforeImport.getAttribute('data-kind')).toBe('before_import');

    await page.getByRole('tab', { name: 'Activity' }).click();
    const feed = page.getByTestId('activity-list');
    await expect.poll(() => feed.textContent()).toContain('Ines Marlow imported 4 vertices from tern-root-blunted.csv');
    expect(await feed.textContent()).toContain('Ines Marlow restored snapshot “Root as drawn”');
    expect(await feed.textContent()).toContain('Priya Vance resolved a pin.');
    expect(await feed.textContent()).toContain('Tomasz Reyes replied on a pin');
    await screenshot(page, 'review-activity');
  });

  it('the owner requests a review; as the last editor she cannot approve, the editor approves the revision on screen', async () => {
    const { page } = reviewer;
    await page.getByTestId('open-review-request').click();
    const people = page.getByTestId('review-request-people');
    await people.getByText('Priya Vance').click();
    expect(await people.textContent()).not.toContain('Oren');
    await page.getByTestId('review-request-message').fill('Please check the restored root before we freeze it.');
    await page.getByTestId('review-request-send').click();
    await expect.poll(() => page.getByTestId('review-status').getAttribute('data-status')).toBe('in_review');
    await expect.poll(async () => (await mailsTo(PRIYA.email)).map((m) => m.subject)).toEqual([`Ines Marlow asks you to review “${FIN.title}”`]);
    expect(itemAt((await mailsTo(PRIYA.email)), 0).textBody).toContain('Please check the restored root before we freeze it.');

    // Ines made the last edit (the restore): approval must come from someone else [A4].
    await page.getByTestId('review-self-hint').waitFor();
    await page.getByTestId('review-decide').click();
    const approve = page.getByTestId('review-approve');
    await approve.waitFor();
    expect(await approve.isDisabled()).toBe(true);
    expect(await approve.textContent()).toBe('Approve — not by you: you made the last edit');
    // The list has finished opening (its motion classes are gone) before the picture.
    await page.waitForFunction(() => {
      const menu = document.querySelector('.ant-popover');
      return !!menu && !/-(enter|appear)/.test(menu.className);
    });
    await screenshot(page, 'review-status-self');
    // Escape closes the list.
    await page.keyboard.press('Escape');
    await page.getByTestId('review-decide-menu').waitFor({ state: 'hidden' });

    const other = editor.page;
    await other.reload();
    await other.getByTestId('review-status').waitFor();
    await expect.poll(() => other.getByTestId('review-status').getAttribute('data-status')).toBe('in_review');
    const revision = (await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) }))!.revision;
    await other.getByTestId('review-decide').click();
    await expect.poll(() => other.getByTestId('review-approve').textContent()).toBe(`Approve revision ${revision}…`);
    await other.getByTestId('review-approve').click();
    await other.getByTestId('review-outcome-note').fill('Root loads match the hand integration.');
    await other.waitForFunction(() => {
      const modal = document.querySelector('.ant-modal');
      return !!modal && !/-(enter|appear)/.test(modal.className);
    });
    await screenshot(other, 'review-outcome-dialog');
    await other.getByTestId('review-outcome-send').click();
    await expect.poll(() => other.getByTestId('review-status').getAttribute('data-status')).toBe('approved');
    expect(await text(other, 'review-approval')).toBe(`r${revision}`);
    expect(await other.getByTestId('review-approval').getAttribute('title')).toMatch(new RegExp(`^Approved revision ${revision} by Tomasz Reyes, .+\\.$`));
    // Ines has the sketch open: the approval reaches her header without a reload.
    await expect.poll(() => page.getByTestId('review-status').getAttribute('data-status'), { timeout: 20_000 }).toBe('approved');
    expect(await text(page, 'review-approval')).toBe(`r${revision}`);
    await screenshot(other, 'review-approved-header');
  });

  it('an edit after the approval shows "changed since approval" live in both headers and in the home table, until approved again [A2]', async () => {
    const ines = reviewer.page;
    const tomasz = editor.page;
    const approved = (await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) }))!.revision;
    // Ines changes Mach; Tomasz has the sketch open.
    await ines.locator('input#condition-mach').fill('2.7');
    await ines.locator('input#condition-mach').press('Enter');
    await expect.poll(() => ines.getByTestId('review-status').textContent(), { timeout: 20_000 }).toBe('Changed since approval');
    await expect.poll(() => tomasz.getByTestId('review-status').textContent(), { timeout: 20_000 }).toBe('Changed since approval');
    expect(await tomasz.getByTestId('review-status').getAttribute('title')).toMatch(new RegExp(`^Approved revision ${approved} by Tomasz Reyes, .+; changed since \\(now revision ${approved + 1}\\)\\.$`));
    await screenshot(tomasz, 'review-changed-header');

    await ines.getByTestId('back-home').click();
    const cell = ines.getByTestId(`review-status-${sketchId}`);
    await expect.poll(() => cell.textContent()).toBe('Changed since approval');
    expect(await text(ines, `review-approval-${sketchId}`)).toBe(`r${approved}`);
    // The column's filter: only sketches changed since their approval.
    await ines.locator('th', { hasText: 'Review' }).locator('.ant-table-filter-trigger').click();
    await ines.locator('.ant-table-filter-dropdown .ant-dropdown-menu-item', { hasText: 'Changed since approval' }).click();
    await ines.locator('.ant-table-filter-dropdown').getByRole('button', { name: 'OK' }).click();
    await expect.poll(() => ines.locator('[data-testid^="sketch-row-"]').count()).toBe(1);
    await ines.locator('.ant-table-filter-dropdown').waitFor({ state: 'hidden' });
    await screenshot(ines, 'review-home-changed');

    // Tomasz looks at the new revision and approves it; the Approvals tab keeps both approvals.
    await tomasz.getByTestId('review-decide').click();
    await expect.poll(() => tomasz.getByTestId('review-approve').textContent()).toBe(`Approve revision ${approved + 1}…`);
    await tomasz.getByTestId('review-approve').click();
    await tomasz.getByTestId('review-outcome-send').click();
    await expect.poll(() => tomasz.getByTestId('review-status').textContent()).toBe('Approved');
    if ((await tomasz.getByTestId('toggle-review').getAttribute('aria-pressed')) !== 'true') await tomasz.getByTestId('toggle-review').click();
    await tomasz.getByRole('tab', { name: 'Approvals' }).click();
    const entries = tomasz.getByTestId('review-history-entry');
    await expect.poll(() => entries.count()).toBe(2);
    expect(await entries.nth(0).textContent()).toContain(`Approved · revision ${approved + 1} · Tomasz Reyes`);
    expect(await entries.nth(1).textContent()).toContain(`Approved · revision ${approved} · Tomasz Reyes`);
    expect(await entries.nth(1).textContent()).toContain('“Root loads match the hand integration.”');
    await screenshot(tomasz, 'review-approvals-tab');
    await tomasz.getByTestId('toggle-review').click();

    await ines.reload();
    await expect.poll(() => ines.getByTestId(`review-status-${sketchId}`).textContent()).toBe('Approved');
    expect(reviewer.foreignRequests).toEqual([]);
    expect(editor.foreignRequests).toEqual([]);
  });

  it('a viewer reads pins, threads, snapshots and the status but cannot place, answer, save or restore', async () => {
    const { page } = editor;
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByTestId('sign-in-email').waitFor();
    await signInDemo(page, itemAt(DEMO_PEOPLE, 3).email, server.url);
    await page.getByTestId(`open-${sketchId}`).click();
    await page.getByTestId('sketch-canvas').waitFor();
    expect(await text(page, 'review-status')).toBe('Approved');
    await page.getByTestId('toggle-review').click();
    await page.getByTestId('review-pins').waitFor();
    expect(await page.getByTestId('place-pin').count()).toBe(0);
    await page.getByTestId('pin-filter').getByText('All').click();
    await page.locator('[data-testid^="pin-item-"]').first().click();
    await page.getByTestId('pin-thread-readonly').waitFor();
    expect(await page.getByTestId('pin-reply').count()).toBe(2);
    expect(await page.getByTestId('pin-reply-box').count()).toBe(0);
    expect(await page.getByTestId('pin-reopen').count()).toBe(0);
    await page.getByRole('tab', { name: 'Snapshots' }).click();
    await expect.poll(() => page.locator('[data-testid^="snapshot-snap_"]').count()).toBeGreaterThan(2);
    expect(await page.getByTestId('snapshot-form').count()).toBe(0);
    expect(await page.locator('[data-testid^="restore-"]').count()).toBe(0);
    expect(await page.locator('[data-testid^="pick-a-"]').count()).toBeGreaterThan(0);
    expect(editor.foreignRequests).toEqual([]);
  });

  it('[A7] the owner’s reset asks first and says which approval it withdraws: Keep the review keeps it, Reset to draft resets it', async () => {
    const ines = reviewer.page;
    const stored = async () => (await database.db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) }))!;
    await ines.getByTestId(`open-${sketchId}`).click();
    await ines.getByTestId('sketch-canvas').waitFor();
    await expect.poll(() => ines.getByTestId('review-status').textContent()).toBe('Approved');
    const revision = Number((await text(ines, 'review-approval'))?.slice(1));
    expect(revision).toBeGreaterThan(0);

    await ines.getByTestId('review-decide').click();
    await ines.getByTestId('review-reset').click();
    const lost = ines.getByTestId('review-reset-lost');
    await lost.waitFor();
    expect(await lost.textContent()).toMatch(new RegExp(`^The approval of revision ${revision} by Tomasz Reyes \\(.+\\) is withdrawn: the sketch stops reading as approved`));
    await screenshot(ines, 'review-reset-confirm');

    // Keep the review: nothing is sent, the approval stands on screen and in the database.
    await ines.getByTestId('review-reset-cancel').click();
    await lost.waitFor({ state: 'hidden' });
    expect(await text(ines, 'review-status')).toBe('Approved');
    expect(await stored()).toMatchObject({ reviewStatus: 'approved' });
    expect((await stored()).approvalId).not.toBeNull();

    // Reset to draft: the header and the database follow; the caution stays with the results.
    await ines.getByTestId('review-decide').click();
    await ines.getByTestId('review-reset').click();
    await ines.getByTestId('review-reset-confirm').click();
    await expect.poll(() => ines.getByTestId('review-status').textContent()).toBe('Draft');
    await lost.waitFor({ state: 'hidden' });
    expect(await stored()).toMatchObject({ reviewStatus: 'draft', approvalId: null });
    expect(await ines.getByTestId('results-caution').first().textContent()).toBe(RESULTS_CAUTION);
    await screenshot(ines, 'review-reset-done');
    expect(reviewer.foreignRequests).toEqual([]);
  });
});
