import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, asc, eq, isNotNull } from 'drizzle-orm';
import { sketchEdits } from '../../server/db/schema.ts';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import { CSRF, createWorld, freshSketch, linkIn, signIn, waitForMail, type World } from '../helpers/world.ts';
import { itemAt } from '../../shared/util/invariant.ts';

describe('review workflow API', () => {
  let world: World;
  const cookie = {} as Record<'owner' | 'editor' | 'reviewer' | 'viewer', string>; // filled in beforeAll
  let sketchId: string;

  const as = (who: 'owner' | 'editor' | 'reviewer' | 'viewer') => ({
    get: (url: string) => request(world.app).get(url).set('Cookie', cookie[who]),
    post: (url: string, body: object = {}) => request(world.app).post(url).set(CSRF).set('Cookie', cookie[who]).send(body),
    put: (url: string, body: object) => request(world.app).put(url).set(CSRF).set('Cookie', cookie[who]).send(body),
  });

  beforeAll(async () => {
    world = await createWorld();
    for (const who of ['owner', 'editor', 'reviewer', 'viewer'] as const) cookie[who] = (await signIn(world, who))!;
    sketchId = await freshSketch(world, world.teamId, 'Canard root, 5% wedge');
  });
  afterAll(async () => world?.close());

  it('a reviewer pins a wave and @mentions the editor, who gets an e-mail with a link to the pin', async () => {
    const res = await as('reviewer').post(`/api/sketches/${sketchId}/pins`, {
      target: { kind: 'wave', waveId: 'lower-shock-0', label: 'the lower nose shock', at: [0.2, -0.1] },
      body: 'Is this shock still attached at the top of the envelope?',
      mentions: [world.users.editor.id],
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ status: 'open', authorName: 'Reviewer Person', replyCount: 0, target: { kind: 'wave', waveId: 'lower-shock-0' } });
    const mail = await waitForMail(world, world.users.editor.email, /mentioned you/);
    expect(mail.subject).toBe('Reviewer Person mentioned you on “Canard root, 5% wedge”');
    expect(linkIn(mail.textBody, `/sketches/${sketchId}`).searchParams.get('pin')).toBe(res.body.id);
  });

  it('mentioning someone outside the team is refused and nothing is stored', async () => {
    const before = (await as('viewer').get(`/api/sketches/${sketchId}/pins`)).body.total;
    const res = await as('reviewer').post(`/api/sketches/${sketchId}/pins`, { target: { kind: 'point', at: [0, 0] }, body: 'x', mentions: [world.users.outsider.id] });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('mentions');
    expect((await as('viewer').get(`/api/sketches/${sketchId}/pins`)).body.total).toBe(before);
  });

  it('the editor answers, the reviewer resolves; lists filter by status and paginate', async () => {
    const list = await as('viewer').get(`/api/sketches/${sketchId}/pins?status=open`);
    const pinId = list.body.items[0].id;
    expect((await as('editor').post(`/api/pins/${pinId}/replies`, { body: 'Yes: 1.8° of margin at Mach 1.6.' })).status).toBe(201);
    expect((await as('viewer').post(`/api/pins/${pinId}/replies`, { body: 'me too' })).status).toBe(403);
    const resolved = await as('reviewer').post(`/api/pins/${pinId}/resolve`);
    expect(resolved.body).toMatchObject({ status: 'resolved', resolvedByName: 'Reviewer Person', replyCount: 1 });
    expect(resolved.body.replies.map((r: { authorName: string }) => r.authorName)).toEqual(['Reviewer Person', 'Editor Person']);
    expect((await as('viewer').get(`/api/sketches/${sketchId}/pins?status=open`)).body.total).toBe(0);
    await as('reviewer').post(`/api/sketches/${sketchId}/pins`, { target: { kind: 'facet', facet: 2, at: [0.7, 0] }, body: 'Second pin' });
    const page = await as('viewer').get(`/api/sketches/${sketchId}/pins?status=all&limit=1&offset=1`);
    expect(page.body).toMatchObject({ total: 2, limit: 1, offset: 1 });
    expect(page.body.items).toHaveLength(1);
    expect(page.body.items[0].firstBody).toBe('Is this shock still attached at the top of the envelope?');
  });

  it('snapshots: restore makes a new revision, keeps every earlier one, and snapshots the state it replaces', async () => {
    const snap = await as('editor').post(`/api/sketches/${sketchId}/snapshots`, { name: 'Baseline wedge', note: 'Before thinning' });
    expect(snap.status).toBe(201);
    expect(snap.body).toMatchObject({ name: 'Baseline wedge', kind: 'manual', revision: 0 });
    const thinner = defaultSketchDocument();
    thinner.section.points = [[0, 0], [0.5, 0.01], [1, 0], [0.5, -0.01]];
    const saved = await as('editor').put(`/api/sketches/${sketchId}/document`, { document: thinner, baseRevision: 0 });
    expect(saved.body.revision).toBe(1);

    const restored = await as('owner').post(`/api/snapshots/${snap.body.id}/restore`);
    expect(restored.status).toBe(200);
    expect(restored.body.revision).toBe(2);
    expect(restored.body.document).toEqual(defaultSketchDocument());
    const log = await world.database.db.select().from(sketchEdits).where(and(eq(sketchEdits.sketchId, sketchId), isNotNull(sketchEdits.revision))).orderBy(asc(sketchEdits.revision));
    expect(log.map((e) => [e.revision, (e.op as { type: string }).type])).toEqual([[1, 'replaceDocument'], [2, 'replaceDocument']]);
    expect((itemAt(log, 0).op as { document: unknown }).document).toEqual(thinner);

    const list = await as('viewer').get(`/api/sketches/${sketchId}/snapshots`);
    expect(list.body.items.map((s: { name: string; kind: string; revision: number }) => [s.name, s.kind, s.revision])).toEqual([
      ['Before restoring “Baseline wedge”', 'before_restore', 1],
      ['Baseline wedge', 'manual', 0],
    ]);
    const kept = await as('viewer').get(`/api/snapshots/${list.body.items[0].id}`);
    expect(kept.body.document).toEqual(thinner);
  });

  it('an import is snapshotted first; a tangled file is refused before anything is written', async () => {
    const bad = await as('editor').post(`/api/sketches/${sketchId}/import`, { points: [[0, 0], [1, 1], [1, 0], [0, 1]], fileName: 'bow-tie.csv' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/would cross/);
    const before = (await as('viewer').get(`/api/sketches/${sketchId}/snapshots`)).body.total;
    const ok = await as('editor').post(`/api/sketches/${sketchId}/import`, { points: [[0, 0], [0.3, 0.03], [1, 0], [0.3, -0.03]], fileName: 'tern-root.csv' });
    expect(ok.status).toBe(200);
    expect(ok.body.document.section.points).toEqual([[0, 0], [0.3, 0.03], [1, 0], [0.3, -0.03]]);
    const after = await as('viewer').get(`/api/sketches/${sketchId}/snapshots`);
    expect(after.body.total).toBe(before + 1);
    expect(after.body.items[0]).toMatchObject({ name: 'Before importing tern-root.csv', kind: 'before_import' });
  });

  it('[A4] the last editor cannot approve their own work; a reviewer can, naming the revision', async () => {
    // The editor made the last change (the import above).
    const { revision } = (await as('viewer').get(`/api/sketches/${sketchId}`)).body;
    const self = await as('editor').post(`/api/sketches/${sketchId}/approvals`, { revision });
    expect(self.status).toBe(403);
    expect(self.body.error.code).toBe('self_approval');
    const ok = await as('reviewer').post(`/api/sketches/${sketchId}/approvals`, { revision });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ reviewStatus: 'approved', reviewState: 'approved', approval: { revision, byName: 'Reviewer Person', changedSince: false } });
    const table = await as('viewer').get(`/api/teams/${world.teamId}/sketches`);
    expect(table.body.find((s: { id: string }) => s.id === sketchId)).toMatchObject({ reviewStatus: 'approved', approval: { revision } });
  });

  it('a review request mails each reviewer a link and puts the sketch in review; viewers cannot be asked', async () => {
    const viewerAsked = await as('editor').post(`/api/sketches/${sketchId}/review-requests`, { reviewerIds: [world.users.viewer.id] });
    expect(viewerAsked.status).toBe(400);
    expect(viewerAsked.body.error.message).toContain('Viewer Person is a viewer');
    const res = await as('editor').post(`/api/sketches/${sketchId}/review-requests`, { reviewerIds: [world.users.reviewer.id, world.users.owner.id], message: 'Thinner root, please check the loads.' });
    expect(res.status).toBe(200);
    expect(res.body.reviewStatus).toBe('in_review');
    for (const who of ['reviewer', 'owner'] as const) {
      const mail = await waitForMail(world, world.users[who].email, /asks you to review/);
      expect(mail.textBody).toContain('Thinner root, please check the loads.');
      expect(linkIn(mail.textBody, `/sketches/${sketchId}`).pathname).toBe(`/sketches/${sketchId}`);
    }
  });

  it('activity lists grouped edits and every event, newest first, paginated', async () => {
    const all = await as('viewer').get(`/api/sketches/${sketchId}/activity?limit=50`);
    expect(all.status).toBe(200);
    const summaries: string[] = all.body.items.map((i: { summary: string }) => i.summary);
    expect(summaries[0]).toBe('Editor Person asked Reviewer Person, Owner Person to review.');
    expect(summaries).toContain('Reviewer Person approved revision 3.');
    expect(summaries).toContain('Editor Person imported 4 vertices from tern-root.csv (new revision 3).');
    expect(summaries).toContain('Owner Person restored snapshot “Baseline wedge” (new revision 2).');
    expect(summaries).toContain('Reviewer Person resolved a pin.');
    expect(summaries.filter((s) => /made (an edit|\d+ edits)/.test(s))).toHaveLength(3);
    const page = await as('viewer').get(`/api/sketches/${sketchId}/activity?limit=2&offset=2`);
    expect(page.body.items.map((i: { id: string }) => i.id)).toEqual(all.body.items.slice(2, 4).map((i: { id: string }) => i.id));
    expect(page.body.total).toBe(all.body.total);
    const beyond = await as('viewer').get(`/api/sketches/${sketchId}/activity?limit=5&offset=500`);
    expect(beyond.body).toMatchObject({ items: [], total: all.body.total });
  });
});
