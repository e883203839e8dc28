import type pg from 'pg';
import { newId } from '../../shared/model/ids.ts';
import { DEMO_PEOPLE, DEMO_SKETCHES, DEMO_TEAM } from '../../server/db/seed.ts';
import { solveDocument } from '../../server/api/sketches/solveDocument.ts';
import { itemAt } from '../../shared/util/invariant.ts';

/**
 * The demo (`npm start`'s seed: team, people, sketches with the seed's own solves, the marker)
 * written with plain SQL into only the columns an install had at migration 0008, so migration
 * tests can seed a database that stands at an older migration. `seedDemoOnce` cannot: Drizzle
 * names every column of today's schema in its inserts. Passwords are placeholders (nobody signs in).
 */
export async function seedDemoAsBefore(client: pg.Client): Promise<{ teamId: string; userIds: string[]; sketchIds: string[] }> {
  const q = (text: string, values: unknown[] = []) => client.query(text, values);
  const teamId = newId('team');
  await q(`insert into teams (id, name) values ($1, $2)`, [teamId, DEMO_TEAM]);
  const userIds: string[] = [];
  for (const person of DEMO_PEOPLE) {
    const id = newId('user');
    await q(`insert into users (id, email, name, password_hash) values ($1, $2, $3, 'x')`, [id, person.email, person.name]);
    await q(`insert into memberships (team_id, user_id, role) values ($1, $2, $3)`, [teamId, id, person.role]);
    userIds.push(id);
  }
  const sketchIds: string[] = [];
  for (const [i, s] of DEMO_SKETCHES.entries()) {
    const id = newId('sketch');
    const author = itemAt(userIds, i % 2); // the owner and the editor drew them
    const solved = solveDocument(s.document);
    await q(
      `insert into sketches (id, team_id, title, document, created_by, updated_by, last_solve_status, last_result, result_revision)
       values ($1, $2, $3, $4, $5, $5, $6, $7, 0)`,
      [id, teamId, s.title, JSON.stringify(s.document), author, solved.status, JSON.stringify(solved.result)],
    );
    sketchIds.push(id);
  }
  await q(`insert into app_meta (key, value) values ('demo_seeded_at', $1)`, [JSON.stringify(new Date().toISOString())]);
  return { teamId, userIds, sketchIds };
}
