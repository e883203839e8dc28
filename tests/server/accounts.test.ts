import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { invitations, mailMessages, passwordResets, signUps } from '../../server/db/schema.ts';
import { RESET_REQUEST_ANSWER } from '../../server/api/auth/router.ts';
import { signUpAnswer } from '../../server/api/auth/service.ts';
import { CSRF, PASSWORD, createWorld, freshTeam, linkIn, sessionCookie, signIn, waitForMail, type World } from '../helpers/world.ts';

describe('sign-up, sign-in, sessions', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ limits: { signInFailures: 3 } });
  });
  afterAll(async () => world?.close());

  it('sign-up mails a link; following it makes the person the owner of a new team and signs them in (once)', async () => {
    const res = await request(world.app).post('/api/auth/sign-up').set(CSRF).send({ name: 'Ada Quill', email: 'Ada@Example.test', password: 'a long password', teamName: 'Quill Aero' });
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ message: signUpAnswer('ada@example.test') });
    expect(res.headers['set-cookie']).toBeUndefined();
    const mail = await waitForMail(world, 'ada@example.test', /Confirm your address/);
    const token = linkIn(mail.textBody, '/confirm-sign-up?token=').searchParams.get('token')!;
    const done = await request(world.app).post('/api/auth/sign-up/confirm').set(CSRF).send({ token });
    expect(done.status).toBe(201);
    expect(done.body.user.email).toBe('ada@example.test');
    expect(done.body.teams).toEqual([{ teamId: expect.stringMatching(/^team_/), teamName: 'Quill Aero', role: 'owner' }]);
    const me = await request(world.app).get('/api/auth/me').set('Cookie', sessionCookie(done.headers['set-cookie']));
    expect(me.body.user.name).toBe('Ada Quill');
    const again = await request(world.app).post('/api/auth/sign-up/confirm').set(CSRF).send({ token });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe('signup_used');
  });

  it('an address that has an account gets the same answer (no account discovery); its owner gets a notice instead, and nothing is created', async () => {
    const before = await world.database.db.select().from(signUps);
    const dup = await request(world.app).post('/api/auth/sign-up').set(CSRF).send({ name: 'X', email: world.users.reviewer.email, password: 'a long password', teamName: 'T' });
    const fresh = await request(world.app).post('/api/auth/sign-up').set(CSRF).send({ name: 'X', email: 'unused@example.test', password: 'a long password', teamName: 'T' });
    expect(dup.status).toBe(202);
    expect(fresh.status).toBe(202);
    expect(dup.body.message.replace(world.users.reviewer.email, 'ADDR')).toBe(fresh.body.message.replace('unused@example.test', 'ADDR'));
    const notice = await waitForMail(world, world.users.reviewer.email, /tried to sign up/);
    expect(notice.textBody).toContain('already has one');
    expect(notice.textBody).not.toMatch(/confirm-sign-up/);
    const after = await world.database.db.select().from(signUps);
    expect(after.map((r) => r.email).filter((e) => !before.some((b) => b.email === e))).toEqual(['unused@example.test']);
  });

  it('names bad fields (400)', async () => {
    const bad = await request(world.app).post('/api/auth/sign-up').set(CSRF).send({ name: '', email: 'not-an-address', password: 'short', teamName: 'T' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toContain('name: is required');
    expect(bad.body.error.message).toContain('email: must be an e-mail address');
    expect(bad.body.error.message).toContain('password: must be at least 10 characters');
  });

  it('session fixation: signing in issues a new session id and the old one stops working', async () => {
    const first = await signIn(world, 'editor');
    const again = await request(world.app).post('/api/auth/sign-in').set(CSRF).set('Cookie', first!).send({ email: world.users.editor.email, password: PASSWORD });
    expect(again.status).toBe(200);
    const second = sessionCookie(again.headers['set-cookie']);
    expect(second).not.toBe(first);
    expect((await request(world.app).get('/api/auth/me').set('Cookie', first!)).status).toBe(401);
    expect((await request(world.app).get('/api/auth/me').set('Cookie', second)).status).toBe(200);
  });

  it('the session cookie is HttpOnly and SameSite=Lax', async () => {
    const res = await request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email: world.users.viewer.email, password: PASSWORD });
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('sw.sid='))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('sign-out ends the session', async () => {
    const cookie = await signIn(world, 'reviewer');
    expect((await request(world.app).post('/api/auth/sign-out').set(CSRF).set('Cookie', cookie!)).status).toBe(204);
    expect((await request(world.app).get('/api/auth/me').set('Cookie', cookie!)).status).toBe(401);
  });

  it('CSRF: a state-changing request without our header, or from another origin, is refused', async () => {
    const cookie = await signIn(world, 'owner');
    const noHeader = await request(world.app).post('/api/teams').set('Cookie', cookie!).send({ name: 'Sneaky' });
    expect(noHeader.status).toBe(403);
    expect(noHeader.body.error.code).toBe('csrf');
    const foreign = await request(world.app).post('/api/teams').set(CSRF).set('Origin', 'https://evil.example').set('Cookie', cookie!).send({ name: 'Sneaky' });
    expect(foreign.status).toBe(403);
    expect(foreign.body.error.message).toContain('https://evil.example');
    const same = await request(world.app).post('/api/teams').set(CSRF).set('Host', 'app.test').set('Origin', 'http://app.test').set('Cookie', cookie!).send({ name: 'Fine' });
    expect(same.status).toBe(201);
  });

  it('brute force: after 3 failures the next attempt, even with the right password, gets 429 with a retry time', async () => {
    const email = world.users.viewer.email;
    for (let i = 0; i < 3; i++) {
      const res = await request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email, password: `wrong ${i}` });
      expect(res.status).toBe(401);
    }
    const locked = await request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email, password: PASSWORD });
    expect(locked.status).toBe(429);
    expect(locked.body.error.code).toBe('rate_limited');
    expect(locked.body.error.message).toMatch(/Try again in (1[0-5]|[1-9]) minutes?\./);
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0);
    expect(locked.body.error.details.retryAfterSeconds).toBeGreaterThan(0);
    // Another account from the same address is not locked.
    expect((await request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email: world.users.owner.email, password: PASSWORD })).status).toBe(200);
  });
});

describe('password reset through the SMTP sink', () => {
  let world: World;
  beforeAll(async () => {
    world = await createWorld({ limits: { resets: 6 } });
  });
  afterAll(async () => world?.close());

  it('gives the same answer for a known and an unknown address, and mails only the known one', async () => {
    const known = await request(world.app).post('/api/auth/password-reset').set(CSRF).send({ email: world.users.editor.email });
    const unknown = await request(world.app).post('/api/auth/password-reset').set(CSRF).send({ email: 'nobody@example.test' });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual(known.body);
    expect(known.body.message).toBe(RESET_REQUEST_ANSWER);
    await waitForMail(world, world.users.editor.email, /Reset your Shockwright password/);
    await world.mailer.idle(); // anything else the two requests sent is stored by now
    const toNobody = await world.database.db.select().from(mailMessages).where(eq(mailMessages.subject, 'Reset your Shockwright password'));
    expect(toNobody.flatMap((m) => m.toAddresses)).toEqual([world.users.editor.email]);
  });

  it('follows the mailed link: new password works, old does not, other sessions end, the link works once', async () => {
    const otherDevice = await signIn(world, 'editor');
    const mail = await waitForMail(world, world.users.editor.email, /Reset your Shockwright password/);
    expect(mail.htmlBody).toContain('Choose a new password');
    const link = linkIn(mail.textBody, '/reset-password?token=');
    const token = link.searchParams.get('token')!;
    const done = await request(world.app).post('/api/auth/password-reset/confirm').set(CSRF).send({ token, password: 'brand new secret' });
    expect(done.status).toBe(200);
    expect(done.body.user.email).toBe(world.users.editor.email);
    expect((await request(world.app).get('/api/auth/me').set('Cookie', otherDevice!)).status).toBe(401);
    expect((await request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email: world.users.editor.email, password: PASSWORD })).status).toBe(401);
    expect((await request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email: world.users.editor.email, password: 'brand new secret' })).status).toBe(200);
    const reuse = await request(world.app).post('/api/auth/password-reset/confirm').set(CSRF).send({ token, password: 'yet another secret' });
    expect(reuse.status).toBe(410);
    expect(reuse.body.error.code).toBe('reset_used');
  });

  it('an expired link (older than one hour) is refused', async () => {
    await request(world.app).post('/api/auth/password-reset').set(CSRF).send({ email: world.users.viewer.email });
    const mail = await waitForMail(world, world.users.viewer.email, /Reset your Shockwright password/);
    const token = linkIn(mail.textBody, '/reset-password?token=').searchParams.get('token')!;
    await world.database.db.update(passwordResets).set({ expiresAt: new Date(Date.now() - 1000) });
    const res = await request(world.app).post('/api/auth/password-reset/confirm').set(CSRF).send({ token, password: 'brand new secret' });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('reset_expired');
  });

  it('reset requests are rate limited per address', async () => {
    let last = 0;
    for (let i = 0; i < 4; i++) last = (await request(world.app).post('/api/auth/password-reset').set(CSRF).send({ email: `x${i}@example.test` })).status;
    expect(last).toBe(429);
  });
});

describe('invitations through the SMTP sink', () => {
  let world: World;
  let owner: string;
  beforeAll(async () => {
    world = await createWorld();
    owner = (await signIn(world, 'owner'))!;
  });
  afterAll(async () => world?.close());

  async function invite(email: string, teamId = world.teamId, role = 'reviewer') {
    const res = await request(world.app).post(`/api/teams/${teamId}/invitations`).set(CSRF).set('Cookie', owner).send({ email, role });
    expect(res.status).toBe(201);
    const mail = await waitForMail(world, email, /invited you to/);
    const link = linkIn(mail.textBody, '/invitations/accept?');
    return { teamId: link.searchParams.get('team')!, token: link.searchParams.get('token')!, mail };
  }

  it('a newcomer reads the mail, follows the link, creates an account and joins with the invited role', async () => {
    const { teamId, token, mail } = await invite('newcomer@example.test');
    expect(teamId).toBe(world.teamId);
    expect(mail.subject).toBe('Owner Person invited you to Test team on Shockwright');
    expect(mail.htmlBody).toContain('Accept the invitation');
    const preview = await request(world.app).post('/api/auth/invitations/preview').set(CSRF).send({ teamId, token });
    expect(preview.body).toMatchObject({ teamName: 'Test team', email: 'newcomer@example.test', role: 'reviewer', invitedByName: 'Owner Person', accountExists: false });
    const accept = await request(world.app).post('/api/auth/invitations/accept').set(CSRF).send({ teamId, token, name: 'Nia Comer', password: 'her own password' });
    expect(accept.status).toBe(200);
    expect(accept.body.teams).toEqual([{ teamId, teamName: 'Test team', role: 'reviewer' }]);
    const reuse = await request(world.app).post('/api/auth/invitations/accept').set(CSRF).send({ teamId, token, name: 'Someone', password: 'another password' });
    expect(reuse.status).toBe(410);
    expect(reuse.body.error.code).toBe('invitation_used');
  });

  it('an existing account must sign in first, then joins', async () => {
    const other = await freshTeam(world, 'Second team');
    // The outsider is not in "Second team"; invite them there.
    const { teamId, token } = await invite(world.users.outsider.email, other, 'editor');
    const anon = await request(world.app).post('/api/auth/invitations/accept').set(CSRF).send({ teamId, token });
    expect(anon.status).toBe(409);
    expect(anon.body.error.code).toBe('sign_in_required');
    const asViewer = await request(world.app).post('/api/auth/invitations/accept').set(CSRF).set('Cookie', (await signIn(world, 'viewer'))!).send({ teamId, token });
    expect(asViewer.status).toBe(403);
    expect(asViewer.body.error.message).toContain(world.users.outsider.email);
    const asOutsider = await request(world.app).post('/api/auth/invitations/accept').set(CSRF).set('Cookie', (await signIn(world, 'outsider'))!).send({ teamId, token });
    expect(asOutsider.status).toBe(200);
    expect(asOutsider.body.teams.map((t: { teamName: string; role: string }) => `${t.teamName}:${t.role}`).sort()).toEqual(['Elsewhere Ltd:owner', 'Second team:editor']);
  });

  it('a token presented for the wrong team is not valid', async () => {
    const { token } = await invite('wrongteam@example.test');
    const res = await request(world.app).post('/api/auth/invitations/preview').set(CSRF).send({ teamId: world.outsiderTeamId, token });
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('invitation_not_found');
  });

  it('an expired (older than 7 days) or withdrawn invitation is refused', async () => {
    const expired = await invite('late@example.test');
    await world.database.db.update(invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitations.email, 'late@example.test'));
    const res = await request(world.app).post('/api/auth/invitations/preview').set(CSRF).send({ teamId: expired.teamId, token: expired.token });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('invitation_expired');

    const revoked = await invite('withdrawn@example.test');
    const pending = await request(world.app).get(`/api/teams/${world.teamId}/invitations`).set('Cookie', owner);
    const id = pending.body.find((p: { email: string }) => p.email === 'withdrawn@example.test').id;
    expect((await request(world.app).delete(`/api/teams/${world.teamId}/invitations/${id}`).set(CSRF).set('Cookie', owner)).status).toBe(204);
    const after = await request(world.app).post('/api/auth/invitations/accept').set(CSRF).send({ teamId: revoked.teamId, token: revoked.token, name: 'W', password: 'long enough pw' });
    expect(after.status).toBe(410);
    expect(after.body.error.code).toBe('invitation_revoked');
  });

  it('inviting someone who is already a member is refused', async () => {
    const res = await request(world.app).post(`/api/teams/${world.teamId}/invitations`).set(CSRF).set('Cookie', owner).send({ email: world.users.viewer.email, role: 'editor' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('already_member');
  });
});

describe('members: roles, the last owner, the audit trail', () => {
  let world: World;
  let owner: string;
  beforeAll(async () => {
    world = await createWorld();
    owner = (await signIn(world, 'owner'))!;
  });
  afterAll(async () => world?.close());

  it('the last owner can be neither demoted nor removed', async () => {
    const { owner: o } = world.users;
    const demote = await request(world.app).patch(`/api/teams/${world.teamId}/members/${o.id}`).set(CSRF).set('Cookie', owner).send({ role: 'editor' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe('last_owner');
    const leave = await request(world.app).delete(`/api/teams/${world.teamId}/members/${o.id}`).set(CSRF).set('Cookie', owner);
    expect(leave.status).toBe(409);
  });

  it('after promoting a second owner, the first can step down; the audit trail says who did what', async () => {
    const { editor, owner: o } = world.users;
    const promote = await request(world.app).patch(`/api/teams/${world.teamId}/members/${editor.id}`).set(CSRF).set('Cookie', owner).send({ role: 'owner' });
    expect(promote.status).toBe(200);
    expect(promote.body.find((m: { userId: string }) => m.userId === editor.id).role).toBe('owner');
    const stepDown = await request(world.app).patch(`/api/teams/${world.teamId}/members/${o.id}`).set(CSRF).set('Cookie', owner).send({ role: 'editor' });
    expect(stepDown.status).toBe(200);
    const asNewOwner = (await signIn(world, 'editor'))!;
    const removeViewer = await request(world.app).delete(`/api/teams/${world.teamId}/members/${world.users.viewer.id}`).set(CSRF).set('Cookie', asNewOwner);
    expect(removeViewer.status).toBe(204);
    const audit = await request(world.app).get(`/api/teams/${world.teamId}/audit?limit=10`).set('Cookie', asNewOwner);
    expect(audit.status).toBe(200);
    expect(audit.body.items.map((e: { summary: string }) => e.summary)).toEqual([
      'Editor Person removed Viewer Person (viewer).',
      'Owner Person changed Owner Person from owner to editor.',
      'Owner Person changed Editor Person from editor to owner.',
    ]);
    expect(audit.body.total).toBe(3);
  });

  it('list queries are validated: a bad limit names the field', async () => {
    const res = await request(world.app).get(`/api/teams/${world.teamId}/audit?limit=500`).set('Cookie', (await signIn(world, 'editor'))!);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('Invalid query: limit: must be at most 100.');
  });
});
