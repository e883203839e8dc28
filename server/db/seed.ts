import { eq } from 'drizzle-orm';
import type { Db } from './client.ts';
import { appMeta, memberships, sketches, teams, users } from './schema.ts';
import { newId } from '../../shared/model/ids.ts';
import type { Role } from '../../shared/model/roles.ts';
import { FIRST_DESIGN_POINT_ID, sketchDocumentSchema, type SketchDocument } from '../../shared/model/sketch.ts';
import { hashPassword } from '../auth/passwords.ts';
import { solveDocument } from '../api/sketches/solveDocument.ts';
import { sketchSummaryColumns } from './sketchSummary.ts';

/**
 * Demo data: Harrowgate Dynamics, a fictional maker of small sounding rockets, and the fins
 * group working on its (equally fictional) HD-7 "Tern" vehicle. Every name, geometry and
 * condition here is invented for the demo.
 */
export const DEMO_TEAM = 'Harrowgate Dynamics — fins group';
export const DEMO_PASSWORD = 'harrowgate-demo';
interface DemoPerson {
  name: string;
  email: string;
  role: Role;
}

/** The demo team; the first person is its owner (whom start-up names for signing in). */
export const DEMO_PEOPLE: readonly [DemoPerson, ...DemoPerson[]] = [
  { name: 'Ines Marlow', email: 'ines@harrowgate.example', role: 'owner' },
  { name: 'Tomasz Reyes', email: 'tomasz@harrowgate.example', role: 'editor' },
  { name: 'Priya Vance', email: 'priya@harrowgate.example', role: 'reviewer' },
  { name: 'Oren Lindqvist', email: 'oren@harrowgate.example', role: 'viewer' },
];

/** One demo design point: name, Mach, α, altitude (m) and, on a sketch with a flap, its deflection. */
interface DemoPoint {
  name: string;
  mach: number;
  alphaDeg: number;
  altitudeM?: number;
  flapDeg?: number;
}

function doc(section: [number, number][], points: DemoPoint[], extra: Partial<Pick<SketchDocument, 'notes' | 'loads' | 'flap'>> = {}): SketchDocument {
  return sketchDocumentSchema.parse({
    version: 2,
    section: { points: section },
    designPoints: points.map((p, i) => ({
      id: i === 0 ? FIRST_DESIGN_POINT_ID : `point_demo${i + 1}`.padEnd(26, 'a'),
      name: p.name,
      condition: { mach: p.mach, alphaDeg: p.alphaDeg, altitudeM: p.altitudeM ?? null },
      flapDeflectionDeg: p.flapDeg ?? 0,
    })),
    selectedPointId: FIRST_DESIGN_POINT_ID,
    ...extra,
  });
}

/** Faceted circular-arc (biconvex) section: `perSide` facets on each surface, thickness `t`. */
function facetedBiconvex(t: number, perSide: number): [number, number][] {
  const upper: [number, number][] = [];
  for (let i = 0; i <= perSide; i++) {
    const x = i / perSide;
    upper.push([x, 2 * t * x * (1 - x)]);
  }
  const lower = upper.slice(1, -1).reverse().map(([x, y]) => [x, -y] as [number, number]);
  return [...upper, ...lower];
}

export const DEMO_SKETCHES: { title: string; document: SketchDocument }[] = [
  {
    title: 'Tern fin root — double wedge, 5% thick, ridge at 40%',
    document: doc(
      [[0, 0], [0.4, 0.025], [1, 0], [0.4, -0.025]],
      [
        { name: 'Burnout', mach: 2.6, alphaDeg: 4, altitudeM: 12_000 },
        { name: 'Max q', mach: 2.2, alphaDeg: 2, altitudeM: 7_500 },
        { name: 'Pull-up', mach: 2.4, alphaDeg: 9, altitudeM: 10_000 },
      ],
      { notes: 'Root section of the HD-7 Tern tail fin: burnout, max q and the pull-up after burnout.', loads: { chordM: 0.32, spanM: 0.18, friction: 'turbulent' } },
    ),
  },
  {
    title: 'Tern fin tip — hexagonal, 4% thick',
    document: doc([[0, 0], [0.25, 0.02], [0.75, 0.02], [1, 0], [0.75, -0.02], [0.25, -0.02]], [{ name: 'Coast', mach: 3.1, alphaDeg: 2, altitudeM: 18_000 }], {
      loads: { chordM: 0.2, spanM: 0.18, friction: 'turbulent' },
    }),
  },
  {
    title: 'Tern canard — faceted biconvex, 6%, six facets a side',
    document: doc(
      facetedBiconvex(0.06, 6),
      [
        { name: 'Trim', mach: 1.8, alphaDeg: 6, altitudeM: 6_000, flapDeg: 5 },
        { name: 'Pitch-over', mach: 2.1, alphaDeg: 3, altitudeM: 9_000, flapDeg: -8 },
      ],
      { flap: { hingeXOverC: 0.7 }, loads: { chordM: 0.12, spanM: 0.09, friction: 'turbulent' } },
    ),
  },
  {
    title: 'Tern intake ramp — two-stage compression',
    document: doc([[0, 0], [0.4, 0.0705], [0.8, 0.174], [1, 0.16]], [{ name: 'Design Mach', mach: 3, alphaDeg: 0 }]),
  },
  {
    title: 'Booster fin — thick root at low Mach (nose shock detaches)',
    document: doc([[0, 0], [0.5, 0.06], [1, 0], [0.5, -0.06]], [{ name: 'Boost', mach: 1.4, alphaDeg: 5 }]),
  },
];

/**
 * Seeds the demo once per database: a marker row in app_meta records that it happened, so
 * deleting demo sketches later does not bring them back.
 */
export async function seedDemoOnce(db: Db): Promise<'seeded' | 'already'> {
  const marker = await db.query.appMeta.findFirst({ where: eq(appMeta.key, 'demo_seeded_at') });
  if (marker) return 'already';
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await db.transaction(async (tx) => {
    const teamId = newId('team');
    await tx.insert(teams).values({ id: teamId, name: DEMO_TEAM });
    const ids: string[] = [];
    for (const person of DEMO_PEOPLE) {
      const existing = await tx.query.users.findFirst({ where: eq(users.email, person.email) });
      const id = existing?.id ?? newId('user');
      if (!existing) await tx.insert(users).values({ id, email: person.email, name: person.name, passwordHash });
      await tx.insert(memberships).values({ teamId, userId: id, role: person.role });
      ids.push(id);
    }
    for (const [i, s] of DEMO_SKETCHES.entries()) {
      const author = ids[i % 2]; // the owner and the editor drew them
      const solved = solveDocument(s.document);
      await tx.insert(sketches).values({ id: newId('sketch'), teamId, title: s.title, document: s.document, createdBy: author, updatedBy: author, lastSolveStatus: solved.status, lastResult: solved.result, resultRevision: 0, ...sketchSummaryColumns(s.document, 0) });
    }
    await tx.insert(appMeta).values({ key: 'demo_seeded_at', value: new Date().toISOString() });
  });
  return 'seeded';
}
