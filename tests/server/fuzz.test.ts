/**
 * The fuzz suite: at least MIN_REQUESTS malformed requests across every API route the app
 * answers (found by walking its router, so a new route is covered the day it is added) — wrong
 * types, NUL characters, unpaired surrogates, huge and deeply nested bodies, bad JSON, bad
 * uploads, bad ids — each answered with a 4xx JSON error naming the problem, never a 5xx; no
 * table gains or loses a row; the server still answers afterwards.
 */
import { createServer } from 'node:http';
import { once } from 'node:events';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { sql } from 'drizzle-orm';
import { mailMessages } from '../../server/db/schema.ts';
import { newId } from '../../shared/model/ids.ts';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import { listRoutes } from '../helpers/routes.ts';
import { firstItem, itemAt } from '../../shared/util/invariant.ts';
import { CSRF, createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';

const MIN_REQUESTS = 1000;

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

/** A valid body for every route that reads one; the fuzz breaks one part of it at a time. */
function validBodies(w: World): Record<string, Json> {
  const doc = defaultSketchDocument() as unknown as Json;
  return {
    'POST /api/auth/sign-in': { email: w.users.owner.email, password: 'a password' },
    'POST /api/auth/sign-up': { name: 'New Person', email: 'new.person@example.test', password: 'a long password', teamName: 'New team' },
    'POST /api/auth/sign-up/confirm': { token: 'x'.repeat(43) },
    'POST /api/auth/password-reset': { email: w.users.owner.email },
    'POST /api/auth/password-reset/confirm': { token: 'x'.repeat(43), password: 'another long pw' },
    'POST /api/auth/invitations/preview': { teamId: w.teamId, token: 'x'.repeat(43) },
    'POST /api/auth/invitations/accept': { teamId: w.teamId, token: 'x'.repeat(43), name: 'New Person', password: 'a fine password' },
    'POST /api/teams': { name: 'Another team' },
    'PATCH /api/teams/:teamId/members/:userId': { role: 'editor' },
    'POST /api/teams/:teamId/invitations': { email: 'invited@example.test', role: 'viewer' },
    'POST /api/teams/:teamId/sketches': { title: 'New one', document: doc },
    'PATCH /api/sketches/:sketchId': { title: 'Renamed' },
    'PUT /api/sketches/:sketchId/document': { document: doc, baseRevision: 0 },
    'POST /api/sketches/:sketchId/pins': { target: { kind: 'wave', waveId: 'w1', label: 'Nose shock', at: [0.5, 0.1] }, body: 'Why so thick here?', mentions: [w.users.editor.id] },
    'POST /api/pins/:pinId/replies': { body: 'Agreed.', mentions: [w.users.editor.id] },
    'POST /api/sketches/:sketchId/snapshots': { name: 'Before the thinning', note: 'A note' },
    'POST /api/sketches/:sketchId/import': { points: [[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]], fileName: 'fin.csv' },
    'POST /api/sketches/:sketchId/approvals': { revision: 0, note: 'Loads checked.' },
    'POST /api/sketches/:sketchId/change-requests': { revision: 0, note: 'Sharpen the nose.' },
    'POST /api/sketches/:sketchId/review-reset': { confirm: true },
    'POST /api/sketches/:sketchId/review-requests': { reviewerIds: [w.users.reviewer.id], message: 'Please look' },
    'POST /api/sketches/:sketchId/studies': { name: 'Envelope', definition: { mach: { kind: 'list', values: [1.5, 2.5] }, alpha: { startDeg: -2, endDeg: 2, stepDeg: 2 }, flapDeg: [0], altitudeM: 1000, friction: 'turbulent' } },
    'PATCH /api/preferences': { unitSystem: 'si' },
    'POST /api/solve': { name: 'Case', section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] }, flow: { mach: 2, alphaDeg: 2, gamma: 1.4 }, options: { waves: true } },
  };
}

/** Routes that change state without reading a body: only what fails before the route is sent. */
const BODYLESS = new Set([
  'POST /api/auth/sign-out',
  'POST /api/sketches/:sketchId/duplicate',
  'POST /api/pins/:pinId/resolve',
  'POST /api/pins/:pinId/reopen',
  'POST /api/snapshots/:snapshotId/restore',
]);

/** Ids that do not name anything this caller may touch, in shapes that stress the id check. */
const BAD_IDS = [
  'x',
  '%00',
  'sketch_%00aaaaaaaaaaaaaaaaaaa',
  '%ED%A0%80', // an encoded unpaired surrogate (not UTF-8)
  '%F0%9F', // a truncated UTF-8 sequence
  'sketch_AAAAAAAAAAAAAAAAAAAA',
  'team_zzzzzzzzzzzzzzzzzzzz',
  "'%20OR%20'1'%3D'1",
  '..%2F..%2Fetc%2Fpasswd',
  'a'.repeat(3000),
];

/** Ways to break one value of a valid body (each always invalid where it is used). */
function breakValue(v: Json): Json[] {
  const deep: Json = JSON.parse(`${'{"a":'.repeat(40)}1${'}'.repeat(40)}`);
  if (typeof v === 'string') return ['bad\u0000text', 'half \uD800 pair', 'x'.repeat(20_000), 7, [], {}, null, true, deep];
  // (Not null: some numbers are nullable, e.g. an altitude.)
  if (typeof v === 'number') return ['12', 'NaN', [v], {}, true, deep];
  if (typeof v === 'boolean') return ['true', 1, null];
  if (Array.isArray(v)) return ['list', 3, {}, null, Array.from({ length: 3000 }, () => v[0] ?? 0), deep];
  if (v && typeof v === 'object') return ['object', 5, [], deep];
  return [];
}

/** Every path to a value inside `body` (objects and arrays, up to a few entries of each array). */
function paths(body: Json, at: (string | number)[] = []): (string | number)[][] {
  const out: (string | number)[][] = at.length ? [at] : [];
  if (Array.isArray(body)) body.slice(0, 2).forEach((c, i) => out.push(...paths(c, [...at, i])));
  else if (body && typeof body === 'object') for (const [k, c] of Object.entries(body)) out.push(...paths(c, [...at, k]));
  return out;
}

function withValue(body: Json, path: (string | number)[], value: Json): Json {
  const copy = structuredClone(body);
  let node = copy as Record<string | number, Json>;
  for (const part of path.slice(0, -1)) node = node[part] as Record<string | number, Json>;
  node[itemAt(path, -1)] = value;
  return copy;
}

function valueAt(body: Json, path: (string | number)[]): Json {
  let node = body;
  for (const part of path) node = (node as Record<string | number, Json>)[part] ?? null;
  return node;
}

interface Probe {
  what: string;
  method: string;
  url: string;
  cookie: string | null;
  csrf?: boolean;
  contentType?: string;
  body?: string | Buffer;
  /** A query the route may ignore: then any non-5xx answer is right. */
  mayIgnore?: boolean;
}

describe('fuzz: malformed requests at every route', () => {
  let world: World;
  let owner: string;
  const params: Record<string, string> = {};

  beforeAll(async () => {
    world = await createWorld();
    owner = (await signIn(world, 'owner'))!;
    const api = (method: 'post' | 'get', url: string, body?: object) => request(world.app)[method](url).set(CSRF).set('Cookie', owner).send(body);
    const sketchId = await freshSketch(world, world.teamId, 'Fuzz target');
    const pin = await api('post', `/api/sketches/${sketchId}/pins`, { target: { kind: 'point', at: [0.5, 0.1] }, body: 'A pin' });
    const snapshot = await api('post', `/api/sketches/${sketchId}/snapshots`, { name: 'Kept' });
    const study = await api('post', `/api/sketches/${sketchId}/studies`, { name: 'Sweep', definition: { mach: { kind: 'list', values: [2] }, alpha: { startDeg: 0, endDeg: 2, stepDeg: 1 } } });
    const invitation = await api('post', `/api/teams/${world.teamId}/invitations`, { email: 'later@example.test', role: 'viewer' });
    await world.mailer.idle();
    const mailId = newId('mail');
    await world.database.db.insert(mailMessages).values({ id: mailId, fromAddress: 'a@b.test', toAddresses: [world.users.owner.email], subject: 'Hello', textBody: 'Hi', raw: 'Hi' });
    for (const r of [pin, snapshot, study, invitation]) expect(r.status, JSON.stringify(r.body)).toBe(201);
    Object.assign(params, {
      teamId: world.teamId,
      sketchId,
      pinId: pin.body.id,
      snapshotId: snapshot.body.id,
      studyId: study.body.id,
      userId: world.users.viewer.id,
      invitationId: invitation.body.id,
      mailId,
    });
  });
  afterAll(async () => world?.close());

  /** Row count of every table but the ones requests legitimately touch (sessions, rate-limit counters). */
  async function rowCounts(): Promise<Record<string, number>> {
    const tables = await world.database.db.execute<{ name: string }>(sql`
      select table_name as name from information_schema.tables
       where table_schema = 'public' and table_type = 'BASE TABLE' and table_name not in ('session', 'rate_limits')`);
    const out: Record<string, number> = {};
    for (const { name } of tables.rows) {
      const r = await world.database.db.execute<{ n: string }>(sql.raw(`select count(*) as n from "${name}"`));
      out[name] = Number(firstItem(r.rows).n);
    }
    return out;
  }

  function fill(path: string, override?: [string, string]): string {
    return path.replace(/:(\w+)/g, (_, name: string) => {
      if (override && override[0] === name) return override[1];
      const value = params[name];
      if (value === undefined) throw new Error(`the fuzz suite has no valid value for :${name}; add one in beforeAll`);
      return value;
    });
  }

  function probesFor(route: string, bodies: Record<string, Json>): Probe[] {
    const [method = '', path = ''] = route.split(' ');
    const out: Probe[] = [];
    const json = (what: string, body: Json, url = fill(path)) => out.push({ what, method, url, cookie: owner, contentType: 'application/json', body: JSON.stringify(body) });
    // Bad ids, one path parameter at a time.
    for (const name of [...path.matchAll(/:(\w+)/g)].map((m) => m[1] ?? '')) {
      for (const bad of BAD_IDS) {
        const probe: Probe = { what: `:${name} = ${bad.slice(0, 30)}`, method, url: fill(path, [name, bad]), cookie: owner };
        if (bodies[route] !== undefined) Object.assign(probe, { contentType: 'application/json', body: JSON.stringify(bodies[route]) });
        out.push(probe);
      }
      // A real id of another kind (a pin's id where a sketch's goes).
      const other = (name === 'pinId' ? params.sketchId : params.pinId) ?? '';
      out.push({ what: `:${name} of another kind`, method, url: fill(path, [name, other]), cookie: owner });
    }
    if (method === 'GET') {
      for (const q of ['limit=abc', 'limit=-1', 'limit=1&limit=2', 'offset=1e400', 'status=%00', 'status=everything', 'study=%ED%A0%80', 'study=x', 'units=furlongs', 'scope=%00', 'limit[a]=1']) {
        out.push({ what: `?${q}`, method, url: `${fill(path)}?${q}`, cookie: owner, mayIgnore: true });
      }
      return out;
    }
    // What fails before any route: bad JSON, too large, too deep, an unsupported charset.
    out.push({ what: 'bad JSON', method, url: fill(path), cookie: owner, contentType: 'application/json', body: '{"title": "unfinished' });
    out.push({ what: 'JSON with a NUL outside strings', method, url: fill(path), cookie: owner, contentType: 'application/json', body: '{"title"\u0000: 1}' });
    out.push({ what: 'over 1 MB', method, url: fill(path), cookie: owner, contentType: 'application/json', body: JSON.stringify({ title: 'x'.repeat(1_100_000) }) });
    out.push({ what: '5000 levels deep', method, url: fill(path), cookie: owner, contentType: 'application/json', body: `${'['.repeat(5000)}${']'.repeat(5000)}` });
    out.push({ what: 'unsupported charset', method, url: fill(path), cookie: owner, contentType: 'application/json; charset=klingon', body: '{}' });
    out.push({ what: 'no CSRF header', method, url: fill(path), cookie: owner, csrf: false, contentType: 'application/json', body: JSON.stringify(bodies[route] ?? {}) });
    const valid = bodies[route];
    if (valid === undefined) return out;
    // Whole bodies of the wrong shape, and bad uploads.
    for (const whole of ['[]', '[1, 2]', '"text"', '123', 'null', '{"__proto__": {"admin": true}}', '{"constructor": {"prototype": {"x": 1}}}']) json(`body ${whole}`, JSON.parse(whole));
    out.push({ what: 'a multipart upload', method, url: fill(path), cookie: owner, contentType: 'multipart/form-data; boundary=XyZ', body: '--XyZ\r\nContent-Disposition: form-data; name="file"; filename="fin.csv"\r\nContent-Type: text/csv\r\n\r\n0,0\n1,0\n0.5,0.1\n--XyZ--\r\n' });
    out.push({ what: 'a binary upload', method, url: fill(path), cookie: owner, contentType: 'application/octet-stream', body: Buffer.from([0, 255, 254, 0, 1, 2, 3]) });
    out.push({ what: 'a CSV file as the body', method, url: fill(path), cookie: owner, contentType: 'text/csv', body: '=HYPERLINK("x")\n0,0\n1,0\n' });
    // One value broken at a time.
    for (const p of paths(valid)) {
      for (const broken of breakValue(valueAt(valid, p))) json(`${p.join('.')} = ${JSON.stringify(broken).slice(0, 40)}`, withValue(valid, p, broken));
    }
    return out;
  }

  it(`sends at least ${MIN_REQUESTS} malformed requests to every route: 4xx JSON, no 5xx, nothing written, server alive`, { timeout: 300_000 }, async () => {
    const routes = listRoutes(world.app).filter((r) => r.includes(' /api/'));
    const bodies = validBodies(world);
    const writing = routes.filter((r) => !r.startsWith('GET ') && !r.startsWith('DELETE '));
    // Every route that changes state is declared: with a valid body to break, or as reading none.
    expect(writing.filter((r) => bodies[r] === undefined && !BODYLESS.has(r))).toEqual([]);
    expect(Object.keys(bodies).filter((r) => !routes.includes(r))).toEqual([]);

    const before = await rowCounts();
    const problems: string[] = [];
    let sent = 0;
    const perRoute: Record<string, number> = {};
    const queue = routes.flatMap((route) => probesFor(route, bodies).map((probe) => ({ route, probe })));
    // One listening server for all of them, a few requests in flight at a time.
    const server = createServer(world.app).listen(0, '127.0.0.1');
    await once(server, 'listening');
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    const worker = async () => {
      for (let next = queue.shift(); next; next = queue.shift()) {
        const { route, probe } = next;
        let req = request(base)[probe.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete'](probe.url);
        if (probe.csrf !== false) req = req.set(CSRF);
        if (probe.cookie) req = req.set('Cookie', probe.cookie);
        if (probe.contentType) req = req.set('Content-Type', probe.contentType);
        const res = probe.body === undefined ? await req : await req.send(probe.body);
        sent++;
        perRoute[route] = (perRoute[route] ?? 0) + 1;
        const label = `${route} [${probe.what}] → ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`;
        if (res.status >= 500) problems.push(`5xx: ${label}`);
        else if (!probe.mayIgnore && res.status < 400) problems.push(`not refused: ${label}`);
        else if (res.status >= 400 && !(typeof res.body?.error?.code === 'string' && typeof res.body?.error?.message === 'string' && /json/.test(String(res.headers['content-type'])))) {
          problems.push(`not a JSON error: ${label}`);
        }
      }
    };
    try {
      await Promise.all(Array.from({ length: 6 }, worker));
    } finally {
      server.closeAllConnections();
      server.close();
    }
    if (process.env.SHOW_REACHED) console.log(`fuzz: ${sent} requests over ${routes.length} routes`, perRoute);
    expect(problems).toEqual([]);
    expect(Object.keys(perRoute).sort()).toEqual([...routes].sort());
    expect(sent, `only ${sent} malformed requests were sent`).toBeGreaterThanOrEqual(MIN_REQUESTS);
    expect(await rowCounts()).toEqual(before);
    // Alive, and still serving the person whose session the fuzz used.
    expect((await request(world.app).get('/api/health')).status).toBe(200);
    expect((await request(world.app).get(`/api/sketches/${params.sketchId}`).set('Cookie', owner)).status).toBe(200);
  });
});
