import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { memberships } from '../../server/db/schema.ts';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import { pdfText } from '../helpers/pdf.ts';
import { CSRF, createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';

type Who = 'owner' | 'editor' | 'reviewer' | 'viewer';

/** Deserialises a binary body (supertest buffers only known binary types by default). */
const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

/**
 * Review outcomes over time, as a team meets them: an approval belongs to a revision [A1]; an
 * edit after it reads "changed since approval" in every answer and the report until someone
 * approves again [A2]; an outcome names the revision its reviewer saw [A3]; the last editor
 * never approves [A4]; reviewers record outcomes and owners reset [A5]; the report carries the
 * record [A6]. Invariants: server/api/review/README.md.
 */
describe('review outcomes over time', () => {
  let world: World;
  const cookie: Record<string, string> = {};
  let sketchId: string;

  const cookieOf = (who: Who): string => {
    const c = cookie[who];
    if (c === undefined) throw new Error(`${who} has not signed in yet`);
    return c;
  };
  const as = (who: Who) => ({
    get: (url: string) => request(world.app).get(url).set('Cookie', cookieOf(who)),
    post: (url: string, body: object = {}) => request(world.app).post(url).set(CSRF).set('Cookie', cookieOf(who)).send(body),
    put: (url: string, body: object) => request(world.app).put(url).set(CSRF).set('Cookie', cookieOf(who)).send(body),
    patch: (url: string, body: object) => request(world.app).patch(url).set(CSRF).set('Cookie', cookieOf(who)).send(body),
    pdf: (url: string) => request(world.app).get(url).set('Cookie', cookieOf(who)).buffer(true).parse(binary),
  });
  const sketch = async () => (await as('viewer').get(`/api/sketches/${sketchId}`)).body;
  const row = async () => (await as('viewer').get(`/api/teams/${world.teamId}/sketches`)).body.find((s: { id: string }) => s.id === sketchId);
  const report = async () => pdfText((await as('viewer').pdf(`/api/sketches/${sketchId}/report.pdf`)).body as Buffer).replace(/\s+/g, ' ');
  const history = async () => (await as('viewer').get(`/api/sketches/${sketchId}/review-history?limit=50`)).body;
  /** An edit through the edit log (the same path live edits take), by `who`. */
  const edit = async (who: Who, thickness: number) => {
    const { revision } = await sketch();
    const doc = defaultSketchDocument();
    doc.section.points = [[0, 0], [0.5, thickness], [1, 0], [0.5, -thickness]];
    const res = await as(who).put(`/api/sketches/${sketchId}/document`, { document: doc, baseRevision: revision });
    expect(res.status).toBe(200);
    return res.body.revision as number;
  };

  beforeAll(async () => {
    world = await createWorld();
    for (const who of ['owner', 'editor', 'reviewer', 'viewer'] as const) cookie[who] = (await signIn(world, who))!;
    sketchId = await freshSketch(world, world.teamId, 'Tern fin root, 4% diamond');
  });
  afterAll(async () => world?.close());

  it('a new sketch is a draft and its report says "not approved" [A6]', async () => {
    expect(await sketch()).toMatchObject({ reviewStatus: 'draft', reviewState: 'draft', approval: null });
    expect(await report()).toContain('Review Not approved Review status: draft.');
  });

  it('[A1] a reviewer approves the revision they saw: who, which revision and when are kept, in every answer', async () => {
    const r1 = await edit('editor', 0.02);
    const res = await as('reviewer').post(`/api/sketches/${sketchId}/approvals`, { revision: r1, note: 'Loads checked against the hand integration.' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ reviewStatus: 'approved', reviewState: 'approved', approval: { revision: r1, byName: 'Reviewer Person', note: 'Loads checked against the hand integration.', changedSince: false } });
    const at = Date.parse(res.body.approval.at);
    expect(Math.abs(Date.now() - at)).toBeLessThan(10 * 60_000);
    expect(await row()).toMatchObject({ reviewState: 'approved', approval: { revision: r1, byName: 'Reviewer Person' } });
    const text = await report();
    expect(text).toContain(`Review Approved (revision ${r1})`);
    expect(text).toContain(`Approved: revision ${r1}, by Reviewer Person on ${res.body.approval.at.replace('T', ' ').slice(0, 16)} UTC.`);
    expect(text).toContain('Approval note: “Loads checked against the hand integration.”');
    expect(text).not.toContain('Changed since approval');
  });

  it('[A2] an edit after the approval reads "changed since approval" in the sketch, the table and the report, until approved again', async () => {
    const approved = (await sketch()).approval.revision;
    const r2 = await edit('editor', 0.025);
    expect(r2).toBe(approved + 1);
    expect(await sketch()).toMatchObject({ reviewStatus: 'approved', reviewState: 'changed_since_approval', approval: { revision: approved, changedSince: true } });
    expect(await row()).toMatchObject({ reviewState: 'changed_since_approval', approval: { revision: approved, changedSince: true } });
    const text = await report();
    expect(text).toContain('Review Changed since approval');
    expect(text).toContain(`Changed since approval: this report shows revision ${r2}; revision ${approved} is the one approved. Not approved as shown.`);
    // A rename is an edit too.
    expect((await as('editor').patch(`/api/sketches/${sketchId}`, { title: 'Tern fin root, 5% diamond' })).status).toBe(200);
    expect((await sketch()).reviewState).toBe('changed_since_approval');
  });

  it('[A3] an outcome for a revision the sketch has moved past is refused with the revision to look at; nothing is recorded', async () => {
    const before = await history();
    const now = (await sketch()).revision;
    const stale = await as('reviewer').post(`/api/sketches/${sketchId}/approvals`, { revision: now - 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('revision_moved');
    expect(stale.body.error.message).toContain(`you saw revision ${now - 1}, it is now at revision ${now}`);
    const staleChanges = await as('reviewer').post(`/api/sketches/${sketchId}/change-requests`, { revision: now - 1, note: 'Thicker please.' });
    expect(staleChanges.status).toBe(409);
    expect((await history()).total).toBe(before.total);
    expect((await sketch()).reviewState).toBe('changed_since_approval');
  });

  it('[A4] the last editor cannot approve; once someone else edits, they can — and the approval is current again', async () => {
    const now = (await sketch()).revision;
    const self = await as('editor').post(`/api/sketches/${sketchId}/approvals`, { revision: now });
    expect(self.status).toBe(403);
    expect(self.body.error.code).toBe('self_approval');
    const r = await edit('owner', 0.03);
    const res = await as('editor').post(`/api/sketches/${sketchId}/approvals`, { revision: r });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ reviewState: 'approved', approval: { revision: r, byName: 'Editor Person', changedSince: false } });
    expect(await row()).toMatchObject({ reviewState: 'approved', approval: { revision: r } });
    expect(await report()).toContain(`Review Approved (revision ${r})`);
  });

  it('[A5] a reviewer requests changes with a note (required, by name); the approval is withdrawn but the history keeps it', async () => {
    const now = (await sketch()).revision;
    const noNote = await as('reviewer').post(`/api/sketches/${sketchId}/change-requests`, { revision: now });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.message).toContain('note');
    const blank = await as('reviewer').post(`/api/sketches/${sketchId}/change-requests`, { revision: now, note: '   ' });
    expect(blank.status).toBe(400);
    expect(blank.body.error.message).toContain('note: must say what should change');
    const res = await as('reviewer').post(`/api/sketches/${sketchId}/change-requests`, { revision: now, note: 'The nose shock detaches at Mach 1.6, α 8°: sharpen the nose.' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ reviewStatus: 'changes_requested', reviewState: 'changes_requested', approval: null });
    expect(await row()).toMatchObject({ reviewState: 'changes_requested', approval: null });
    const text = await report();
    expect(text).toContain('Review Not approved Review status: changes requested.');
    expect(text).toContain(`Changes requested at revision ${now} by Reviewer Person`);
    expect(text).toContain('“The nose shock detaches at Mach 1.6, α 8°: sharpen the nose.”');
  });

  it('[A5][A7] viewers record no outcome; editors and reviewers cannot reset; an owner resets to draft only with an explicit confirmation', async () => {
    const now = (await sketch()).revision;
    expect((await as('viewer').post(`/api/sketches/${sketchId}/approvals`, { revision: now })).status).toBe(403);
    expect((await as('viewer').post(`/api/sketches/${sketchId}/change-requests`, { revision: now, note: 'x' })).status).toBe(403);
    expect((await as('editor').post(`/api/sketches/${sketchId}/review-reset`, { confirm: true })).status).toBe(403);
    expect((await as('reviewer').post(`/api/sketches/${sketchId}/review-reset`, { confirm: true })).status).toBe(403);
    // [A7] A reset withdraws what the review holds: without an explicit confirmation it is refused, naming the field, and nothing changes.
    const before = await sketch();
    const historyBefore = (await history()).total;
    for (const body of [{}, { confirm: false }, { confirm: 'yes' }, { confirm: 1 }]) {
      const refused = await as('owner').post(`/api/sketches/${sketchId}/review-reset`, body);
      expect(refused.status).toBe(400);
      expect(refused.body.error).toEqual({
        code: 'invalid_input',
        message: 'Invalid body: confirm: is required and must be true: resetting withdraws the approval in force (or the request for changes or for review) and sets the status back to draft.',
      });
    }
    const unknown = await as('owner').post(`/api/sketches/${sketchId}/review-reset`, { confirm: true, force: true });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/force/);
    expect(await sketch()).toMatchObject({ reviewStatus: before.reviewStatus, reviewState: before.reviewState, approval: before.approval });
    expect((await history()).total).toBe(historyBefore);
    const reset = await as('owner').post(`/api/sketches/${sketchId}/review-reset`, { confirm: true });
    expect(reset.status).toBe(200);
    expect(reset.body).toMatchObject({ reviewStatus: 'draft', reviewState: 'draft', approval: null });
  });

  it('[A1] the history keeps every approval, request for changes and reset, newest first, with who, revision and when', async () => {
    const h = await history();
    expect(h.total).toBe(4);
    expect(h.items.map((e: { outcome: string; byName: string }) => [e.outcome, e.byName])).toEqual([
      ['reset', 'Owner Person'],
      ['changes_requested', 'Reviewer Person'],
      ['approved', 'Editor Person'],
      ['approved', 'Reviewer Person'],
    ]);
    const [reset, changes, second, first] = h.items;
    expect(first.note).toBe('Loads checked against the hand integration.');
    expect(second.revision).toBeGreaterThan(first.revision);
    expect(changes.revision).toBe(second.revision);
    expect(reset.revision).toBe(second.revision);
    expect(h.items.every((e: { at: string }) => !Number.isNaN(Date.parse(e.at)))).toBe(true);
    const page = (await as('viewer').get(`/api/sketches/${sketchId}/review-history?limit=1&offset=1`)).body;
    expect(page).toMatchObject({ total: 4, limit: 1, offset: 1, items: [{ id: changes.id }] });
    // The activity feed tells the same story in words.
    const feed = (await as('viewer').get(`/api/sketches/${sketchId}/activity?limit=50`)).body.items.map((i: { summary: string }) => i.summary);
    expect(feed).toContain(`Reviewer Person approved revision ${first.revision}: “Loads checked against the hand integration.”`);
    expect(feed).toContain(`Owner Person reset the review to draft (revision ${reset.revision}).`);
  });

  it('[A5] a reviewer demoted to viewer while the sketch is open can no longer approve; promoted back, they can', async () => {
    const now = (await sketch()).revision;
    const demote = (role: 'viewer' | 'reviewer') =>
      world.database.db.update(memberships).set({ role }).where(and(eq(memberships.teamId, world.teamId), eq(memberships.userId, world.users.reviewer.id)));
    await demote('viewer');
    expect((await as('reviewer').post(`/api/sketches/${sketchId}/approvals`, { revision: now })).status).toBe(403);
    expect((await sketch()).reviewState).toBe('draft');
    await demote('reviewer');
    expect((await as('reviewer').post(`/api/sketches/${sketchId}/approvals`, { revision: now })).status).toBe(200);
  });

  it('a review request after an approval puts the sketch back in review; the approval stays in the history', async () => {
    const res = await as('editor').post(`/api/sketches/${sketchId}/review-requests`, { reviewerIds: [world.users.reviewer.id] });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ reviewStatus: 'in_review', reviewState: 'in_review', approval: null });
    expect((await history()).items[0].outcome).toBe('approved');
  });

  it('bad input names the field; an unknown sketch is 404', async () => {
    const bad = await as('reviewer').post(`/api/sketches/${sketchId}/approvals`, { revision: 'latest' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toContain('revision');
    const extra = await as('reviewer').post(`/api/sketches/${sketchId}/approvals`, { revision: 1, status: 'approved' });
    expect(extra.status).toBe(400);
    expect(extra.body.error.message).toContain('status');
    const other = await freshSketch(world);
    expect((await as('reviewer').post(`/api/sketches/${other.replace(/.$/, other.endsWith('a') ? 'b' : 'a')}/approvals`, { revision: 0 })).status).toBe(404);
    expect((await as('reviewer').post(`/api/sketches/not-an-id/approvals`, { revision: 0 })).body.error.message).toContain('must be a sketch id');
  });
});
