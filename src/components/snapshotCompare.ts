import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import { readSelectedAnalysis, type DesignPointsAnalysis } from '@shared/flight/storedAnalysis';
import { formatNumber, formatSigned } from '@shared/format/number';
import type { SnapshotDetail } from '@shared/model/review';
import type { SketchDocument } from '@shared/model/sketch';
import type { Sketch } from '@shared/model/sketchApi';
import type { Coefficients } from '@shared/solver/types';
import { shownXcpOverC, xcpLeftOut } from '@shared/flight/xcp';

/**
 * One side of a compare: a snapshot of this sketch, or a sketch of the team as stored now
 * (its selected design point). Both carry the document and the result the server stored, so
 * the outlines, Cp distributions and coefficients of any two can be put side by side.
 */
export interface CompareSide {
  kind: 'snapshot' | 'sketch';
  /** The snapshot's name, or the sketch's title. */
  name: string;
  revision: number;
  /** Who saved the snapshot, or last edited the sketch. */
  by: string | null;
  /** When (ISO). */
  at: string;
  document: SketchDocument;
  /** The stored result (as the API sends it: read through storedAnalysisSchema). */
  result: DesignPointsAnalysis | null;
}

export function sideOfSnapshot(s: SnapshotDetail): CompareSide {
  return { kind: 'snapshot', name: s.name, revision: s.revision, by: s.createdByName, at: s.createdAt, document: s.document, result: s.result };
}

export function sideOfSketch(s: Sketch): CompareSide {
  return { kind: 'sketch', name: s.title, revision: s.revision, by: s.updatedByName, at: s.updatedAt, document: s.document, result: s.lastResult };
}

/** What the compare table lists, per theory. */
export const COMPARE_THEORIES = [
  { key: 'exact', label: 'Exact (shock-expansion)' },
  { key: 'linear', label: 'Linear' },
  { key: 'secondOrder', label: 'Second-order' },
] as const;
export type CompareTheory = (typeof COMPARE_THEORIES)[number]['key'];

export const COMPARE_QUANTITIES = [
  { key: 'cl', label: 'cl' },
  { key: 'cd', label: 'cd' },
  { key: 'cm', label: 'cm' },
  { key: 'xcpOverC', label: 'x_cp/c' },
  { key: 'liftToDrag', label: 'L/D' },
] as const;
export type CompareQuantity = (typeof COMPARE_QUANTITIES)[number]['key'];

export interface CompareCell {
  a: number | null;
  b: number | null;
  /** B − A; null when either side has no value. */
  diff: number | null;
  /** x_cp/c only: the side's solver value is left out, not a location (shared/flight/xcp.ts). */
  leftOut?: { a: boolean; b: boolean };
}

/** The stored analysis of the selected design point, if the snapshot has one (older rows may not). */
export const asAnalysis = readSelectedAnalysis;

function coefficientsOf(analysis: SketchAnalysis | null, theory: CompareTheory): Coefficients | null {
  const r = analysis?.result;
  if (!r) return null;
  if (theory === 'exact') return r.coefficients;
  return r.theories?.[theory] ?? null;
}

/**
 * B − A of one quantity. Differences below 1e-9 of the larger value are binary noise of
 * identical results and are shown as 0.
 */
export function difference(a: number | null, b: number | null): number | null {
  if (a === null || b === null) return null;
  const d = b - a;
  return Math.abs(d) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b)) ? 0 : d;
}

/** The coefficient table of two snapshots: every theory × quantity, with A, B and B − A. */
export function compareCoefficients(a: SketchAnalysis | null, b: SketchAnalysis | null): Record<CompareTheory, Record<CompareQuantity, CompareCell>> {
  const out = {} as Record<CompareTheory, Record<CompareQuantity, CompareCell>>;
  for (const { key: theory } of COMPARE_THEORIES) {
    const ca = coefficientsOf(a, theory);
    const cb = coefficientsOf(b, theory);
    const row = {} as Record<CompareQuantity, CompareCell>;
    for (const { key } of COMPARE_QUANTITIES) {
      if (key === 'xcpOverC') {
        // x_cp/c only where it means a location: a dash (and no difference) where cn is near zero.
        const xa = shownXcpOverC(ca?.xcpOverC, ca?.cn);
        const xb = shownXcpOverC(cb?.xcpOverC, cb?.cn);
        row[key] = { a: xa, b: xb, diff: difference(xa, xb), leftOut: { a: xcpLeftOut(ca?.xcpOverC, ca?.cn), b: xcpLeftOut(cb?.xcpOverC, cb?.cn) } };
        continue;
      }
      const va = ca?.[key] ?? null;
      const vb = cb?.[key] ?? null;
      row[key] = { a: va, b: vb, diff: difference(va, vb) };
    }
    out[theory] = row;
  }
  return out;
}

export function formatValue(v: number | null): string {
  return formatNumber(v, 4);
}

/** A difference with its sign ("+0.0021", "−0.013", "0"); never in e-notation. */
export function formatDifference(v: number | null): string {
  return formatSigned(v, 3);
}
