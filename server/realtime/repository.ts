import { eq, sql } from 'drizzle-orm';
import type { Db } from '../db/client.ts';
import { sketches } from '../db/schema.ts';
import type { Role } from '../../shared/model/roles.ts';
import { findRole } from '../api/auth/repository.ts';

/** What one open socket claims: its session, its user and (optionally) a sketch it is in. */
export interface AccessCheck {
  sessionId: string;
  userId: string;
  sketchId: string | null;
}

/** What the database says about that claim right now. */
export interface AccessResult {
  /** The session still exists, has not expired and still belongs to that user. */
  sessionLive: boolean;
  /** The sketch's team (null when the sketch no longer exists or none was asked about). */
  teamId: string | null;
  /** The user's role in that team (null: not a member). */
  role: Role | null;
}

/**
 * Checks many sockets' claims in one statement: is each session still signed in as its user,
 * and what role does that user hold in the team of the sketch. The realtime layer asks this at
 * join, on messages, when it hears that access changed and in its periodic sweep.
 */
export async function checkAccess(db: Db, checks: readonly AccessCheck[]): Promise<AccessResult[]> {
  if (checks.length === 0) return [];
  const input = JSON.stringify(checks.map((c, i) => ({ i, sid: c.sessionId, user_id: c.userId, sketch_id: c.sketchId })));
  const { rows } = await db.execute<{ i: number; live: boolean; team_id: string | null; role: Role | null }>(sql`
    select c.i,
           exists (select 1 from session s
                    where s.sid = c.sid and s.expire >= now() and s.sess->'passport'->>'user' = c.user_id) as live,
           sk.team_id, m.role
      from jsonb_to_recordset(${input}::jsonb) as c(i int, sid text, user_id text, sketch_id text)
      left join sketches sk on sk.id = c.sketch_id
      left join memberships m on m.team_id = sk.team_id and m.user_id = c.user_id`);
  const out: AccessResult[] = checks.map(() => ({ sessionLive: false, teamId: null, role: null }));
  for (const r of rows) out[r.i] = { sessionLive: r.live, teamId: r.team_id, role: r.role };
  return out;
}

/** The parts of a sketch a socket needs when it joins or resyncs. */
export async function findSketchState(db: Db, sketchId: string) {
  const row = await db.query.sketches.findFirst({ where: eq(sketches.id, sketchId), columns: { teamId: true, title: true, document: true, revision: true } });
  return row ?? null;
}

/** `userId`'s role in the team that owns `sketchId` (null: no such sketch, or not a member). */
export async function roleInSketchTeam(db: Db, userId: string, sketchId: string): Promise<Role | null> {
  const row = await db.query.sketches.findFirst({ where: eq(sketches.id, sketchId), columns: { teamId: true } });
  return row ? findRole(db, userId, row.teamId) : null;
}
