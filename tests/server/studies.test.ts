import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { analyseSketch } from '../../shared/flight/analyseSketch.ts';
import { studyRow } from '../../shared/flight/study.ts';
import { RESULTS_CAUTION } from '../../shared/model/caution.ts';
import { sketchCase, type SketchDocument } from '../../shared/model/sketch.ts';
import { oneCondition } from '../helpers/documents.ts';
import { STUDY_COLUMNS, packStudyRows, type StudyDetail } from '../../shared/model/study.ts';
import { CSRF, createWorld, freshSketch, signIn, type World } from '../helpers/world.ts';
import { pdfFonts, pdfPageCount, pdfText } from '../helpers/pdf.ts';

/** Our own fin: 6 % diamond, 25 % flap, at 9 km on a 0.3 m chord. */
const FIN: SketchDocument = oneCondition({
  section: { points: [[0, 0], [0.5, 0.03], [1, 0], [0.5, -0.03]] },
  condition: { mach: 2.2, alphaDeg: 3, gamma: 1.4, altitudeM: 9000 },
  flap: { hingeXOverC: 0.75, deflectionDeg: 4 },
  loads: { chordM: 0.3, spanM: 0.25, friction: 'turbulent' },
});

const DEFINITION = {
  mach: { kind: 'range', start: 1.6, end: 3.2, step: 0.4 },
  alpha: { startDeg: -4, endDeg: 12, stepDeg: 2 },
  flapDeg: [-5, 0, 5],
  altitudeM: 9000,
  friction: 'turbulent',
} as const;

/** Deserialises a binary body (supertest buffers only known binary types by default). */
const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};

describe('studies, unit preferences and reports API', () => {
  let world: World;
  const cookie = {} as Record<'owner' | 'editor' | 'viewer', string>; // filled in beforeAll
  let sketchId: string;
  let revision: number;

  const as = (who: 'owner' | 'editor' | 'viewer') => ({
    get: (url: string) => request(world.app).get(url).set('Cookie', cookie[who]),
    pdf: (url: string) => request(world.app).get(url).set('Cookie', cookie[who]).buffer(true).parse(binary),
    post: (url: string, body: object = {}) => request(world.app).post(url).set(CSRF).set('Cookie', cookie[who]).send(body),
    patch: (url: string, body: object) => request(world.app).patch(url).set(CSRF).set('Cookie', cookie[who]).send(body),
    put: (url: string, body: object) => request(world.app).put(url).set(CSRF).set('Cookie', cookie[who]).send(body),
    delete: (url: string) => request(world.app).delete(url).set(CSRF).set('Cookie', cookie[who]),
  });

  beforeAll(async () => {
    world = await createWorld();
    for (const who of ['owner', 'editor', 'viewer'] as const) cookie[who] = (await signIn(world, who))!;
    sketchId = await freshSketch(world, world.teamId, 'Tern canard, 6% diamond');
    // Saved through the API so the server stores its own analysis with the revision.
    const saved = await as('editor').put(`/api/sketches/${sketchId}/document`, { document: FIN, baseRevision: 0 });
    expect(saved.status).toBe(200);
    revision = saved.body.revision;
  });
  afterAll(async () => world?.close());

  it('an editor runs a study on the server; every stored row equals a single analysis of the stored sketch [ST1] [ST3]', async () => {
    const res = await as('editor').post(`/api/sketches/${sketchId}/studies`, { name: 'Canard envelope', definition: DEFINITION });
    expect(res.status).toBe(201);
    const study = res.body as StudyDetail;
    expect(study).toMatchObject({ name: 'Canard envelope', sketchId, revision, points: 5 * 9 * 3, createdByName: 'Editor Person' });
    expect(study.id).toMatch(/^study_/);
    expect(study.results.columns).toEqual(STUDY_COLUMNS);
    expect(study.results.machs).toEqual([1.6, 2, 2.4, 2.8, 3.2]);
    let i = 0;
    for (const flapDeg of [-5, 0, 5]) {
      for (const mach of study.results.machs) {
        for (const alphaDeg of study.results.alphasDeg) {
          const single = analyseSketch(sketchCase(FIN), { waves: false, mach, alphaDeg, flapDeg, altitudeM: 9000, friction: 'turbulent' });
          expect(study.results.rows[i++]).toEqual(packStudyRows([studyRow(single, mach, alphaDeg, flapDeg)])[0]);
        }
      }
    }
    expect(Object.values(study.results.counts).reduce((a, b) => a + b, 0)).toBe(135);
  });

  it('lists studies newest first with pagination, opens one, and deletes it (editor); viewers read but cannot run', async () => {
    for (const name of ['Low Mach', 'High Mach']) {
      expect((await as('editor').post(`/api/sketches/${sketchId}/studies`, { name, definition: { ...DEFINITION, flapDeg: [0], mach: { kind: 'list', values: [name === 'Low Mach' ? 1.5 : 4] } } })).status).toBe(201);
    }
    const page = await as('viewer').get(`/api/sketches/${sketchId}/studies?limit=2&offset=0`);
    expect(page.status).toBe(200);
    expect(page.body).toMatchObject({ total: 3, limit: 2, offset: 0 });
    expect(page.body.items.map((s: { name: string }) => s.name)).toEqual(['High Mach', 'Low Mach']);
    expect(page.body.items[0]).not.toHaveProperty('results');
    const second = await as('viewer').get(`/api/sketches/${sketchId}/studies?limit=2&offset=2`);
    expect(second.body.items.map((s: { name: string }) => s.name)).toEqual(['Canard envelope']);

    const opened = await as('viewer').get(`/api/studies/${page.body.items[0].id}`);
    expect(opened.status).toBe(200);
    expect(opened.body.results.machs).toEqual([4]);
    expect((await as('viewer').post(`/api/sketches/${sketchId}/studies`, { name: 'x', definition: DEFINITION })).status).toBe(403);
    expect((await as('viewer').delete(`/api/studies/${page.body.items[0].id}`)).status).toBe(403);
    expect((await as('editor').delete(`/api/studies/${page.body.items[0].id}`)).status).toBe(204);
    expect((await as('viewer').get(`/api/studies/${page.body.items[0].id}`)).status).toBe(404);
  });

  it('refuses a definition with a named field, and a study over the point limit [ST4]', async () => {
    const bad = await as('editor').post(`/api/sketches/${sketchId}/studies`, { name: 'Bad', definition: { ...DEFINITION, mach: { kind: 'range', start: 3, end: 2, step: 0.1 } } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toContain('definition.mach.end: must not be below the start');
    const huge = await as('editor').post(`/api/sketches/${sketchId}/studies`, {
      name: 'Huge',
      definition: { mach: { kind: 'range', start: 1.1, end: 5, step: 0.05 }, alpha: { startDeg: -20, endDeg: 20, stepDeg: 0.25 }, flapDeg: [-4, 0, 4] },
    });
    expect(huge.status).toBe(400);
    expect(huge.body.error.message).toMatch(/at most 20000/);
  });

  it('keeps each person’s unit system: SI by default, US customary after a change, others unaffected', async () => {
    expect((await as('viewer').get('/api/preferences')).body).toEqual({ unitSystem: 'si' });
    const changed = await as('viewer').patch('/api/preferences', { unitSystem: 'us' });
    expect(changed.status).toBe(200);
    expect(changed.body).toEqual({ unitSystem: 'us' });
    expect((await as('viewer').get('/api/preferences')).body).toEqual({ unitSystem: 'us' });
    expect((await as('editor').get('/api/preferences')).body).toEqual({ unitSystem: 'si' });
    const bad = await as('viewer').patch('/api/preferences', { unitSystem: 'imperial' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toContain('unitSystem');
  });

  it('the report is a PDF with embedded fonts, the revision, the caution and loads in the requester’s units', async () => {
    const res = await as('viewer').pdf(`/api/sketches/${sketchId}/report.pdf`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="Tern-canard-6-diamond-r\d+-report\.pdf"$/);
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // Design points, wave map; condition, Cp chart, coefficients; loads, per-facet and coordinates tables.
    expect(pdfPageCount(pdf)).toBe(3);
    const fonts = pdfFonts(pdf);
    expect(fonts.map((f) => f.name)).toEqual(expect.arrayContaining(['WorkSans-Regular', 'WorkSans-SemiBold', 'DejaVuSans']));
    expect(fonts.every((f) => f.embedded)).toBe(true);
    const text = pdfText(pdf).replace(/\s+/g, ' ');
    expect(text).toContain('Tern canard, 6% diamond');
    expect(text).toContain(`Sketch revision ${revision}`);
    expect(text).toContain(RESULTS_CAUTION);
    expect(text).toContain('units: US customary'); // the viewer chose US customary above
    expect(text).toMatch(/q∞ \(dynamic pressure\) [\d,.]+ lbf\/ft²/);
    expect(text).toContain('second-order');
    expect(text).toContain('ch (hinge moment');
    // What the numbers are referred to, and how the loads were made, are stated.
    expect(text).toContain('Reference: the section as drawn (the flap deflection does not change it), chord c = 1 drawing units');
    expect(text).toContain('ch over q∞·c_f² about the hinge, c_f = 0.25 c (drawn)');
    expect(text).toContain('perfect gas with R = 287.05 J/(kg·K) and the condition’s γ');
    expect(text).toMatch(/Friction: flat-plate estimate on each surface's wetted length, turbulent flow over the whole length/);
    // The same report in SI when asked explicitly.
    const si = pdfText((await as('viewer').pdf(`/api/sketches/${sketchId}/report.pdf?units=si`)).body as Buffer).replace(/\s+/g, ' ');
    expect(si).toMatch(/q∞ \(dynamic pressure\) [\d,.]+ Pa/);
  });

  it('with ?study= the report adds the study’s charts and tables; a study of another sketch is not found', async () => {
    const list = await as('viewer').get(`/api/sketches/${sketchId}/studies`);
    const studyId = list.body.items.find((s: { name: string }) => s.name === 'Canard envelope').id;
    const res = await as('viewer').pdf(`/api/sketches/${sketchId}/report.pdf?study=${studyId}`);
    expect(res.status).toBe(200);
    const pdf = res.body as Buffer;
    expect(pdfPageCount(pdf)).toBe(7);
    const text = pdfText(pdf).replace(/\s+/g, ' ');
    expect(text).toContain('Study: Canard envelope');
    expect(text).toContain('Drag polar');
    expect(text).toContain('Hinge moment ch against δ');
    expect(text).toContain('Per Mach number: nose shock detachment and best L/D');
    expect(text).toContain(`page 7 of 7`);

    const other = await freshSketch(world);
    expect((await as('viewer').get(`/api/sketches/${other}/report.pdf?study=${studyId}`)).status).toBe(404);
    expect((await as('viewer').get(`/api/sketches/${sketchId}/report.pdf?study=nonsense`)).status).toBe(400);
  });
});
