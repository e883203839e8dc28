import { mkdtempSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const ARTIFACTS_DIR = path.resolve(import.meta.dirname, '../e2e/artifacts');

const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Every request the page made to a host other than the app's (must stay empty). */
  foreignRequests: string[];
  consoleErrors: string[];
  close(): Promise<void>;
}

/**
 * Debian's Chromium through playwright-core with a fresh profile folder. Requests to any host
 * but `allowedOrigin` are recorded and aborted, so a test can prove nothing leaves the machine.
 */
export async function openBrowser(allowedOrigin: string): Promise<BrowserSession> {
  const profile = mkdtempSync(path.join(tmpdir(), 'sw-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: CHROMIUM_ARGS,
    viewport: { width: 1400, height: 880 },
    acceptDownloads: true,
  });
  await context.addInitScript('globalThis.__name = (f) => f');
  const foreignRequests: string[] = [];
  const consoleErrors: string[] = [];
  await context.route('**/*', (route) => {
    const url = route.request().url();
    if (url.startsWith(allowedOrigin) || url.startsWith('data:') || url.startsWith('blob:')) return route.continue();
    foreignRequests.push(url);
    return route.abort();
  });
  const page = context.pages()[0] ?? (await context.newPage());
  page.on('console', (msg) => {
    if (msg.type() === 'error') consoleErrors.push(msg.text());
  });
  return {
    context,
    page,
    foreignRequests,
    consoleErrors,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Saves a full-page screenshot under tests/e2e/artifacts (git-ignored) for a human to look at. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(ARTIFACTS_DIR, { recursive: true });
  const file = path.join(ARTIFACTS_DIR, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}
