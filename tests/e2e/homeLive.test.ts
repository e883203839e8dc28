/**
 * The home table, live [T1]–[T5] (server/realtime/README.md), in two browsers: Ines (owner) and
 * Oren (viewer) have the sketches table open while the team works — a sketch is created,
 * renamed, its review status changes, it is deleted — and both tables follow without a reload.
 * Then Ines removes Oren from the team: his open table loses the team's rows at once and says
 * why; invited again and accepting in another tab, his open page shows the team again.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../server/db/seed.ts';
import { mailMessages } from '../../server/db/schema.ts';
import type { RunningServer } from '../../server/index.ts';
import type { TestDatabase } from '../helpers/database.ts';
import { startBrowserWorld, type BrowserWorld } from '../helpers/browserWorld.ts';
import { screenshot, signInDemo, type BrowserSession } from '../helpers/browser.ts';
import { signInCookie } from '../helpers/simClient.ts';
import { linkIn } from '../helpers/world.ts';
import { firstItems } from '../../shared/util/invariant.ts';

const [INES, TOMASZ, PRIYA, OREN] = firstItems(DEMO_PEOPLE, 4);

describe('the sketches table follows the team live, in two browsers', () => {
  let world: BrowserWorld;
  let database: TestDatabase;
  let server: RunningServer;
  let ines: BrowserSession;
  let oren: BrowserSession;
  const cookies: Record<string, string> = {};
  let teamId = '';

  async function call(who: string, method: string, path: string, body?: unknown) {
    const res = await fetch(`${server.url}${path}`, { method, headers: { 'x-shockwright-request': '1', 'content-type': 'application/json', cookie: cookies[who]! }, body: body === undefined ? undefined : JSON.stringify(body) });
    const text = await res.text();
    return { status: res.status, body: text ? JSON.parse(text) : null };
  }
  const rows = (s: BrowserSession) => s.page.locator('[data-testid^="sketch-row-"]');

  beforeAll(async () => {
    world = await startBrowserWorld({ mail: true, browsers: 2 });
    ({ database, server } = world);
    [ines, oren] = firstItems(world.browsers, 2);
    for (const p of [INES, TOMASZ, PRIYA, OREN]) cookies[p.email] = await signInCookie(server.url, p.email, DEMO_PASSWORD);
    teamId = (await call(INES.email, 'GET', '/api/auth/me')).body.teams[0].teamId;
    await signInDemo(ines.page, INES.email, server.url);
    await signInDemo(oren.page, OREN.email, server.url);
  });
  afterAll(async () => world?.close());

  it('[T2] created, renamed, review status, deleted: both open tables follow without a reload', async () => {
    for (const s of [ines, oren]) {
      await s.page.getByTestId('home-live').waitFor();
      await rows(s).first().waitFor();
    }
    const before = await rows(oren).count();

    // Tomasz creates a sketch in another tab.
    const created = await call(TOMASZ.email, 'POST', `/api/teams/${teamId}/sketches`, { title: 'Tern canard, study A' });
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    for (const s of [ines, oren]) await s.page.getByTestId(`sketch-row-${id}`).waitFor();
    expect(await rows(oren).count()).toBe(before + 1);

    // Ines renames it in her table; Oren's row follows.
    await ines.page.getByTestId(`sketch-row-${id}`).locator('[data-testid^="rename-"]').click();
    await ines.page.getByTestId('rename-title').fill('Tern canard, study B');
    await ines.page.getByTestId('rename-confirm').click();
    await expect.poll(() => oren.page.getByTestId(`sketch-row-${id}`).textContent()).toContain('Tern canard, study B');

    // Priya asks for changes: the review column follows in both.
    const revision = (await call(PRIYA.email, 'GET', `/api/sketches/${id}`)).body.revision;
    expect((await call(PRIYA.email, 'POST', `/api/sketches/${id}/change-requests`, { revision, note: 'Move the hinge aft.' })).status).toBe(200);
    for (const s of [ines, oren]) await expect.poll(() => s.page.getByTestId(`review-status-${id}`).textContent()).toBe('Changes requested');
    await screenshot(oren.page, 'home-live-followed');

    // Ines deletes it; it leaves Oren's table.
    await ines.page.getByTestId(`sketch-row-${id}`).locator('[data-testid^="delete-"]').click();
    await ines.page.getByTestId('confirm-delete').click();
    await expect.poll(() => oren.page.getByTestId(`sketch-row-${id}`).count()).toBe(0);
    expect(await rows(oren).count()).toBe(before);
    expect(ines.foreignRequests).toEqual([]);
    expect(oren.foreignRequests).toEqual([]);
  });

  it('[T3][T5] removed while the table is open, Oren loses the team’s rows at once; invited again, his open page shows them again', async () => {
    expect(await rows(oren).count()).toBeGreaterThan(0);
    const orenId = (await call(OREN.email, 'GET', '/api/auth/me')).body.user.id as string;
    expect((await call(INES.email, 'DELETE', `/api/teams/${teamId}/members/${orenId}`)).status).toBe(204);
    await expect.poll(() => rows(oren).count()).toBe(0);
    await expect.poll(() => oren.page.getByTestId('home-feedback').textContent()).toContain('You are no longer a member of this team.');
    await screenshot(oren.page, 'home-live-removed');

    // Ines invites him again; he accepts in another tab (here: the API with his session).
    expect((await call(INES.email, 'POST', `/api/teams/${teamId}/invitations`, { email: OREN.email, role: 'viewer' })).status).toBe(201);
    let link: URL | null = null;
    await expect
      .poll(async () => {
        const mail = (await database.db.select().from(mailMessages)).find((m) => m.toAddresses.includes(OREN.email) && /invited you/.test(m.subject + m.textBody));
        link = mail ? linkIn(mail.textBody, '/invitations/accept?') : null;
        return link !== null;
      })
      .toBe(true);
    const accept = await call(OREN.email, 'POST', '/api/auth/invitations/accept', { teamId: link!.searchParams.get('team'), token: link!.searchParams.get('token') });
    expect(accept.status).toBe(200);
    await expect.poll(() => rows(oren).count()).toBeGreaterThan(0);
    await oren.page.getByTestId('home-live').waitFor();
    await expect.poll(() => oren.page.getByTestId('home-feedback').textContent()).toMatch(/^You are now a member of /);
    const teamName = (await call(INES.email, 'GET', '/api/auth/me')).body.teams[0].teamName as string;
    expect(await oren.page.getByTestId('home-team').textContent()).toBe(teamName);
    await screenshot(oren.page, 'home-live-back');
    expect(oren.foreignRequests).toEqual([]);
  });
});
