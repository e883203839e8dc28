import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, eq, isNotNull } from 'drizzle-orm';
import { createApp } from '../../server/app.ts';
import { auditEvents, invitations, mailMessages, passwordResets, users } from '../../server/db/schema.ts';
import { hashToken } from '../../server/auth/tokens.ts';
import { DEVICE_COOKIE } from '../../server/http/rateLimit.ts';
import { EnvError } from '../../server/env.ts';
import { newId } from '../../shared/model/ids.ts';
import { testEnv } from '../helpers/app.ts';
import { CSRF, PASSWORD, createWorld, linkIn, sessionCookie, signIn, waitForMail, type World } from '../helpers/world.ts';

/** Signs up `email` and returns the confirmation token from the link mailed for this sign-up. */
async function pendingSignUp(world: World, email: string, from?: string): Promise<string> {
  const confirmations = async () => (await world.database.db.select().from(mailMessages)).filter((m) => m.toAddresses.includes(email) && /Confirm your address/.test(m.subject));
  const before = new Set((await confirmations()).map((m) => m.id));
  let req = request(world.app).post('/api/auth/sign-up').set(CSRF);
  if (from) req = req.set('X-Forwarded-For', from);
  const res = await req.send({ name: 'Race Person', email, password: 'a long password', teamName: 'Racing' });
  expect(res.status).toBe(202);
  let mail: Awaited<ReturnType<typeof confirmations>>[number] | undefined;
  await expect.poll(async () => (mail = (await confirmations()).find((m) => !before.has(m.id))), { timeout: 10_000 }).toBeDefined();
  return linkIn(mail!.textBody, '/confirm-sign-up?token=').searchParams.get('token')!;
}

describe('sign-up races and limits', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ limits: { signUps: 3 }, env: { TRUST_PROXY: 'true' } });
  });
  afterAll(async () => world?.close());

  it('two sign-ups for one address confirmed at the same moment: one account, the other a 409 naming the field', async () => {
    const first = await pendingSignUp(world, 'twice@example.test', '203.0.113.1');
    const second = await pendingSignUp(world, 'twice@example.test', '203.0.113.1');
    const confirm = (token: string) => request(world.app).post('/api/auth/sign-up/confirm').set(CSRF).send({ token });
    const [a, b] = await Promise.all([confirm(first), confirm(second)]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const loser = a.status === 409 ? a : b;
    expect(loser.body.error).toEqual({ code: 'email_taken', message: expect.stringMatching(/^email: an account with this address already exists/) });
    expect(await world.database.db.select().from(users).where(eq(users.email, 'twice@example.test'))).toHaveLength(1);
  });

  it('sign-ups are limited per address (429 with a retry time); another address is not affected', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) {
      statuses.push((await request(world.app).post('/api/auth/sign-up').set(CSRF).set('X-Forwarded-For', '198.51.100.7').send({ name: 'S', email: `s${i}@example.test`, password: 'a long password', teamName: 'T' })).status);
    }
    expect(statuses).toEqual([202, 202, 202, 429]);
    const other = await request(world.app).post('/api/auth/sign-up').set(CSRF).set('X-Forwarded-For', '198.51.100.8').send({ name: 'S', email: 's9@example.test', password: 'a long password', teamName: 'T' });
    expect(other.status).toBe(202);
  });

  it('two newcomers accepting invitations for one address at once: one account, the other a 409 naming the field, never a 500', async () => {
    const owner = (await signIn(world, 'owner'))!;
    const outsider = (await signIn(world, 'outsider'))!;
    const links = [];
    for (const [cookie, team] of [
      [owner, world.teamId],
      [outsider, world.outsiderTeamId],
    ] as const) {
      expect((await request(world.app).post(`/api/teams/${team}/invitations`).set(CSRF).set('Cookie', cookie).send({ email: 'both@example.test', role: 'viewer' })).status).toBe(201);
    }
    const mails = (await world.database.db.select().from(mailMessages)).filter((m) => m.toAddresses.includes('both@example.test'));
    for (const m of mails) links.push(linkIn(m.textBody, '/invitations/accept?'));
    expect(links).toHaveLength(2);
    const answers = await Promise.all(
      links.map((l) => request(world.app).post('/api/auth/invitations/accept').set(CSRF).send({ teamId: l.searchParams.get('team'), token: l.searchParams.get('token'), name: 'Both', password: 'a long password' })),
    );
    expect(answers.map((r) => r.status).sort()).toEqual([200, 409]);
    expect(answers.find((r) => r.status === 409)!.body.error.message).toMatch(/^email: /);
    expect(await world.database.db.select().from(users).where(eq(users.email, 'both@example.test'))).toHaveLength(1);
  });

  it('a refused acceptance writes nothing: no account is left behind', async () => {
    const owner = (await signIn(world, 'owner'))!;
    await request(world.app).post(`/api/teams/${world.teamId}/invitations`).set(CSRF).set('Cookie', owner).send({ email: 'gone@example.test', role: 'viewer' });
    const link = linkIn((await waitForMail(world, 'gone@example.test', /invited you/)).textBody, '/invitations/accept?');
    await world.database.db.update(invitations).set({ revokedAt: new Date() }).where(eq(invitations.email, 'gone@example.test'));
    const res = await request(world.app).post('/api/auth/invitations/accept').set(CSRF).send({ teamId: link.searchParams.get('team'), token: link.searchParams.get('token'), name: 'Gone', password: 'a long password' });
    expect(res.status).toBe(410);
    expect(await world.database.db.select().from(users).where(eq(users.email, 'gone@example.test'))).toEqual([]);
  });
});

describe('sign-in limits stop attackers without locking out the person', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ limits: { signInFailures: 3, signInFailuresPerAddress: 6 }, env: { TRUST_PROXY: 'true' } });
  });
  afterAll(async () => world?.close());

  const attempt = (email: string, password: string, from: string, cookie?: string) => {
    let req = request(world.app).post('/api/auth/sign-in').set(CSRF).set('X-Forwarded-For', from);
    if (cookie) req = req.set('Cookie', cookie);
    return req.send({ email, password });
  };

  it('the right password from a browser that signed in before still works after someone else’s failures from the same address', async () => {
    const email = world.users.editor.email;
    const ok = await attempt(email, PASSWORD, '192.0.2.10');
    expect(ok.status).toBe(200);
    const device = ([] as string[]).concat(ok.headers['set-cookie'] ?? []).find((c) => c.startsWith(`${DEVICE_COOKIE}=`))?.replace(/;.*$/s, '');
    expect(device).toBeTruthy();
    // Someone else at the same address (an office behind one NAT) hammers the account.
    for (let i = 0; i < 3; i++) expect((await attempt(email, `wrong ${i}`, '192.0.2.10')).status).toBe(401);
    expect((await attempt(email, PASSWORD, '192.0.2.10')).status).toBe(429);
    // The person's own browser is not locked out.
    expect((await attempt(email, PASSWORD, '192.0.2.10', device)).status).toBe(200);
    // …nor is the account from another address.
    expect((await attempt(email, PASSWORD, '192.0.2.99')).status).toBe(200);
  });

  it('a device cookie is bound to its account: it neither helps with another account nor can be made up', async () => {
    const ok = await attempt(world.users.reviewer.email, PASSWORD, '192.0.2.20');
    const device = ([] as string[]).concat(ok.headers['set-cookie'] ?? []).find((c) => c.startsWith(`${DEVICE_COOKIE}=`))?.replace(/;.*$/s, '');
    const target = world.users.viewer.email;
    for (let i = 0; i < 3; i++) expect((await attempt(target, `wrong ${i}`, '192.0.2.20', device)).status).toBe(401);
    expect((await attempt(target, PASSWORD, '192.0.2.20', device)).status).toBe(429);
    expect((await attempt(target, PASSWORD, '192.0.2.20', `${DEVICE_COOKIE}=${'A'.repeat(22)}.forged`)).status).toBe(429);
  });

  it('one address is limited over all accounts too (credential stuffing)', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) statuses.push((await attempt(`nobody${i}@example.test`, 'guess', '192.0.2.30')).status);
    expect(statuses.slice(0, 6).every((s) => s === 401)).toBe(true);
    expect(statuses[6]).toBe(429);
  });
});

describe('the proxy header is trusted only as configured', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ limits: { signInFailures: 3 } });
  });
  afterAll(async () => world?.close());

  it('without TRUST_PROXY, X-Forwarded-For changes nothing: rotating it does not escape the limit', async () => {
    const email = world.users.owner.email;
    for (let i = 0; i < 3; i++) {
      expect((await request(world.app).post('/api/auth/sign-in').set(CSRF).set('X-Forwarded-For', `203.0.113.${i}`).send({ email, password: 'wrong' })).status).toBe(401);
    }
    const rotated = await request(world.app).post('/api/auth/sign-in').set(CSRF).set('X-Forwarded-For', '203.0.113.200').send({ email, password: 'wrong' });
    expect(rotated.status).toBe(429);
  });

  it('TRUST_PROXY accepts true, false, a count or proxy addresses, and refuses anything else in one line', () => {
    expect(testEnv('postgres://x/y', { TRUST_PROXY: '127.0.0.1, 10.0.0.0/8' }).TRUST_PROXY).toEqual(['127.0.0.1', '10.0.0.0/8']);
    expect(testEnv('postgres://x/y', { TRUST_PROXY: '2' }).TRUST_PROXY).toBe(2);
    expect(testEnv('postgres://x/y', { TRUST_PROXY: 'true' }).TRUST_PROXY).toBe(1);
    expect(testEnv('postgres://x/y', {}).TRUST_PROXY).toBe(false);
    expect(() => testEnv('postgres://x/y', { TRUST_PROXY: 'not an address' })).toThrow(EnvError);
  });

  it('a proxy not named in TRUST_PROXY is not believed (listed address elsewhere)', async () => {
    const built = createApp({ env: testEnv(world.database.url, { TRUST_PROXY: '10.9.9.9' }), database: world.database, log: () => {} });
    const https = await request(built.app).get('/api/health').set('X-Forwarded-Proto', 'https');
    built.close();
    expect(https.headers['strict-transport-security']).toBeUndefined();
  });
});

describe('password reset: a valid link always confirms', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ limits: { resets: 2 } });
  });
  afterAll(async () => world?.close());

  it('confirms after the address used up its reset requests and after failed confirmations', async () => {
    const token = `valid-reset-token-${newId('op')}`;
    await world.database.db.insert(passwordResets).values({ id: newId('reset'), userId: world.users.viewer.id, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + 60_000) });
    for (let i = 0; i < 3; i++) await request(world.app).post('/api/auth/password-reset').set(CSRF).send({ email: `someone${i}@example.test` });
    expect((await request(world.app).post('/api/auth/password-reset').set(CSRF).send({ email: world.users.viewer.email })).status).toBe(429);
    for (let i = 0; i < 12; i++) {
      expect((await request(world.app).post('/api/auth/password-reset/confirm').set(CSRF).send({ token: `guess-${i}-${'x'.repeat(30)}`, password: 'a long password' })).status).toBe(400);
    }
    const res = await request(world.app).post('/api/auth/password-reset/confirm').set(CSRF).send({ token, password: 'a fresh password' });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(world.users.viewer.email);
  });
});

describe('the development mailbox is not a skeleton key', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ env: { MAILBOX_OPERATOR: 'Reviewer@Example.test' } });
    const put = (to: string, subject: string) => world.database.db.insert(mailMessages).values({ id: newId('mail'), fromAddress: 'no-reply@shockwright.test', toAddresses: [to], subject, textBody: `link for ${to}`, raw: '' });
    await put(world.users.editor.email, 'Reset your Shockwright password');
    await put(world.users.owner.email, 'Someone mentioned you');
    await put('stranger@example.test', 'Join a team');
  });
  afterAll(async () => world?.close());

  it('each person reads only mail addressed to them — an owner included', async () => {
    const owner = (await signIn(world, 'owner'))!;
    const list = await request(world.app).get('/api/dev/mailbox').set('Cookie', owner);
    expect(list.status).toBe(200);
    expect(list.body.items.map((m: { subject: string }) => m.subject)).toEqual(['Someone mentioned you']);
    expect(list.body.total).toBe(1);
    const theirs = (await world.database.db.select().from(mailMessages)).find((m) => m.toAddresses.includes(world.users.editor.email))!;
    const peek = await request(world.app).get(`/api/dev/mailbox/${theirs.id}`).set('Cookie', owner);
    expect(peek.status).toBe(404);
    expect(JSON.stringify(peek.body)).not.toContain('link for');
    const all = await request(world.app).get('/api/dev/mailbox?scope=all').set('Cookie', owner);
    expect(all.status).toBe(403);
    expect(all.body.error.message).toMatch(/MAILBOX_OPERATOR/);
    const editor = (await signIn(world, 'editor'))!;
    expect((await request(world.app).get(`/api/dev/mailbox/${theirs.id}`).set('Cookie', editor)).body.text).toBe(`link for ${world.users.editor.email}`);
  });

  it('the configured operator may read every message; `me` says so', async () => {
    const reviewer = (await signIn(world, 'reviewer'))!;
    const me = await request(world.app).get('/api/auth/me').set('Cookie', reviewer);
    expect(me.body).toMatchObject({ devMailbox: true, mailboxOperator: true });
    const all = await request(world.app).get('/api/dev/mailbox?scope=all').set('Cookie', reviewer);
    expect(all.status).toBe(200);
    expect(all.body.total).toBe(3);
  });

  it('does not exist in production, and an operator setting there refuses to start', async () => {
    const built = createApp({ env: testEnv(world.database.url, { NODE_ENV: 'production' }), database: world.database, log: () => {} });
    const cookie = sessionCookie((await request(built.app).post('/api/auth/sign-in').set(CSRF).send({ email: world.users.owner.email, password: PASSWORD })).headers['set-cookie']);
    const res = await request(built.app).get('/api/dev/mailbox').set('Cookie', cookie);
    built.close();
    expect(res.status).toBe(404);
    expect(() => testEnv(world.database.url, { NODE_ENV: 'production', MAILBOX_OPERATOR: 'a@b.test' })).toThrow(/MAILBOX_OPERATOR is for development only/);
  });
});

describe('a removed or demoted owner’s pending invitations are withdrawn with them', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld();
  });
  afterAll(async () => world?.close());

  it('removal and demotion both revoke what they sent; the audit trail says why; the links stop working', async () => {
    const owner = (await signIn(world, 'owner'))!;
    const { editor, reviewer } = world.users;
    for (const u of [editor, reviewer]) {
      expect((await request(world.app).patch(`/api/teams/${world.teamId}/members/${u.id}`).set(CSRF).set('Cookie', owner).send({ role: 'owner' })).status).toBe(200);
    }
    const asEditor = (await signIn(world, 'editor'))!;
    const asReviewer = (await signIn(world, 'reviewer'))!;
    await request(world.app).post(`/api/teams/${world.teamId}/invitations`).set(CSRF).set('Cookie', asEditor).send({ email: 'from-editor@example.test', role: 'viewer' });
    await request(world.app).post(`/api/teams/${world.teamId}/invitations`).set(CSRF).set('Cookie', asReviewer).send({ email: 'from-reviewer@example.test', role: 'viewer' });
    await request(world.app).post(`/api/teams/${world.teamId}/invitations`).set(CSRF).set('Cookie', owner).send({ email: 'from-owner@example.test', role: 'viewer' });
    const link = linkIn((await waitForMail(world, 'from-editor@example.test', /invited you/)).textBody, '/invitations/accept?');

    expect((await request(world.app).delete(`/api/teams/${world.teamId}/members/${editor.id}`).set(CSRF).set('Cookie', owner)).status).toBe(204);
    expect((await request(world.app).patch(`/api/teams/${world.teamId}/members/${reviewer.id}`).set(CSRF).set('Cookie', owner).send({ role: 'reviewer' })).status).toBe(200);

    const pending = await request(world.app).get(`/api/teams/${world.teamId}/invitations`).set('Cookie', owner);
    expect(pending.body.map((p: { email: string }) => p.email)).toEqual(['from-owner@example.test']);
    const revoked = await world.database.db.select().from(invitations).where(and(eq(invitations.teamId, world.teamId), isNotNull(invitations.revokedAt)));
    expect(revoked.map((r) => r.email).sort()).toEqual(['from-editor@example.test', 'from-reviewer@example.test']);
    const audit = await world.database.db.select().from(auditEvents).where(eq(auditEvents.action, 'invitation.revoked'));
    expect(audit.map((a) => (a.detail as { reason?: string }).reason).sort()).toEqual(['its sender is no longer an owner', 'its sender left the team']);
    const accept = await request(world.app).post('/api/auth/invitations/preview').set(CSRF).send({ teamId: link.searchParams.get('team'), token: link.searchParams.get('token') });
    expect(accept.status).toBe(410);
    expect(accept.body.error.code).toBe('invitation_revoked');
  });
});

describe('answers and headers', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ env: { TRUST_PROXY: 'true' } });
  });
  afterAll(async () => world?.close());

  it('signed-in API answers carry Cache-Control: private, no-store', async () => {
    const cookie = (await signIn(world, 'viewer'))!;
    for (const path of ['/api/auth/me', `/api/teams/${world.teamId}/members`, `/api/teams/${world.teamId}/sketches`, '/api/preferences']) {
      const res = await request(world.app).get(path).set('Cookie', cookie);
      expect(res.status, path).toBe(200);
      expect(res.headers['cache-control'], path).toBe('private, no-store');
    }
  });

  it('HSTS only over TLS (here: https reported by the trusted proxy)', async () => {
    const plain = await request(world.app).get('/api/health');
    expect(plain.headers['strict-transport-security']).toBeUndefined();
    const tls = await request(world.app).get('/api/health').set('X-Forwarded-Proto', 'https');
    expect(tls.headers['strict-transport-security']).toMatch(/max-age=\d+/);
  });
});
