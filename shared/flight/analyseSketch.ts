import { parseSolveInput } from '../model/solveInput.ts';
import type { Point, SketchDocument } from '../model/sketch.ts';
import { solveSection } from '../solver/solveSection.ts';
import type { SolveResult, SolveStatus } from '../solver/types.ts';
import { deflectFlap, hingeMoments, type HingeMoments } from './flap.ts';
import { computeLoads, type LoadsResult } from './loads.ts';
import type { FrictionRegime } from './skinFriction.ts';

/**
 * Everything Shockwright computes for one sketch at its condition, in one pure function shared
 * by the browser worker, the server's stored solve and the study sweeps: the flap deflected on
 * the solver's input (the stored section stays as drawn), the shock-expansion solve with both
 * thin-section theories, hinge moments, and — when an altitude is given — the free-stream state,
 * friction drag and dimensional loads.
 */
export interface SketchAnalysis {
  /** The solver's status, or `invalid` when the sketch cannot be solved at all (see problem). */
  status: SolveStatus | 'invalid';
  problem: string | null;
  result: SolveResult | null;
  /** The section the solver saw (the drawn one, or with the flap deflected). */
  solvedPoints: Point[];
  flap: { hinge: Point; hingeXOverC: number; deflectionDeg: number; flapChordOverC: number; hingeMoment: HingeMoments } | null;
  loads: LoadsResult | null;
  /** Why there are no loads (no altitude given, or the exact result is not valid). */
  loadsNote: string | null;
}

export interface AnalyseOptions {
  waves?: boolean;
  /** Override the document's settings (studies sweep these). */
  mach?: number;
  alphaDeg?: number;
  flapDeg?: number | null;
  altitudeM?: number | null;
  friction?: FrictionRegime | 'none';
}

export function analyseSketch(doc: SketchDocument, options: AnalyseOptions = {}): SketchAnalysis {
  const mach = options.mach ?? doc.condition.mach;
  const alphaDeg = options.alphaDeg ?? doc.condition.alphaDeg;
  const altitudeM = options.altitudeM === undefined ? doc.condition.altitudeM : options.altitudeM;
  const flapDef = doc.flap ? { hingeXOverC: doc.flap.hingeXOverC, deflectionDeg: options.flapDeg ?? doc.flap.deflectionDeg } : null;
  let points: Point[] = doc.section.points;
  let deflected: ReturnType<typeof deflectFlap> | null = null;
  const fail = (problem: string): SketchAnalysis => ({ status: 'invalid', problem, result: null, solvedPoints: points, flap: null, loads: null, loadsNote: null });

  if (flapDef) {
    deflected = deflectFlap(points, flapDef);
    if (!deflected.ok) return fail(deflected.reason);
    points = deflected.points;
  }
  const parsed = parseSolveInput({
    section: { points },
    flow: { mach, alphaDeg, gamma: doc.condition.gamma },
    ...(doc.momentPoint ? { reference: { momentPoint: doc.momentPoint } } : {}),
    options: { waves: options.waves ?? true },
  });
  if (!parsed.ok) return fail(parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; '));
  const result = solveSection(parsed.value);

  let flap: SketchAnalysis['flap'] = null;
  if (deflected?.ok && flapDef) {
    flap = {
      hinge: deflected.hinge,
      hingeXOverC: flapDef.hingeXOverC,
      deflectionDeg: flapDef.deflectionDeg,
      flapChordOverC: deflected.flapChord / (result.geometry.chord || 1),
      hingeMoment: hingeMoments(deflected, [...result.surfaces.upper, ...result.surfaces.lower]),
    };
  }

  let loads: LoadsResult | null = null;
  let loadsNote: string | null = null;
  if (altitudeM === null || altitudeM === undefined) {
    loadsNote = 'Give an altitude to see loads, friction drag and the free-stream state.';
  } else if (!result.coefficients) {
    loadsNote = `No loads: the exact result is not valid (${result.status}).`;
  } else {
    const chord = result.geometry.chord;
    const wetted = (facets: SolveResult['surfaces']['upper']) => facets.reduce((s, f) => s + f.length, 0) / chord;
    const answer = computeLoads({
      mach,
      gamma: doc.condition.gamma,
      altitudeM,
      chordM: doc.loads.chordM,
      spanM: doc.loads.spanM,
      wettedUpperOverC: wetted(result.surfaces.upper),
      wettedLowerOverC: wetted(result.surfaces.lower),
      frictionRegime: options.friction ?? doc.loads.friction,
      coefficients: result.coefficients,
      hinge: flap && flap.hingeMoment.exact !== null ? { ch: flap.hingeMoment.exact, flapChordOverC: flap.flapChordOverC } : null,
    });
    if (answer.ok) loads = answer.loads;
    else loadsNote = answer.reason;
  }
  return { status: result.status, problem: null, result, solvedPoints: points, flap, loads, loadsNote };
}
