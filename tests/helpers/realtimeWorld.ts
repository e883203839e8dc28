import { eq, asc, and, isNotNull } from 'drizzle-orm';
import { hashPassword } from '../../server/auth/passwords.ts';
import { memberships, sketches, sketchEdits, teams, users } from '../../server/db/schema.ts';
import { newId } from '../../shared/model/ids.ts';
import type { Role } from '../../shared/model/roles.ts';
import { sketchDocumentSchema, type SketchDocument } from '../../shared/model/sketch.ts';
import { applyEdit, type SketchState } from '../../shared/protocol/transform.ts';
import type { EditOp } from '../../shared/protocol/messages.ts';
import type { Db } from '../../server/db/client.ts';
import { itemAt } from '../../shared/util/invariant.ts';
import { sketchSummaryColumns } from '../../server/db/sketchSummary.ts';

export const RT_PASSWORD = 'realtime password';

/** A 16-sided elliptical section, thick enough that small random moves rarely tangle it. */
export function ellipseDocument(): SketchDocument {
  const points: [number, number][] = [];
  for (let i = 0; i < 16; i++) {
    const t = (2 * Math.PI * i) / 16;
    points.push([Math.round((0.5 - 0.5 * Math.cos(t)) * 1e6) / 1e6, Math.round(0.15 * Math.sin(t) * 1e6) / 1e6]);
  }
  return sketchDocumentSchema.parse({ version: 1, section: { points }, condition: { mach: 2.5, alphaDeg: 2 } });
}

export async function seedTeam(db: Db, people: { name: string; role: Role }[]) {
  const teamId = newId('team');
  await db.insert(teams).values({ id: teamId, name: 'Realtime test team' });
  const passwordHash = await hashPassword(RT_PASSWORD);
  const out: { id: string; email: string; role: Role }[] = [];
  for (const p of people) {
    const id = newId('user');
    const email = `${p.name.toLowerCase()}@rt.example`;
    await db.insert(users).values({ id, email, name: p.name, passwordHash });
    await db.insert(memberships).values({ teamId, userId: id, role: p.role });
    out.push({ id, email, role: p.role });
  }
  const sketchId = newId('sketch');
  const initial = ellipseDocument();
  await db.insert(sketches).values({ id: sketchId, teamId, title: 'Shared section', document: initial, createdBy: itemAt(out, 0).id, updatedBy: itemAt(out, 0).id, ...sketchSummaryColumns(initial, 0) });
  return { teamId, users: out, sketchId, initial };
}

/** The stored state, and the state obtained by replaying the applied log from `initial`. */
export async function storedAndReplayed(db: Db, sketchId: string, initial: SketchState) {
  const row = await db.query.sketches.findFirst({ where: eq(sketches.id, sketchId) });
  const log = await db
    .select()
    .from(sketchEdits)
    .where(and(eq(sketchEdits.sketchId, sketchId), isNotNull(sketchEdits.revision)))
    .orderBy(asc(sketchEdits.revision));
  let state = initial;
  for (const e of log) {
    const r = applyEdit(state, e.op as EditOp);
    if (!r.ok) throw new Error(`log replay failed at revision ${e.revision}: ${r.reason}`);
    state = r.state;
  }
  return { row: row!, log, replayed: state };
}
