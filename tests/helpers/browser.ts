import { mkdtempSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { DEMO_PASSWORD } from '../../server/db/seed.ts';

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

/**
 * Saves a full-page screenshot under tests/e2e/artifacts (git-ignored) for a human to look at,
 * with CSS transitions finished (menus settled) and the last change painted.
 */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(ARTIFACTS_DIR, { recursive: true });
  // Two animation frames: whatever was drawn on the last state change (an ECharts canvas, say) is on screen.
  await page.evaluate(() => new Promise<void>((resolve) => requestAnimationFrame(() => requestAnimationFrame(() => resolve()))));
  const file = path.join(ARTIFACTS_DIR, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true, animations: 'disabled' });
  return file;
}

/** Signs a demo person in through the sign-in page and waits for the sketches table. */
export async function signInDemo(page: Page, email: string, baseUrl: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByTestId('sign-in-email').fill(email);
  await page.getByTestId('sign-in-password').fill(DEMO_PASSWORD);
  await page.getByTestId('sign-in-submit').click();
  await page.getByTestId('sketch-table').waitFor();
}

/** Page position of a point in body axes, from the canvas's `data-view` attribute. */
export async function worldOnScreen(page: Page, p: readonly [number, number]): Promise<{ x: number; y: number }> {
  const canvas = page.getByTestId('sketch-canvas');
  const box = (await canvas.boundingBox())!;
  const [scale, originX, originY, exaggeration = 1] = (await canvas.getAttribute('data-view'))!.split(' ').map(Number);
  if (scale === undefined || originX === undefined || originY === undefined) throw new Error('the canvas has no data-view (scale originX originY)');
  return { x: box.x + p[0] * scale + originX, y: box.y - p[1] * scale * exaggeration + originY };
}

/** Page position of vertex `i`, read from the vertex table. */
export async function vertexOnScreen(page: Page, i: number): Promise<{ x: number; y: number }> {
  const vx = Number(await page.getByTestId(`vertex-x-${i}`).inputValue());
  const vy = Number(await page.getByTestId(`vertex-y-${i}`).inputValue());
  return worldOnScreen(page, [vx, vy]);
}

/** Text content of the element with test id `id`. */
export const textOf = (page: Page, id: string) => page.getByTestId(id).textContent();
