import { defaultSketchDocument, sketchDocumentSchema, type Condition, type LegacyFlap, type LoadsSettings, type Point, type SketchDocument } from '../../shared/model/sketch.ts';

/**
 * A sketch with one design point, written the way a one-condition sketch reads (the version 1
 * shape: the condition, and the deflection on the flap) and parsed like a stored version 1
 * document, so it also exercises the upgrade. Missing parts are the default sketch's.
 */
export function oneCondition(fields: {
  section?: { points: Point[] };
  condition: Partial<Condition> & Pick<Condition, 'mach' | 'alphaDeg'>;
  flap?: LegacyFlap | null;
  momentPoint?: Point | null;
  loads?: LoadsSettings;
  notes?: string;
}): SketchDocument {
  const base = defaultSketchDocument();
  return sketchDocumentSchema.parse({ version: 1, section: base.section, loads: base.loads, ...fields });
}
