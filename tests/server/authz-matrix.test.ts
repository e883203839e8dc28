import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { newId } from '../../shared/model/ids.ts';
import { roleAtLeast, type Role } from '../../shared/model/roles.ts';
import { defaultSketchDocument, sketchCase } from '../../shared/model/sketch.ts';
import { hashToken } from '../../server/auth/tokens.ts';
import { eq } from 'drizzle-orm';
import { invitations, mailMessages, memberships, pinReplies, pins, snapshots, studies, teams, users } from '../../server/db/schema.ts';
import { runStudy } from '../../shared/flight/study.ts';
import { studyDefinitionSchema } from '../../shared/model/study.ts';
import { listRoutes } from '../helpers/routes.ts';
import { ACTORS, CSRF, createWorld, freshSketch, freshTeam, signIn, type Actor, type World } from '../helpers/world.ts';

/**
 * The authorization matrix: every API route × every kind of caller → expected status, generated
 * from the one table below. A route the app answers that has no entry here fails the first test.
 */
type Need = Role | 'public' | 'signedIn';
interface Entry {
  need: Need;
  /** Status when allowed. */
  ok: number;
  /** Builds the request for one caller against fresh data (so destructive calls do not interfere). */
  prepare: (w: World, actor: Actor) => Promise<{ path: string; body?: unknown }>;
  /** Exceptions to the rule the `need` implies, with the reason in the key's comment. */
  override?: Partial<Record<Actor, number>>;
  /** Use a separate, fresh session for this call (it ends or replaces the session). */
  freshSession?: boolean;
  /** Undo side effects that would change later rows of the matrix. */
  cleanup?: (w: World, body: unknown) => Promise<void>;
}

async function extraMember(w: World, teamId: string): Promise<string> {
  const id = newId('user');
  await w.database.db.insert(users).values({ id, email: `${id}@example.test`, name: 'Extra Person', passwordHash: 'x' });
  await w.database.db.insert(memberships).values({ teamId, userId: id, role: 'viewer' });
  return id;
}

async function invitation(w: World, teamId: string, email = `${newId('user')}@example.test`): Promise<{ id: string; token: string; email: string }> {
  const token = `tok${newId('invite').slice(7)}${Math.random().toString(36).slice(2)}`;
  const id = newId('invite');
  await w.database.db.insert(invitations).values({ id, teamId, email, role: 'editor', tokenHash: hashToken(token), invitedBy: w.users.owner.id, expiresAt: new Date(Date.now() + 86_400_000) });
  return { id, token, email };
}

async function freshPin(w: World): Promise<string> {
  const sketchId = await freshSketch(w);
  const id = newId('pin');
  await w.database.db.insert(pins).values({ id, sketchId, authorId: w.users.reviewer.id, target: { kind: 'point', at: [0.5, 0.1] } });
  await w.database.db.insert(pinReplies).values({ id: newId('reply'), pinId: id, authorId: w.users.reviewer.id, body: 'Check the nose shock here.' });
  return id;
}

async function freshSnapshot(w: World): Promise<string> {
  const sketchId = await freshSketch(w);
  const id = newId('snap');
  await w.database.db.insert(snapshots).values({ id, sketchId, name: 'Baseline', revision: 0, title: 'Test sketch', document: defaultSketchDocument(), createdBy: w.users.owner.id });
  return id;
}

const SMALL_STUDY = { mach: { kind: 'list', values: [1.5, 2.5] }, alpha: { startDeg: -2, endDeg: 2, stepDeg: 2 } } as const;

async function freshStudy(w: World): Promise<{ sketchId: string; studyId: string }> {
  const sketchId = await freshSketch(w);
  const definition = studyDefinitionSchema.parse(SMALL_STUDY);
  const outcome = runStudy(sketchCase(defaultSketchDocument()), definition);
  if (outcome.status !== 'done') throw new Error('study fixture failed');
  const studyId = newId('study');
  await w.database.db.insert(studies).values({ id: studyId, sketchId, name: 'Sweep', definition, results: outcome.results, revision: 0, points: outcome.results.rows.length, counts: outcome.results.counts, createdBy: w.users.editor.id });
  return { sketchId, studyId };
}

const TABLE: Record<string, Entry> = {
  'GET /api/health': { need: 'public', ok: 200, prepare: async () => ({ path: '/api/health' }) },
  'GET /api/auth/me': { need: 'signedIn', ok: 200, prepare: async () => ({ path: '/api/auth/me' }) },
  'POST /api/auth/sign-in': {
    // Wrong password for everyone: the route is public, the answer is about credentials.
    need: 'public',
    ok: 401,
    prepare: async (w) => ({ path: '/api/auth/sign-in', body: { email: w.users.owner.email, password: 'wrong password' } }),
  },
  'POST /api/auth/sign-up': {
    // An address that already has an account: public route, the same 202 as for a new address.
    need: 'public',
    ok: 202,
    prepare: async (w) => ({ path: '/api/auth/sign-up', body: { name: 'Dup', email: w.users.viewer.email, password: 'long enough pw', teamName: 'X' } }),
  },
  'POST /api/auth/sign-up/confirm': {
    need: 'public',
    ok: 400,
    prepare: async () => ({ path: '/api/auth/sign-up/confirm', body: { token: 'x'.repeat(43) } }),
  },
  'POST /api/auth/sign-out': { need: 'public', ok: 204, freshSession: true, prepare: async () => ({ path: '/api/auth/sign-out' }) },
  'POST /api/auth/password-reset': { need: 'public', ok: 202, prepare: async (w) => ({ path: '/api/auth/password-reset', body: { email: w.users.editor.email } }) },
  'POST /api/auth/password-reset/confirm': {
    need: 'public',
    ok: 400,
    prepare: async () => ({ path: '/api/auth/password-reset/confirm', body: { token: 'x'.repeat(43), password: 'another long pw' } }),
  },
  'POST /api/auth/invitations/preview': {
    need: 'public',
    ok: 200,
    prepare: async (w) => {
      const inv = await invitation(w, w.teamId);
      return { path: '/api/auth/invitations/preview', body: { teamId: w.teamId, token: inv.token } };
    },
  },
  'POST /api/auth/invitations/accept': {
    // Sent to a new address: a newcomer creates the account; signed-in people are someone else.
    need: 'public',
    ok: 200,
    override: { viewer: 403, reviewer: 403, editor: 403, owner: 403, outsider: 403 },
    prepare: async (w) => {
      const inv = await invitation(w, w.teamId);
      return { path: '/api/auth/invitations/accept', body: { teamId: w.teamId, token: inv.token, name: 'New Person', password: 'a fine password' } };
    },
  },
  'POST /api/teams': {
    need: 'signedIn',
    ok: 201,
    prepare: async () => ({ path: '/api/teams', body: { name: 'Another team' } }),
    // The creator becomes an owner, which would change their answers on owner-only routes.
    cleanup: async (w, body) => {
      const teamId = (body as { teamId?: string }).teamId;
      if (teamId) await w.database.db.delete(teams).where(eq(teams.id, teamId));
    },
  },
  'DELETE /api/teams/:teamId': { need: 'owner', ok: 204, prepare: async (w) => ({ path: `/api/teams/${await freshTeam(w)}` }) },
  'GET /api/teams/:teamId/members': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/teams/${w.teamId}/members` }) },
  'PATCH /api/teams/:teamId/members/:userId': {
    need: 'owner',
    ok: 200,
    prepare: async (w) => {
      const t = await freshTeam(w);
      return { path: `/api/teams/${t}/members/${await extraMember(w, t)}`, body: { role: 'editor' } };
    },
  },
  'DELETE /api/teams/:teamId/members/:userId': {
    need: 'owner',
    ok: 204,
    prepare: async (w) => {
      const t = await freshTeam(w);
      return { path: `/api/teams/${t}/members/${await extraMember(w, t)}` };
    },
  },
  'GET /api/teams/:teamId/invitations': { need: 'owner', ok: 200, prepare: async (w) => ({ path: `/api/teams/${w.teamId}/invitations` }) },
  'POST /api/teams/:teamId/invitations': {
    need: 'owner',
    ok: 201,
    prepare: async (w) => ({ path: `/api/teams/${await freshTeam(w)}/invitations`, body: { email: `${newId('user')}@example.test`, role: 'viewer' } }),
  },
  'DELETE /api/teams/:teamId/invitations/:invitationId': {
    need: 'owner',
    ok: 204,
    prepare: async (w) => {
      const t = await freshTeam(w);
      return { path: `/api/teams/${t}/invitations/${(await invitation(w, t)).id}` };
    },
  },
  'GET /api/teams/:teamId/audit': { need: 'owner', ok: 200, prepare: async (w) => ({ path: `/api/teams/${w.teamId}/audit` }) },
  'GET /api/teams/:teamId/sketches': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/teams/${w.teamId}/sketches` }) },
  'POST /api/teams/:teamId/sketches': { need: 'editor', ok: 201, prepare: async (w) => ({ path: `/api/teams/${w.teamId}/sketches`, body: { title: 'New one' } }) },
  'GET /api/sketches/:sketchId': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}` }) },
  'PATCH /api/sketches/:sketchId': { need: 'editor', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}`, body: { title: 'Renamed' } }) },
  'PUT /api/sketches/:sketchId/document': {
    need: 'editor',
    ok: 200,
    prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/document`, body: { document: defaultSketchDocument(), baseRevision: 0 } }),
  },
  'POST /api/sketches/:sketchId/duplicate': { need: 'editor', ok: 201, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/duplicate` }) },
  'DELETE /api/sketches/:sketchId': { need: 'owner', ok: 204, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}` }) },
  'GET /api/sketches/:sketchId/pins': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/pins` }) },
  'POST /api/sketches/:sketchId/pins': {
    need: 'reviewer',
    ok: 201,
    prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/pins`, body: { target: { kind: 'facet', facet: 1, at: [0.7, 0.01] }, body: 'Why so thick here?' } }),
  },
  'GET /api/pins/:pinId': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/pins/${await freshPin(w)}` }) },
  'POST /api/pins/:pinId/replies': { need: 'reviewer', ok: 201, prepare: async (w) => ({ path: `/api/pins/${await freshPin(w)}/replies`, body: { body: 'Agreed.' } }) },
  'POST /api/pins/:pinId/resolve': { need: 'reviewer', ok: 200, prepare: async (w) => ({ path: `/api/pins/${await freshPin(w)}/resolve` }) },
  'POST /api/pins/:pinId/reopen': { need: 'reviewer', ok: 200, prepare: async (w) => ({ path: `/api/pins/${await freshPin(w)}/reopen` }) },
  'GET /api/sketches/:sketchId/snapshots': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/snapshots` }) },
  'POST /api/sketches/:sketchId/snapshots': { need: 'editor', ok: 201, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/snapshots`, body: { name: 'Before the thinning' } }) },
  'GET /api/snapshots/:snapshotId': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/snapshots/${await freshSnapshot(w)}` }) },
  'POST /api/snapshots/:snapshotId/restore': { need: 'editor', ok: 200, prepare: async (w) => ({ path: `/api/snapshots/${await freshSnapshot(w)}/restore` }) },
  'POST /api/sketches/:sketchId/import': {
    need: 'editor',
    ok: 200,
    prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/import`, body: { points: [[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]], fileName: 'fin.csv' } }),
  },
  'GET /api/sketches/:sketchId/activity': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/activity` }) },
  // Review outcomes [A5]: reviewers and up record them (at the revision they saw); owners reset.
  'POST /api/sketches/:sketchId/approvals': {
    need: 'reviewer',
    ok: 200,
    // The fresh sketch's last editor is the owner, who may not approve it [A4].
    override: { owner: 403 },
    prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/approvals`, body: { revision: 0 } }),
  },
  'POST /api/sketches/:sketchId/change-requests': {
    need: 'reviewer',
    ok: 200,
    prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/change-requests`, body: { revision: 0, note: 'Sharpen the nose.' } }),
  },
  'POST /api/sketches/:sketchId/review-reset': { need: 'owner', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/review-reset`, body: { confirm: true } }) },
  'GET /api/sketches/:sketchId/review-history': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/review-history` }) },
  'POST /api/sketches/:sketchId/review-requests': {
    need: 'editor',
    ok: 200,
    prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/review-requests`, body: { reviewerIds: [w.users.reviewer.id] } }),
  },
  'GET /api/sketches/:sketchId/studies': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/studies` }) },
  'POST /api/sketches/:sketchId/studies': {
    need: 'editor',
    ok: 201,
    prepare: async (w) => ({ path: `/api/sketches/${await freshSketch(w)}/studies`, body: { name: 'Envelope', definition: SMALL_STUDY } }),
  },
  'GET /api/studies/:studyId': { need: 'viewer', ok: 200, prepare: async (w) => ({ path: `/api/studies/${(await freshStudy(w)).studyId}` }) },
  'DELETE /api/studies/:studyId': { need: 'editor', ok: 204, prepare: async (w) => ({ path: `/api/studies/${(await freshStudy(w)).studyId}` }) },
  'GET /api/sketches/:sketchId/report.pdf': {
    need: 'viewer',
    ok: 200,
    prepare: async (w) => {
      const { sketchId, studyId } = await freshStudy(w);
      return { path: `/api/sketches/${sketchId}/report.pdf?study=${studyId}` };
    },
  },
  'GET /api/preferences': { need: 'signedIn', ok: 200, prepare: async () => ({ path: '/api/preferences' }) },
  'PATCH /api/preferences': { need: 'signedIn', ok: 200, prepare: async () => ({ path: '/api/preferences', body: { unitSystem: 'si' } }) },
  'POST /api/solve': {
    need: 'signedIn',
    ok: 200,
    prepare: async () => ({ path: '/api/solve', body: { section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] }, flow: { mach: 2, alphaDeg: 2 } } }),
  },
  // Everyone has a personal inbox; other people's mail is tested in accounts.test.ts.
  'GET /api/dev/mailbox': { need: 'signedIn', ok: 200, prepare: async () => ({ path: '/api/dev/mailbox' }) },
  'GET /api/dev/mailbox/:mailId': {
    need: 'signedIn',
    ok: 200,
    prepare: async (w, actor) => {
      const id = newId('mail');
      const to = actor === 'signedOut' ? 'nobody@d.test' : w.users[actor].email;
      await w.database.db.insert(mailMessages).values({ id, fromAddress: 'a@b.test', toAddresses: [to], subject: 'Hello', textBody: 'Hi', raw: 'Hi' });
      return { path: `/api/dev/mailbox/${id}` };
    },
  },
};

/** The status the table's rule gives `actor` for an entry. */
function expected(entry: Entry, actor: Actor): number {
  if (entry.override?.[actor] !== undefined) return entry.override[actor]!;
  const { need, ok } = entry;
  if (need === 'public') return ok;
  if (actor === 'signedOut') return 401;
  if (need === 'signedIn') return ok;
  if (actor === 'outsider') return 404; // not a member: the team's existence is not revealed
  return roleAtLeast(actor as Role, need) ? ok : 403;
}

describe('authorization matrix', () => {
  let world: World;
  const cookies = {} as Record<Actor, string | null>;

  beforeAll(async () => {
    world = await createWorld();
    for (const actor of ACTORS) cookies[actor] = await signIn(world, actor);
  });
  afterAll(async () => world?.close());

  it('has an entry for every API route the app answers, and no stale entries', () => {
    const routes = listRoutes(world.app).filter((r) => r.includes(' /api/'));
    expect(routes.filter((r) => !(r in TABLE))).toEqual([]);
    expect(Object.keys(TABLE).filter((r) => !routes.includes(r))).toEqual([]);
  });

  for (const [route, entry] of Object.entries(TABLE)) {
    const method = route.slice(0, route.indexOf(' '));
    it(`${route}: ${ACTORS.map((a) => `${a} → ${expected(entry, a)}`).join(', ')}`, async () => {
      const got: Record<string, number> = {};
      const want: Record<string, number> = {};
      for (const actor of ACTORS) {
        const { path, body } = await entry.prepare(world, actor);
        const cookie = entry.freshSession ? await signIn(world, actor) : cookies[actor];
        let req = request(world.app)[method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete'](path).set(CSRF);
        if (cookie) req = req.set('Cookie', cookie);
        const res = body === undefined ? await req : await req.send(body as object);
        got[actor] = res.status;
        await entry.cleanup?.(world, res.body);
        want[actor] = expected(entry, actor);
      }
      expect(got).toEqual(want);
    });
  }
});
