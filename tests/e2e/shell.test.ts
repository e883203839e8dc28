import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RunningServer } from '../../server/index.ts';
import { DEMO_PASSWORD, DEMO_PEOPLE, DEMO_TEAM } from '../../server/db/seed.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, type BrowserSession } from '../helpers/browser.ts';
import { firstItem } from '../../shared/util/invariant.ts';

describe('app shell in Chromium', () => {
  let server: RunningServer;
  let browser: BrowserSession;

  let world: BrowserWorld;

  beforeAll(async () => {
    world = await startBrowserWorld();
    ({ server } = world);
    browser = firstItem(world.browsers);
  });
  afterAll(async () => world?.close());

  it('sends a signed-out visitor to sign-in, renders in Work Sans, and fetches nothing from outside', async () => {
    const { page } = browser;
    await page.goto(`${server.url}/`);
    await page.getByTestId('sign-in-email').waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await expect.poll(() => page.evaluate(() => document.fonts.check('16px "Work Sans"'))).toBe(true);
    const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(family).toContain('Work Sans');
    const loadedFonts = await page.evaluate(() => [...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family));
    expect(loadedFonts.some((f) => f.includes('Work Sans'))).toBe(true);
    await screenshot(page, 'shell-sign-in');
    expect(browser.foreignRequests).toEqual([]);
  });

  it('rejects a wrong password with a message, then signs the demo owner in', async () => {
    const { page } = browser;
    const owner = DEMO_PEOPLE[0];
    await page.getByTestId('sign-in-email').fill(owner.email);
    await page.getByTestId('sign-in-password').fill('not-the-password');
    await page.getByTestId('sign-in-submit').click();
    await expect.poll(() => page.getByTestId('sign-in-error').textContent()).toContain('do not match');
    await page.getByTestId('sign-in-password').fill(DEMO_PASSWORD);
    await page.getByTestId('sign-in-submit').click();
    await page.getByTestId('header-user').waitFor();
    expect(await page.getByTestId('header-user').textContent()).toBe(owner.name);
    expect(await page.getByTestId('home-team').textContent()).toBe(DEMO_TEAM);
    await screenshot(page, 'shell-home');
  });

  it('shows the not-found view for an unknown address', async () => {
    const { page } = browser;
    await page.goto(`${server.url}/no/such/page`);
    await page.getByTestId('not-found').waitFor();
    expect(await page.getByTestId('not-found').textContent()).toContain('Nothing here');
    expect(browser.foreignRequests).toEqual([]);
  });
});
