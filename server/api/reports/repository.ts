import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { teams } from '../../db/schema.ts';

export async function findTeamName(db: Db, teamId: string): Promise<string | null> {
  const row = await db.query.teams.findFirst({ where: eq(teams.id, teamId), columns: { name: true } });
  return row?.name ?? null;
}
