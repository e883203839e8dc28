import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunningServer } from '../../server/index.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, type BrowserSession } from '../helpers/browser.ts';

describe('accounts in Chromium: sign up, invite, read the mail, accept in a second browser', () => {
  let server: RunningServer;
  let founder: BrowserSession;
  let colleague: BrowserSession;

  let world: BrowserWorld;

  beforeAll(async () => {
    world = await startBrowserWorld({ seed: false, mail: true, browsers: 2 });
    ({ server } = world);
    [founder, colleague] = world.browsers;
  });
  afterAll(async () => world?.close());

  it('signs up and lands on the new team as its owner', async () => {
    const { page } = founder;
    await page.goto(`${server.url}/sign-in`);
    await page.getByTestId('to-sign-up').click();
    await page.getByTestId('sign-up-name').fill('Mara Keel');
    await page.getByTestId('sign-up-email').fill('mara@keelworks.example');
    await page.getByTestId('sign-up-password').fill('short');
    await page.getByTestId('sign-up-submit').click();
    // Inline validation before anything is sent.
    await page.getByText('At least 10 characters').waitFor();
    await page.getByTestId('sign-up-password').fill('keelworks-2026');
    await page.getByTestId('sign-up-confirm').fill('keelworks-2026');
    await page.getByTestId('sign-up-team').fill('Keelworks fin group');
    await page.getByTestId('sign-up-submit').click();
    await page.getByTestId('header-user').waitFor();
    expect(await page.getByTestId('header-user').textContent()).toBe('Mara Keel');
    expect(await page.getByTestId('team-switcher').textContent()).toContain('Keelworks fin group');
  });

  it('invites a colleague from the members page', async () => {
    const { page } = founder;
    await page.getByTestId('nav-members').click();
    await page.getByTestId('invite-email').fill('ravi@keelworks.example');
    await page.getByTestId('invite-role').click();
    await page.locator('.ant-select-item-option[title="create and edit sketches"]').click();
    await page.getByTestId('invite-submit').click();
    await page.getByTestId('invitations-table').getByText('ravi@keelworks.example').waitFor();
    await page.getByTestId('audit-list').getByText('Mara Keel invited ravi@keelworks.example as editor.').waitFor();
    await screenshot(page, 'accounts-members');
  });

  it('reads the invitation in the dev mailbox and accepts it in a second browser', async () => {
    const { page } = founder;
    await page.getByTestId('nav-mailbox').click();
    await page.getByTestId('mailbox-table').getByText('Mara Keel invited you to Keelworks fin group on Shockwright').click();
    const link = page.getByTestId('mail-link').first();
    await link.waitFor();
    const href = await link.getAttribute('href');
    expect(href).toMatch(new RegExp(`^${server.url}/invitations/accept\\?team=team_\\w+&token=[\\w-]+$`));
    await screenshot(page, 'accounts-mailbox');

    const other = colleague.page;
    await other.goto(href!);
    await other.getByTestId('invite-summary').waitFor();
    expect(await other.getByTestId('invite-summary').textContent()).toMatch(/Mara Keel invited ravi@keelworks\.example to Keelworks fin group as editor/);
    await other.getByTestId('accept-name').fill('Ravi Osei');
    await other.getByTestId('accept-password').fill('ravi-password-1');
    await other.getByTestId('accept-confirm').fill('ravi-password-1');
    await screenshot(other, 'accounts-accept');
    await other.getByTestId('accept-submit').click();
    await other.getByTestId('header-user').waitFor();
    expect(await other.getByTestId('header-user').textContent()).toBe('Ravi Osei');
    expect(await other.getByTestId('team-switcher').textContent()).toContain('Keelworks fin group');

    // The editor is not an owner: the members page explains which role it needs.
    await other.goto(`${server.url}/team/members`);
    await other.getByTestId('forbidden').waitFor();
    expect(await other.getByTestId('forbidden').textContent()).toContain('need the owner role');

    // The same link does not work twice.
    await founder.page.goto(href!);
    await founder.page.getByTestId('invite-error').waitFor();
    expect(await founder.page.getByTestId('invite-error').textContent()).toContain('already been used');
    expect(founder.foreignRequests).toEqual([]);
    expect(colleague.foreignRequests).toEqual([]);
  });
});
