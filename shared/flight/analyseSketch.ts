import { formatPath, parseSolveInput, solveInputSchema, type SolveInput } from '../model/solveInput.ts';
import type { Point, SketchCase } from '../model/sketch.ts';
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
  /**
   * Flap: hinge, deflection, flap chord over the drawn chord (c_f/c, independent of δ) and hinge
   * moments ch = H/(q∞·c_f²) about the hinge, positive trailing edge down.
   */
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
  transitionReynolds?: number;
}

export function analyseSketch(doc: SketchCase, options: AnalyseOptions = {}): SketchAnalysis {
  return analysePrepared(prepareSketch(doc, options), options);
}

/**
 * What an analysis needs that depends only on the section, the flap deflection and the wave-map
 * switch: the deflected section and the parsed solver input. Sweeps (studies) prepare once per
 * flap deflection and call `analysePrepared` per flow point, so a point of a study is computed by
 * exactly the code of a single `analyseSketch` call without re-parsing the section every time.
 */
export type PreparedSketch =
  | { ok: false; analysis: SketchAnalysis }
  | {
      ok: true;
      doc: SketchCase;
      input: SolveInput;
      points: Point[];
      flapDef: { hingeXOverC: number; deflectionDeg: number } | null;
      deflected: Extract<ReturnType<typeof deflectFlap>, { ok: true }> | null;
    };

/** Deflects the flap and parses the solver input at the options' (or the document's) flow. */
export function prepareSketch(doc: SketchCase, options: AnalyseOptions = {}): PreparedSketch {
  const mach = options.mach ?? doc.condition.mach;
  const alphaDeg = options.alphaDeg ?? doc.condition.alphaDeg;
  const flapDef = doc.flap ? { hingeXOverC: doc.flap.hingeXOverC, deflectionDeg: options.flapDeg ?? doc.flap.deflectionDeg } : null;
  let points: Point[] = doc.section.points;
  let deflected: ReturnType<typeof deflectFlap> | null = null;
  const fail = (problem: string): PreparedSketch => ({
    ok: false,
    analysis: { status: 'invalid', problem, result: null, solvedPoints: points, flap: null, loads: null, loadsNote: null },
  });

  if (flapDef) {
    deflected = deflectFlap(points, flapDef);
    if (!deflected.ok) return fail(deflected.reason);
    points = deflected.points;
  }
  // Coefficients are referred to the section as drawn (its chord, nose and moment point), never
  // to the deflected outline, whose chord shrinks with the flap's deflection.
  const reference = {
    ...(doc.momentPoint ? { momentPoint: doc.momentPoint } : {}),
    ...(deflected?.ok ? { chord: deflected.drawn.chord, leadingEdge: deflected.drawn.leadingEdge } : {}),
  };
  const parsed = parseSolveInput({
    section: { points },
    flow: { mach, alphaDeg, gamma: doc.condition.gamma },
    ...(Object.keys(reference).length ? { reference } : {}),
    options: { waves: options.waves ?? true },
  });
  if (!parsed.ok) return fail(parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; '));
  return { ok: true, doc, input: parsed.value, points, flapDef, deflected };
}

/**
 * The analysis of a prepared sketch at the options' flow point (Mach, α, altitude, friction;
 * the flap deflection and wave-map switch were fixed by `prepareSketch`). A flow other than the
 * prepared one is validated with the same schema and messages as a full parse.
 */
export function analysePrepared(prepared: PreparedSketch, options: AnalyseOptions = {}): SketchAnalysis {
  if (!prepared.ok) return prepared.analysis;
  const { doc, points, flapDef, deflected } = prepared;
  const mach = options.mach ?? doc.condition.mach;
  const alphaDeg = options.alphaDeg ?? doc.condition.alphaDeg;
  const altitudeM = options.altitudeM === undefined ? doc.condition.altitudeM : options.altitudeM;

  let input = prepared.input;
  if (input.flow.mach !== mach || input.flow.alphaDeg !== alphaDeg) {
    const flow = solveInputSchema.shape.flow.safeParse({ mach, alphaDeg, gamma: doc.condition.gamma });
    if (!flow.success) {
      const problem = flow.error.issues.map((i) => `${formatPath(['flow', ...i.path])}: ${i.message}`).join('; ');
      return { status: 'invalid', problem, result: null, solvedPoints: points, flap: null, loads: null, loadsNote: null };
    }
    input = { ...input, flow: flow.data };
  }
  const result = solveSection(input);

  let flap: SketchAnalysis['flap'] = null;
  if (deflected && flapDef) {
    flap = {
      hinge: deflected.hinge,
      hingeXOverC: flapDef.hingeXOverC,
      deflectionDeg: flapDef.deflectionDeg,
      flapChordOverC: deflected.flapChord / deflected.drawn.chord,
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
    const chord = result.geometry.reference.chord;
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
      transitionReynolds: options.transitionReynolds ?? doc.loads.transitionReynolds,
      coefficients: result.coefficients,
      hinge: flap && flap.hingeMoment.exact !== null ? { ch: flap.hingeMoment.exact, flapChordOverC: flap.flapChordOverC } : null,
    });
    if (answer.ok) loads = answer.loads;
    else loadsNote = answer.reason;
  }
  return { status: result.status, problem: null, result, solvedPoints: points, flap, loads, loadsNote };
}
