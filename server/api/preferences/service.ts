import type { Db } from '../../db/client.ts';
import { HttpError } from '../../http/errors.ts';
import { DEFAULT_PREFERENCES, preferencesSchema, type Preferences, type UpdatePreferences } from '../../../shared/model/preferences.ts';
import * as repo from './repository.ts';

export async function getPreferences(db: Db, userId: string): Promise<Preferences> {
  const row = await repo.findPreferences(db, userId);
  if (!row) throw new HttpError(401, 'signed_out', 'Sign in to continue.');
  // A value the schema no longer knows falls back to the default rather than failing the page.
  const parsed = preferencesSchema.safeParse(row);
  return parsed.success ? parsed.data : DEFAULT_PREFERENCES;
}

export async function updatePreferences(db: Db, userId: string, input: UpdatePreferences): Promise<Preferences> {
  await repo.updatePreferences(db, userId, input);
  return getPreferences(db, userId);
}
