import type { SketchDocument } from '../../../shared/model/sketch.ts';

/**
 * The server's solve of a stored document (its result is the stored one). Filled in with the
 * shared solver; until then nothing is computed.
 */
export function solveDocument(_document: SketchDocument): { status: string | null; result: unknown } {
  return { status: null, result: null };
}
