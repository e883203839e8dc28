import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunningServer } from '../../server/index.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, type BrowserSession } from '../helpers/browser.ts';
import { mailMessages } from '../../server/db/schema.ts';
import { firstItems } from '../../shared/util/invariant.ts';

describe('accounts in Chromium: sign up, confirm, invite, read the mail, accept in a second browser', () => {
  let server: RunningServer;
  let founder: BrowserSession;
  let colleague: BrowserSession;

  let world: BrowserWorld;

  beforeAll(async () => {
    // Mara runs this development server: she is its mailbox operator (everyone else reads only their own mail).
    world = await startBrowserWorld({ seed: false, mail: true, browsers: 2, env: { MAILBOX_OPERATOR: 'mara@keelworks.example' } });
    ({ server } = world);
    [founder, colleague] = firstItems(world.browsers, 2);
  });
  afterAll(async () => world?.close());

  it('signs up, is asked to check the inbox, follows the mailed link and lands on the new team as its owner', async () => {
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
    await page.getByTestId('sign-up-sent').waitFor();
    expect(await page.getByTestId('sign-up-sent').textContent()).toContain('mara@keelworks.example');
    await screenshot(page, 'accounts-sign-up-sent');
    // She reads the confirmation in her own mail client (here: straight from the sink's table).
    let link: string | undefined;
    await expect
      .poll(async () => {
        const rows = await world.database.db.select().from(mailMessages);
        link = rows.find((m) => m.toAddresses.includes('mara@keelworks.example'))?.textBody.match(/https?:\/\/\S+\/confirm-sign-up\?token=\S+/)?.[0];
        return link;
      }, { timeout: 15_000 })
      .toBeDefined();
    await page.goto(link!);
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

  it('reads the invitation in the dev mailbox (as its operator) and accepts it in a second browser', async () => {
    const { page } = founder;
    await page.getByTestId('nav-mailbox').click();
    // Her own inbox first: her confirmation, not other people's mail.
    await page.getByTestId('mailbox-table').getByText('Confirm your address to finish signing up to Shockwright').waitFor();
    expect(await page.getByTestId('mailbox-table').getByText('invited you to').count()).toBe(0);
    await page.getByTestId('mailbox-scope').getByText('Every message').click();
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

    // Ravi is no operator: his inbox holds his invitation and nothing of Mara's.
    await other.getByTestId('nav-mailbox').click();
    await other.getByTestId('mailbox-table').getByText('Mara Keel invited you to Keelworks fin group on Shockwright').waitFor();
    expect(await other.getByTestId('mailbox-table').getByText('Confirm your address').count()).toBe(0);
    expect(await other.getByTestId('mailbox-scope').count()).toBe(0);
    await screenshot(other, 'accounts-personal-inbox');

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
