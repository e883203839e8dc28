import request from 'supertest';
import { eq, desc, arrayContains } from 'drizzle-orm';
import { createApp, type BuiltApp, type RateLimits } from '../../server/app.ts';
import { hashPassword } from '../../server/auth/passwords.ts';
import { memberships, sketches, teams, users, mailMessages } from '../../server/db/schema.ts';
import { createMailer, type Mailer } from '../../server/mail/mailer.ts';
import { startMailSink, type MailSink } from '../../server/mail/sink.ts';
import { newId } from '../../shared/model/ids.ts';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import type { Role } from '../../shared/model/roles.ts';
import { createTestDatabase, type TestDatabase } from './database.ts';
import { testEnv } from './app.ts';
import { itemAt } from '../../shared/util/invariant.ts';
import { sketchSummaryColumns } from '../../server/db/sketchSummary.ts';

export const CSRF = { 'x-shockwright-request': '1' } as const;
export const PASSWORD = 'correct horse battery';

export const ACTORS = ['signedOut', 'viewer', 'reviewer', 'editor', 'owner', 'outsider'] as const;
export type Actor = (typeof ACTORS)[number];
type Member = Exclude<Actor, 'signedOut'>;

export interface TestUser {
  id: string;
  email: string;
  name: string;
}

/**
 * One test file's world: its own database, the Express app, a real SMTP sink storing mail in
 * that database, and five people — four members of a team with each role, and an outsider who
 * owns a team of their own.
 */
export interface World {
  database: TestDatabase;
  built: BuiltApp;
  app: BuiltApp['app'];
  sink: MailSink;
  /** The app's mailer; `idle()` resolves once every send so far has reached the sink (stored). */
  mailer: Mailer & { idle(): Promise<void> };
  users: Record<Member, TestUser>;
  teamId: string;
  outsiderTeamId: string;
  close(): Promise<void>;
}

export async function createWorld(options: { limits?: Partial<RateLimits>; env?: Record<string, string> } = {}): Promise<World> {
  const database = await createTestDatabase();
  const sink = await startMailSink(database.db);
  const smtp = createMailer(sink.url, 'Shockwright <no-reply@shockwright.test>');
  const inFlight = new Set<Promise<void>>();
  const mailer: World['mailer'] = {
    send(to, content) {
      const sending = smtp.send(to, content);
      inFlight.add(sending);
      sending.then(
        () => inFlight.delete(sending),
        () => inFlight.delete(sending),
      );
      return sending;
    },
    close: () => smtp.close(),
    async idle() {
      while (inFlight.size) await Promise.allSettled([...inFlight]);
    },
  };
  const built = createApp({
    env: testEnv(database.url, options.env),
    database,
    mailer,
    log: () => {},
    publicUrl: () => 'http://shockwright.test',
    limits: { signInFailures: 1000, signInFailuresPerAddress: 1000, signUps: 1000, resets: 1000, invites: 1000, ...options.limits },
  });
  const passwordHash = await hashPassword(PASSWORD);
  const people = {} as Record<Member, TestUser>;
  for (const actor of ['owner', 'editor', 'reviewer', 'viewer', 'outsider'] as const) {
    const u = { id: newId('user'), email: `${actor}@example.test`, name: `${itemAt(actor, 0).toUpperCase()}${actor.slice(1)} Person` };
    await database.db.insert(users).values({ ...u, passwordHash });
    people[actor] = u;
  }
  const world: World = {
    database,
    built,
    app: built.app,
    sink,
    mailer,
    users: people,
    teamId: '',
    outsiderTeamId: '',
    async close() {
      built.close();
      mailer.close();
      await sink.close();
      await database.drop();
    },
  };
  world.teamId = await freshTeam(world);
  world.outsiderTeamId = newId('team');
  await database.db.insert(teams).values({ id: world.outsiderTeamId, name: 'Elsewhere Ltd' });
  await database.db.insert(memberships).values({ teamId: world.outsiderTeamId, userId: people.outsider.id, role: 'owner' });
  return world;
}

/** A new team in which owner/editor/reviewer/viewer hold their roles (the outsider is not in it). */
export async function freshTeam(world: World, name = 'Test team'): Promise<string> {
  const id = newId('team');
  await world.database.db.insert(teams).values({ id, name });
  for (const role of ['owner', 'editor', 'reviewer', 'viewer'] as Role[]) {
    await world.database.db.insert(memberships).values({ teamId: id, userId: world.users[role as Member].id, role });
  }
  return id;
}

export async function freshSketch(world: World, teamId = world.teamId, title = 'Test sketch'): Promise<string> {
  const id = newId('sketch');
  const document = defaultSketchDocument();
  await world.database.db.insert(sketches).values({ id, teamId, title, document, createdBy: world.users.owner.id, updatedBy: world.users.owner.id, ...sketchSummaryColumns(document, 0) });
  return id;
}

/** Signs `actor` in through the API and returns the session cookie (null for signedOut). */
export async function signIn(world: World, actor: Actor): Promise<string | null> {
  if (actor === 'signedOut') return null;
  const res = await request(world.app).post('/api/auth/sign-in').set(CSRF).send({ email: world.users[actor].email, password: PASSWORD });
  if (res.status !== 200) throw new Error(`sign-in of ${actor} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return sessionCookie(res.headers['set-cookie']);
}

export function sessionCookie(setCookie: string | string[] | undefined): string {
  const list = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  const c = list.find((x) => x.startsWith('sw.sid='));
  if (!c) throw new Error('no session cookie in the response');
  return c.replace(/;.*$/s, '');
}

/** Waits (up to 30 s: a loaded machine) for a message to `to` whose subject matches, and returns it. */
export async function waitForMail(world: World, to: string, subject: RegExp) {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const rows = await world.database.db
      .select()
      .from(mailMessages)
      .where(arrayContains(mailMessages.toAddresses, [to]))
      .orderBy(desc(mailMessages.receivedAt));
    const hit = rows.find((r) => subject.test(r.subject));
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${to} matching ${subject} arrived`);
}

/** The first link to the app inside a message's text part. */
export function linkIn(text: string, pathPrefix: string): URL {
  const m = text.match(new RegExp(`https?://[^\\s]+${pathPrefix.replace(/[/?]/g, (c) => `\\${c}`)}[^\\s]*`));
  if (!m) throw new Error(`no ${pathPrefix} link in: ${text}`);
  return new URL(m[0]);
}

export { eq };
