import { eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { users } from '../../db/schema.ts';
import type { UnitSystem } from '../../../shared/flight/units.ts';

export async function findPreferences(db: Db, userId: string): Promise<{ unitSystem: UnitSystem } | null> {
  const row = await db.query.users.findFirst({ where: eq(users.id, userId), columns: { unitSystem: true } });
  return row ?? null;
}

export async function updatePreferences(db: Db, userId: string, values: { unitSystem?: UnitSystem }): Promise<void> {
  if (Object.keys(values).length === 0) return;
  await db.update(users).set({ ...values, updatedAt: sql`now()` }).where(eq(users.id, userId));
}
