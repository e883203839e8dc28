import { normaliseSection } from './sectionCommands.ts';
import { sectionShape } from './sectionShape.ts';
import type { Point } from './sketch.ts';

/**
 * What an import does with the outline a coordinates file gave (`parseCoordinates`): the file's
 * units, chosen by the person (a file rarely says), and whether the outline is normalised to unit
 * chord or kept at its physical size. A file in a length unit gives a physical chord, which goes
 * into the sketch's loads chord (always when the size is kept; on request when normalised).
 * Kept at physical size, the outline is drawn in metres (the sketch's length unit, as the loads
 * chord is): a file in mm would otherwise be hundreds of drawing units long, beyond what the
 * canvas zooms out to, and the drawn chord would disagree with the loads chord's number.
 * `planImport` is what the preview shows and what the import then sends: nothing else decides.
 */

export const FILE_UNITS = ['chord', 'mm', 'in', 'm'] as const;
export type FileUnit = (typeof FILE_UNITS)[number];

/** Metres per file unit; null: the numbers are fractions of the chord (no length). */
export const FILE_UNIT_METRES: Record<FileUnit, number | null> = { chord: null, mm: 0.001, in: 0.0254, m: 1 };

export const FILE_UNIT_LABEL: Record<FileUnit, string> = {
  chord: 'fractions of the chord (no unit)',
  mm: 'millimetres',
  in: 'inches',
  m: 'metres',
};

export const IMPORT_SCALES = ['unitChord', 'physical'] as const;
export type ImportScale = (typeof IMPORT_SCALES)[number];

/** The loads chord must stay within the document's range (loadsSettingsSchema). */
const MAX_LOADS_CHORD_M = 1000;

export interface ImportOptions {
  unit: FileUnit;
  scale: ImportScale;
  /** With `unitChord` and a length unit: also set the loads chord to the file's chord. */
  loadsChordFromFile: boolean;
}

export interface ImportPlan {
  /** The outline the sketch will get. */
  points: Point[];
  pointCount: number;
  /** Chord of the outline as the file gives it (max x − min x), in file units. */
  fileChord: number;
  /** The file's chord in metres, when its unit is a length. */
  chordM: number | null;
  /** Chord of the outline the sketch will get (1 when normalised; in metres when kept physical). */
  chord: number;
  thicknessRatio: number;
  /** The loads chord the import sets (m), or null to leave the sketch's as it is. */
  loadsChordM: number | null;
}

export function planImport(points: readonly Point[], options: ImportOptions): { ok: true; plan: ImportPlan } | { ok: false; reason: string } {
  const shape = sectionShape(points);
  const fileChord = shape.chord;
  if (!(fileChord > 0)) return { ok: false, reason: 'The outline has no chord: all its points share one x.' };
  const metres = FILE_UNIT_METRES[options.unit];
  const chordM = metres === null ? null : tidy(fileChord * metres);
  let outline = points.map((p) => [p[0], p[1]] as Point);
  if (options.scale === 'unitChord') {
    const r = normaliseSection(points, { level: false });
    if (!r.ok) return r;
    outline = r.points;
  } else if (metres !== null) {
    outline = points.map((p) => [tidy(p[0] * metres), tidy(p[1] * metres)] as Point);
  }
  const wantsLoadsChord = chordM !== null && (options.scale === 'physical' || options.loadsChordFromFile);
  if (wantsLoadsChord && chordM > MAX_LOADS_CHORD_M) {
    return { ok: false, reason: `The chord would be ${chordM} m, more than the ${MAX_LOADS_CHORD_M} m a sketch's loads take; check the file's unit.` };
  }
  return {
    ok: true,
    plan: {
      points: outline,
      pointCount: outline.length,
      fileChord,
      chordM,
      chord: sectionShape(outline).chord,
      thicknessRatio: shape.thicknessRatio,
      loadsChordM: wantsLoadsChord ? chordM : null,
    },
  };
}

/**
 * A first choice of unit for the person to confirm, and why: a title naming its unit, else the
 * size of the chord (about 1: fractions of the chord; larger: millimetres, the commoner drawing
 * unit — the sentence says to pick inches if it is).
 */
export function guessFileUnit(header: string | null, points: readonly Point[]): { unit: FileUnit; why: string } {
  const h = header ?? '';
  if (/\b(mm|millimet(re|er)s?)\b/i.test(h)) return { unit: 'mm', why: 'the title says millimetres' };
  if (/\b(inch|inches|in\.)(?!\w)/i.test(h) || /\d\s*(in|")(?!\w)/.test(h)) return { unit: 'in', why: 'the title says inches' };
  const chord = sectionShape(points).chord;
  if (chord > 0.5 && chord < 2) return { unit: 'chord', why: `the chord is ${round(chord)}, so the numbers look like fractions of the chord` };
  return { unit: 'mm', why: `the chord is ${round(chord)} and the file names no unit: taken as millimetres — choose inches or metres if it is not` };
}

/** Drops binary noise from unit conversion (320 × 0.001 = 0.32, not 0.32000000000000006). */
function tidy(v: number): number {
  const r = Number(v.toPrecision(12));
  return r === 0 ? 0 : r;
}

function round(v: number): string {
  return String(Number(v.toPrecision(4)));
}
