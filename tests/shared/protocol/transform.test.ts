import { reached } from '../../helpers/reached.ts';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { applyEdit, transformOp, transformPast, type SketchState } from '../../../shared/protocol/transform.ts';
import type { EditOp } from '../../../shared/protocol/messages.ts';
import { selectedPoint, sketchDocumentSchema } from '../../../shared/model/sketch.ts';
import { createSyncEngine } from '../../../shared/protocol/syncEngine.ts';
import type { ClientMessage, ServerMessage } from '../../../shared/protocol/messages.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

function octagon(): SketchState {
  const points: [number, number][] = [];
  for (let i = 0; i < 8; i++) {
    const t = (2 * Math.PI * i) / 8;
    points.push([0.5 - 0.5 * Math.cos(t), 0.2 * Math.sin(t)]);
  }
  return { title: 'T', document: sketchDocumentSchema.parse({ version: 1, section: { points }, condition: { mach: 2, alphaDeg: 0 } }) };
}

describe('transformOp [R5]', () => {
  it('shifts a move past an insert before it, not past one after it', () => {
    const ins: EditOp = { type: 'insertVertex', opId: 'i', index: 3, at: [0, 0] };
    expect(transformOp({ type: 'moveVertices', opId: 'm', indices: [2, 5], to: [[0, 0], [1, 1]] }, ins)).toEqual({
      ok: true,
      op: { type: 'moveVertices', opId: 'm', indices: [2, 6], to: [[0, 0], [1, 1]] },
    });
  });

  it('drops a moved vertex that someone deleted, keeps the rest, and refuses when none is left', () => {
    const del: EditOp = { type: 'deleteVertex', opId: 'd', index: 4 };
    expect(transformOp({ type: 'moveVertices', opId: 'm', indices: [4, 6], to: [[0, 0], [1, 1]] }, del)).toEqual({
      ok: true,
      op: { type: 'moveVertices', opId: 'm', indices: [5], to: [[1, 1]] },
    });
    expect(transformOp({ type: 'moveVertices', opId: 'm', indices: [4], to: [[0, 0]] }, del)).toEqual({
      ok: false,
      reason: 'Someone deleted vertex 4 meanwhile; there is nothing left to move.',
    });
  });

  it('[O5] a one-coordinate edit follows its vertex past inserts and deletes, and keeps the other coordinate someone else moved', () => {
    const set: EditOp = { type: 'setVertexCoordinate', opId: 's', index: 5, axis: 'y', value: -0.1 };
    expect(transformOp(set, { type: 'insertVertex', opId: 'i', index: 2, at: [0, 0] })).toEqual({ ok: true, op: { ...set, index: 6 } });
    expect(transformOp(set, { type: 'deleteVertex', opId: 'd', index: 1 })).toEqual({ ok: true, op: { ...set, index: 4 } });
    expect(transformOp(set, { type: 'deleteVertex', opId: 'd', index: 5 })).toEqual({ ok: false, reason: 'Someone deleted vertex 5 meanwhile; your y for it no longer applies.' });
    // Two people on one vertex, one on x and one on y: both values survive in either order.
    const state = octagon();
    const x: EditOp = { type: 'setVertexCoordinate', opId: 'x', index: 2, axis: 'x', value: 0.2 };
    const y: EditOp = { type: 'setVertexCoordinate', opId: 'y', index: 2, axis: 'y', value: 0.25 };
    const xy = applyEdit(state, x);
    const yx = applyEdit(state, y);
    if (!xy.ok || !yx.ok) throw new Error('setup');
    const a = applyEdit(xy.state, y);
    const b = applyEdit(yx.state, x);
    expect(a.ok && b.ok && a.state.document.section.points[2]).toEqual([0.2, 0.25]);
    expect(b.ok && b.state.document.section.points[2]).toEqual([0.2, 0.25]);
  });

  it('refuses a second delete of the same vertex and any vertex edit after a replacement', () => {
    expect(transformOp({ type: 'deleteVertex', opId: 'a', index: 2 }, { type: 'deleteVertex', opId: 'b', index: 2 }).ok).toBe(false);
    expect(transformOp({ type: 'insertVertex', opId: 'a', index: 2, at: [0, 0] }, { type: 'replaceSection', opId: 'b', points: [[0, 0], [1, 0], [0, 1]] }).ok).toBe(false);
  });

  it('leaves field edits alone (the later one wins)', () => {
    const op: EditOp = { type: 'setCondition', opId: 's', field: 'mach', value: 3 };
    expect(transformOp(op, { type: 'deleteVertex', opId: 'd', index: 1 })).toEqual({ ok: true, op });
  });

  it('two inserts into one slot: both application orders give the same section (server order breaks the tie)', () => {
    const s0 = octagon();
    const [v1, v2] = [itemAt(s0.document.section.points, 1), itemAt(s0.document.section.points, 2)];
    const on = (t: number): [number, number] => [v1[0] + (v2[0] - v1[0]) * t, v1[1] + (v2[1] - v1[1]) * t];
    const a: EditOp = { type: 'insertVertex', opId: 'a', index: 2, at: on(1 / 3) };
    const b: EditOp = { type: 'insertVertex', opId: 'b', index: 2, at: on(2 / 3) };
    const apply = (s: SketchState, op: EditOp) => {
      const r = applyEdit(s, op);
      if (!r.ok) throw new Error(r.reason);
      return r.state;
    };
    const bPastA = transformOp(b, a);
    const aPastB = transformOp(a, b, true);
    if (!bPastA.ok || !aPastB.ok) throw new Error('transform refused');
    // The server applied a first: b goes after it. A client that applied b first and then
    // receives a rebases a with a ordered first: same section either way.
    expect(apply(apply(s0, a), bPastA.op)).toEqual(apply(apply(s0, b), aPastB.op));
    expect(apply(apply(s0, a), bPastA.op).document.section.points.slice(1, 5)).toEqual([v1, on(1 / 3), on(2 / 3), v2]);
  });

  it('property: rebasing a move past random inserts/deletes still moves the same vertex (by position)', () => {
    const checked = reached('moves rebased past edits');
    const withEdits = reached('moves rebased past at least one applied edit');
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.boolean(), fc.integer({ min: 0, max: 7 })), { maxLength: 4 }), fc.integer({ min: 0, max: 7 }), (edits, target) => {
        let state = octagon();
        const original = state.document.section.points[target];
        const applied: EditOp[] = [];
        for (const [isInsert, k] of edits) {
          const n = state.document.section.points.length;
          const index = k % n;
          if (index === target && !isInsert) continue;
          const op: EditOp = isInsert
            ? { type: 'insertVertex', opId: `e${applied.length}`, index, at: midpoint(state, index) }
            : { type: 'deleteVertex', opId: `e${applied.length}`, index };
          const r = applyEdit(state, op);
          if (!r.ok) continue;
          // Track the target through earlier edits: only apply edits that keep it.
          const t = transformPast({ type: 'moveVertices', opId: 'm', indices: [target], to: [[0, 0]] }, [...applied, op]);
          if (!t.ok) return;
          state = r.state;
          applied.push(op);
        }
        const moved = transformPast({ type: 'moveVertices', opId: 'm', indices: [target], to: [[0, 0]] }, applied);
        if (!moved.ok) return;
        const idx = itemAt((moved.op as Extract<EditOp, { type: 'moveVertices' }>).indices, 0);
        checked.hit();
        if (applied.length > 0) withEdits.hit();
        expect(state.document.section.points[idx]).toEqual(original);
      }),
      { numRuns: 200 },
    );
    // About 5 % stop early: the guard above compares with the target's original index, so after
    // an insert a later delete can still remove the target, and the rebase rightly refuses.
    checked.expectAtLeast(170);
    withEdits.expectAtLeast(110);
  });
});

function midpoint(state: SketchState, index: number): [number, number] {
  const pts = state.document.section.points;
  const a = itemAt(pts, (index - 1 + pts.length) % pts.length);
  const b = itemAt(pts, index);
  return [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2];
}

describe('createSyncEngine [R6]', () => {
  function harness() {
    const sent: ClientMessage[] = [];
    const engine = createSyncEngine({ send: (m) => sent.push(m) });
    engine.connectionOpened();
    engine.join('sketch_aaaaaaaaaaaaaaaaaaaa');
    const s0 = octagon();
    engine.receive({ type: 'joined', sketchId: 'sketch_aaaaaaaaaaaaaaaaaaaa', title: s0.title, document: s0.document, revision: 4, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'u', name: 'N', role: 'editor', colour: '#fff' } });
    return { sent, engine, s0, id: 'sketch_aaaaaaaaaaaaaaaaaaaa' };
  }

  it('keeps one edit in flight and sends the next after its ack, on the new revision', () => {
    const { sent, engine, id } = harness();
    engine.submit({ type: 'setCondition', opId: 'a', field: 'mach', value: 3 });
    engine.submit({ type: 'setCondition', opId: 'b', field: 'mach', value: 4 });
    const edits = () => sent.filter((m) => m.type === 'edit') as Extract<ClientMessage, { type: 'edit' }>[];
    expect(edits().map((m) => [m.op.opId, m.baseRevision])).toEqual([['a', 4]]);
    expect(selectedPoint(engine.state!.document).condition.mach).toBe(4);
    engine.receive({ type: 'ack', sketchId: id, opId: 'a', status: 'applied', revision: 5, op: { type: 'setCondition', opId: 'a', field: 'mach', value: 3 } });
    expect(edits().map((m) => [m.op.opId, m.baseRevision])).toEqual([['a', 4], ['b', 5]]);
    expect(engine.revision).toBe(5);
  });

  it('applies broadcasts in revision order even when they arrive out of order, and asks to resync a gap', () => {
    let t = 0;
    const sent: ClientMessage[] = [];
    const engine = createSyncEngine({ send: (m) => sent.push(m), now: () => t });
    engine.connectionOpened();
    engine.join('sketch_aaaaaaaaaaaaaaaaaaaa');
    const s0 = octagon();
    const id = 'sketch_aaaaaaaaaaaaaaaaaaaa';
    engine.receive({ type: 'joined', sketchId: id, title: 'T', document: s0.document, revision: 0, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'u', name: 'N', role: 'editor', colour: '#fff' } });
    const edit = (revision: number, value: number): ServerMessage => ({ type: 'edit', sketchId: id, revision, userId: 'x', op: { type: 'setCondition', opId: `r${revision}`, field: 'mach', value } });
    engine.receive(edit(2, 2.2));
    expect(engine.revision).toBe(0);
    engine.receive(edit(1, 2.1));
    expect(engine.revision).toBe(2);
    expect(selectedPoint(engine.state!.document).condition.mach).toBe(2.2);
    engine.receive(edit(4, 2.4));
    t = 2000;
    engine.tick();
    expect(sent.at(-1)).toEqual({ type: 'resync', sketchId: id, lastRevision: 2 });
  });

  it('a rejected edit disappears from the local view with its reason', () => {
    const rejected: string[] = [];
    const sent: ClientMessage[] = [];
    const engine = createSyncEngine({ send: (m) => sent.push(m), onRejected: (_op, reason) => rejected.push(reason) });
    engine.connectionOpened();
    const id = 'sketch_aaaaaaaaaaaaaaaaaaaa';
    engine.join(id);
    const s0 = octagon();
    engine.receive({ type: 'joined', sketchId: id, title: 'T', document: s0.document, revision: 0, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'u', name: 'N', role: 'viewer', colour: '#fff' } });
    engine.submit({ type: 'setCondition', opId: 'a', field: 'mach', value: 3 });
    expect(selectedPoint(engine.state!.document).condition.mach).toBe(3);
    engine.receive({ type: 'ack', sketchId: id, opId: 'a', status: 'rejected', reason: 'Your role in this team is viewer; editing needs the editor role.' });
    expect(selectedPoint(engine.state!.document).condition.mach).toBe(2);
    expect(rejected).toEqual(['Your role in this team is viewer; editing needs the editor role.']);
  });

  it('[R7] a revision heartbeat ahead of the client opens a gap that is resynced; one it already has changes nothing', () => {
    let t = 0;
    const sent: ClientMessage[] = [];
    const engine = createSyncEngine({ send: (m) => sent.push(m), now: () => t });
    engine.connectionOpened();
    const id = 'sketch_aaaaaaaaaaaaaaaaaaaa';
    engine.join(id);
    engine.receive({ type: 'joined', sketchId: id, title: 'T', document: octagon().document, revision: 3, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'u', name: 'N', role: 'editor', colour: '#fff' } });
    engine.receive({ type: 'revision', sketchId: id, revision: 3 });
    t = 5000;
    engine.tick();
    expect(sent.filter((m) => m.type === 'resync')).toEqual([]);
    // Revision 4 was committed but its broadcast never came: the heartbeat says so.
    engine.receive({ type: 'revision', sketchId: id, revision: 4 });
    t = 5500;
    engine.tick();
    expect(sent.filter((m) => m.type === 'resync')).toEqual([]); // a broadcast may still be on its way
    t = 6100;
    engine.tick();
    expect(sent.filter((m) => m.type === 'resync')).toEqual([{ type: 'resync', sketchId: id, lastRevision: 3 }]);
    engine.receive({ type: 'replay', sketchId: id, revision: 4, edits: [{ revision: 4, userId: 'x', op: { type: 'setCondition', opId: 'lost', field: 'mach', value: 3.4 } }] });
    expect(engine.revision).toBe(4);
    expect(selectedPoint(engine.state!.document).condition.mach).toBe(3.4);
    t = 9000;
    engine.tick();
    expect(sent.filter((m) => m.type === 'resync')).toHaveLength(1);
  });

  it('[R7] under a steady stream of edits, a client always a little behind the heartbeat never resyncs: only a revision that does not come does', () => {
    let t = 0;
    const sent: ClientMessage[] = [];
    const engine = createSyncEngine({ send: (m) => sent.push(m), now: () => t });
    engine.connectionOpened();
    const id = 'sketch_aaaaaaaaaaaaaaaaaaaa';
    engine.join(id);
    engine.receive({ type: 'joined', sketchId: id, title: 'T', document: octagon().document, revision: 0, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'u', name: 'N', role: 'editor', colour: '#fff' } });
    const edit = (revision: number) => engine.receive({ type: 'edit', sketchId: id, revision, userId: 'x', op: { type: 'rename', opId: `r${revision}`, title: `T${revision}` } });
    // Every 100 ms an edit arrives; the heartbeat (every 2 s) is always two revisions ahead.
    for (let r = 1; r <= 100; r++) {
      t = r * 100;
      edit(r);
      if (r % 20 === 0) engine.receive({ type: 'revision', sketchId: id, revision: r + 2 });
      engine.tick();
    }
    expect(sent.filter((m) => m.type === 'resync')).toEqual([]);
    // Revision 101 was committed but never broadcast: the heartbeat's target does not come.
    engine.receive({ type: 'revision', sketchId: id, revision: 101 });
    t += 1100;
    engine.tick();
    expect(sent.filter((m) => m.type === 'resync')).toEqual([{ type: 'resync', sketchId: id, lastRevision: 100 }]);
  });

  it('[R3][R7] a gap resync while an edit is in flight leaves that edit alone (the server has it); a reconnect sends it again', () => {
    let t = 0;
    const sent: ClientMessage[] = [];
    const engine = createSyncEngine({ send: (m) => sent.push(m), now: () => t });
    engine.connectionOpened();
    const id = 'sketch_aaaaaaaaaaaaaaaaaaaa';
    engine.join(id);
    engine.receive({ type: 'joined', sketchId: id, title: 'T', document: octagon().document, revision: 3, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'u', name: 'N', role: 'editor', colour: '#fff' } });
    engine.submit({ type: 'setCondition', opId: 'mine', field: 'mach', value: 3 });
    const edits = () => sent.filter((m) => m.type === 'edit');
    expect(edits()).toHaveLength(1);
    // The heartbeat says 5 while our edit waits in the server's queue: a gap, resynced.
    engine.receive({ type: 'revision', sketchId: id, revision: 5 });
    t = 2000;
    engine.tick();
    expect(sent.filter((m) => m.type === 'resync')).toHaveLength(1);
    engine.receive({ type: 'replay', sketchId: id, revision: 4, edits: [{ revision: 4, userId: 'x', op: { type: 'rename', opId: 'theirs', title: 'U' } }] });
    expect(edits()).toHaveLength(1);
    engine.receive({ type: 'ack', sketchId: id, opId: 'mine', status: 'rebased', revision: 5, op: { type: 'setCondition', opId: 'mine', field: 'mach', value: 3 } });
    expect(engine.pendingCount).toBe(0);
    expect(engine.revision).toBe(5);
    // After a reconnect the in-flight edit may have been lost: it goes again after the replay.
    engine.submit({ type: 'setCondition', opId: 'again', field: 'mach', value: 3.2 });
    engine.connectionLost();
    engine.connectionOpened();
    engine.receive({ type: 'replay', sketchId: id, revision: 5, edits: [] });
    expect(edits().map((m) => (m as { op: EditOp }).op.opId)).toEqual(['mine', 'again', 'again']);
  });

  it('reports a remote edit with its author and as it applies on top of the pending edits', () => {
    const seen: { op: EditOp; userId: string | null; local: EditOp | null }[] = [];
    const sent: ClientMessage[] = [];
    const engine = createSyncEngine({ send: (m) => sent.push(m), onRemoteEdit: (op, info) => seen.push({ op, ...info }) });
    engine.connectionOpened();
    const id = 'sketch_aaaaaaaaaaaaaaaaaaaa';
    engine.join(id);
    engine.receive({ type: 'joined', sketchId: id, title: 'T', document: octagon().document, revision: 0, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'u', name: 'N', role: 'editor', colour: '#fff' } });
    // Our pending insert at 2 shifts a remote move of vertex 5 to 6 in the local view.
    expect(engine.submit({ type: 'insertVertex', opId: 'mine', index: 2, at: [0.32, 0.18] })).toEqual({ ok: true });
    const remote: EditOp = { type: 'setVertexCoordinate', opId: 'theirs', index: 5, axis: 'y', value: -0.15 };
    engine.receive({ type: 'edit', sketchId: id, revision: 1, userId: 'user_tomasz', op: remote });
    expect(seen).toEqual([{ op: remote, userId: 'user_tomasz', local: { ...remote, index: 6 } }]);
    expect(itemAt(engine.state!.document.section.points, 6)[1]).toBe(-0.15);
  });
});

describe('design point edits [R8]', () => {
  const pt = (id: string, name: string) => ({ id, name, condition: { mach: 2, alphaDeg: 2, gamma: 1.4, altitudeM: null }, flapDeflectionDeg: 0 });
  function threePoints(): SketchState {
    const s = octagon();
    return { ...s, document: { ...s.document, designPoints: [pt('point_cruise00000000000000', 'Cruise'), pt('point_pullup00000000000000', 'Pull-up'), pt('point_maxq0000000000000000', 'Max q')], selectedPointId: 'point_cruise00000000000000' } };
  }
  const removeMaxq: EditOp = { type: 'removeDesignPoint', opId: 'r', pointId: 'point_maxq0000000000000000' };

  it('refuses an edit of a point someone removed meanwhile, with that reason', () => {
    const edits: EditOp[] = [
      { type: 'setCondition', opId: 'a', pointId: 'point_maxq0000000000000000', field: 'mach', value: 3 },
      { type: 'renameDesignPoint', opId: 'b', pointId: 'point_maxq0000000000000000', name: 'Max dynamic pressure' },
      { type: 'moveDesignPoint', opId: 'c', pointId: 'point_maxq0000000000000000', index: 0 },
      { type: 'selectDesignPoint', opId: 'd', pointId: 'point_maxq0000000000000000' },
      { type: 'setFlap', opId: 'e', pointId: 'point_maxq0000000000000000', flap: { hingeXOverC: 0.7, deflectionDeg: 2 } },
    ];
    for (const op of edits) expect(transformOp(op, removeMaxq)).toEqual({ ok: false, reason: 'Someone removed that design point meanwhile; your change to it no longer applies.' });
    expect(transformOp({ ...removeMaxq, opId: 'again' }, removeMaxq)).toEqual({ ok: false, reason: 'Someone already removed that design point.' });
    // Edits of other points, and a hinge move (no point), pass unchanged.
    const other: EditOp = { type: 'setCondition', opId: 'f', pointId: 'point_pullup00000000000000', field: 'mach', value: 3 };
    expect(transformOp(other, removeMaxq)).toEqual({ ok: true, op: other });
    const hinge: EditOp = { type: 'setFlap', opId: 'g', flap: { hingeXOverC: 0.7 } };
    expect(transformOp(hinge, removeMaxq)).toEqual({ ok: true, op: hinge });
  });

  it('a removal that would select a point removed meanwhile forgets that choice', () => {
    const op: EditOp = { type: 'removeDesignPoint', opId: 'x', pointId: 'point_cruise00000000000000', select: 'point_maxq0000000000000000' };
    expect(transformOp(op, removeMaxq)).toEqual({ ok: true, op: { type: 'removeDesignPoint', opId: 'x', pointId: 'point_cruise00000000000000' } });
  });

  it('two points added at once under one name are kept apart: the one ordered second is renamed, on the server and in its author’s view', () => {
    const s0 = threePoints();
    const a: EditOp = { type: 'addDesignPoint', opId: 'a', point: pt('point_aaaa0000000000000000', 'Design point 4'), index: 3 };
    const b: EditOp = { type: 'addDesignPoint', opId: 'b', point: pt('point_bbbb0000000000000000', 'design point 4'), index: 3 };
    const apply = (s: SketchState, op: EditOp) => {
      const r = applyEdit(s, op);
      if (!r.ok) throw new Error(r.reason);
      return r.state;
    };
    // The server ordered a first and rebases b past it; b's author, holding b pending, rebases it
    // past a the same way (a client's view is always the server's state plus its pending edits).
    const bPastA = transformOp(b, a);
    const aPastB = transformOp(a, b, true);
    if (!bPastA.ok || !aPastB.ok) throw new Error('transform refused');
    const serverOrder = apply(apply(s0, a), bPastA.op);
    expect(serverOrder.document.designPoints.map((p) => p.name)).toEqual(['Cruise', 'Pull-up', 'Max q', 'Design point 4', 'design point 4 (2)']);
    expect(aPastB.op).toEqual(a); // ordered first: unchanged
    // A point added under a name someone just gave another point is kept apart too.
    const rename: EditOp = { type: 'renameDesignPoint', opId: 'n', pointId: 'point_pullup00000000000000', name: 'Dash' };
    const add: EditOp = { type: 'addDesignPoint', opId: 'd', point: pt('point_dddd0000000000000000', 'Dash'), index: 0 };
    const moved = transformOp(add, rename);
    expect(moved.ok && moved.op.type === 'addDesignPoint' && moved.op.point.name).toBe('Dash (2)');
  });

  /**
   * An in-memory server with the real server's ordering rule: an edit made on an older revision
   * is transformed past the log since, then applied or refused. Clients are the real sync engine.
   */
  function miniServer(initial: SketchState) {
    let state = initial;
    const log: EditOp[] = [];
    const clients: ReturnType<typeof createSyncEngine>[] = [];
    const outbox: { to: number; msg: ServerMessage }[] = [];
    const id = 'sketch_aaaaaaaaaaaaaaaaaaaa';
    function receive(from: number, msg: ClientMessage) {
      if (msg.type === 'join') {
        outbox.push({ to: from, msg: { type: 'joined', sketchId: id, title: state.title, document: state.document, revision: log.length, people: [], walkthrough: null, you: { connectionId: `c${from}`, userId: `u${from}`, name: 'N', role: 'editor', colour: '#fff' } } });
        return;
      }
      if (msg.type !== 'edit') return;
      const moved = transformPast(msg.op, log.slice(msg.baseRevision));
      const r = moved.ok ? applyEdit(state, moved.op) : moved;
      if (!moved.ok || !r.ok) {
        outbox.push({ to: from, msg: { type: 'ack', sketchId: id, opId: msg.op.opId, status: 'rejected', reason: r.ok ? '' : r.reason } });
        return;
      }
      state = r.state;
      log.push(moved.op);
      const revision = log.length;
      outbox.push({ to: from, msg: { type: 'ack', sketchId: id, opId: msg.op.opId, status: msg.baseRevision === revision - 1 ? 'applied' : 'rebased', revision, op: moved.op } });
      clients.forEach((_, i) => i !== from && outbox.push({ to: i, msg: { type: 'edit', sketchId: id, revision, op: moved.op, userId: `u${from}` } }));
    }
    return {
      get state() {
        return state;
      },
      connect(): number {
        const i = clients.length;
        const engine = createSyncEngine({ send: (m) => receive(i, m) });
        clients.push(engine);
        engine.connectionOpened();
        engine.join(id);
        return i;
      },
      clients,
      /** Delivers the queued server messages, one client's oldest first (network order per client). */
      deliver(pick: (n: number) => number): boolean {
        if (outbox.length === 0) return false;
        const to = itemAt(outbox, pick(outbox.length)).to;
        const k = outbox.findIndex((m) => m.to === to);
        const { msg } = itemAt(outbox.splice(k, 1), 0);
        itemAt(clients, to).receive(msg);
        return true;
      },
    };
  }

  it('property: three people adding, removing, renaming, reordering, selecting and editing points at once converge on the server’s document', async () => {
    const { randomPointEdit, prng } = await import('../../helpers/simClient.ts');
    const { reached } = await import('../../helpers/reached.ts');
    const hits = reached('design point convergence');
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 30 }), fc.integer({ min: 5, max: 40 }), (seed, steps) => {
        const rand = prng(seed);
        const server = miniServer(threePoints());
        const ids = [server.connect(), server.connect(), server.connect()];
        while (server.deliver(() => 0));
        let submitted = 0;
        for (let s = 0; s < steps; s++) {
          if (rand() < 0.55) {
            const c = itemAt(server.clients, itemAt(ids, Math.floor(rand() * ids.length)));
            if (c.state && c.submit(randomPointEdit(c.state.document, rand, `op${s}`)).ok) submitted++;
          } else server.deliver((n) => Math.floor(rand() * n));
        }
        while (server.deliver((n) => Math.floor(rand() * n)));
        if (submitted === 0) return;
        hits.hit();
        for (const c of server.clients) {
          expect(c.pendingCount).toBe(0);
          expect(c.state).toEqual(server.state);
        }
        expect(sketchDocumentSchema.safeParse(server.state.document).success).toBe(true);
      }),
      { numRuns: 300 },
    );
    hits.expectAtLeast(250);
  });
});
