import { z } from 'zod';
import { UNIT_SYSTEMS } from '../flight/units.ts';

/** A person's own settings, kept on the server with their account. */
export const preferencesSchema = z.object({
  /** Display units of dimensional results: SI or US customary (everything is computed in SI). */
  unitSystem: z.enum(UNIT_SYSTEMS),
});
export type Preferences = z.infer<typeof preferencesSchema>;

/** PATCH body: any subset of the settings. */
export const updatePreferencesSchema = preferencesSchema.partial().strict();
export type UpdatePreferences = z.infer<typeof updatePreferencesSchema>;

export const DEFAULT_PREFERENCES: Preferences = { unitSystem: 'si' };
