import type { SolveInput } from '../model/solveInput';
import { firstItem, firstItems, itemAt, lastItem, present } from '../util/invariant.ts';
import {
  COEFFICIENT_ZERO,
  DEG_PER_RAD,
  FIELD_EXTENT_CHORDS_DEFAULT,
  GAMMA_AIR,
  NEAR_DETACHMENT_WARNING_DEG,
  NEAR_SONIC_WARNING_MACH,
  PERFECT_GAS_WARNING_MACH,
  RAD_PER_DEG,
  SMALL_DEFLECTION_WARNING_DEG,
  ZERO_TURN_RAD,
} from './constants';
import { facetDeflections } from './facetDeflections';
import { integrateLoadsOfThree, type Loads } from './integrateLoads';
import { linearTheoryCp } from './linearTheory';
import { marchSurface, type SurfaceLimit, type SurfaceMarch } from './marchSurface';
import { matchTrailingEdge, type TailMatch, type TailTurn } from './matchTrailingEdge';
import { maxThicknessRatio } from './maxThicknessRatio';
import { busemannCoefficients } from './secondOrderTheory';
import { splitSurfaces, type SurfaceChain } from './splitSurfaces';
import { traceWaves } from './traceWaves';
import type {
  Coefficients,
  Facet,
  FacetWave,
  Point,
  SolveLimit,
  SolveResult,
  SolveStatus,
  SurfaceName,
  TailWave,
  TheoryResult,
  TrailingEdge,
} from './types';

/**
 * Solves a polygonal section in a supersonic stream: the exact shock-expansion march over
 * both surfaces, the trailing-edge matching, integrated loads, Ackeret (linear) and Busemann
 * (second-order) theories on the same facets, and (unless `options.waves` is false) the wave
 * map.
 *
 * Conventions (see shared/solver/README.md):
 * - Body axes, x toward the tail, y up; chord c = max x − min x; nose = min-x vertex, tail =
 *   max-x vertex; an edge within 1e-9 rad of vertical at either end is `blunt` (no
 *   coefficients, no theories, no thin-section Cp).
 * - α > 0 is nose up: the free stream flows along (cos α, sin α), so the LOWER surface is
 *   compressed at positive α. Input vertex order (cw or ccw) changes no result.
 * - Facet angle φ = atan2(dy, dx) nose → tail; deflection θ = φ − α (upper), α − φ (lower);
 *   θ > 0 turns into the flow. The first facet's deflection makes a shock, fan or Mach line;
 *   every later vertex's turn a shock (concave), a fan (convex) or nothing.
 * - Limits are results: `detached`, `subsonic`, `vacuum` stop that surface's march at the
 *   vertex (listed in `limits` with numbers and a sentence); with both surfaces stopped the
 *   status is the worse one in the order detached > subsonic > vacuum. Coefficients are
 *   given for `ok` and for `vacuum` (p = 0, Cp = −2/(γM∞²) on the facets past the limit,
 *   flagged `vacuum`); the thin-airfoil theories are always given (except blunt).
 * - Loads: each facet's force is −Cp·n_out·length at its midpoint; cl, cd (wind axes) over
 *   q∞·c; cm over q∞·c² about the moment point (default [x_le + c/4, y_le]), nose up +, with
 *   c and the leading edge from `input.reference` (default: the outline's chord and nose).
 * - Trailing edge: common flow direction and pressure of the two streams (slip line), each
 *   stream turned by a shock or a fan; no attached matching leaves the status `ok` (the loads
 *   do not depend on it) and says so in `trailingEdge.message` and `warnings`.
 *
 * Cost: O(facets) without the wave map; the wave map is O(L log L) in its L lines (a sweep).
 * Never throws for a parsed input; every number in the result is finite (absent = null).
 *
 * Sources: shock-expansion theory (e.g. Anderson, "Modern Compressible Flow", from memory);
 * NACA Report 1135 for the wave relations; Ackeret and Busemann thin-airfoil theories.
 */
export function solveSection(input: SolveInput): SolveResult {
  const points = input.section.points;
  const { mach, alphaDeg } = input.flow;
  const gamma = input.flow.gamma ?? GAMMA_AIR;
  const alpha = alphaDeg * RAD_PER_DEG;
  const split = splitSurfaces(points);
  const chord = split.chord;
  const nosePt = present(points[split.noseIndex], split.noseIndex, points);
  const tailPt = present(points[split.tailIndex], split.tailIndex, points);
  const nose: Point = [nosePt[0], nosePt[1]];
  const tail: Point = [tailPt[0], tailPt[1]];
  const refChord = input.reference?.chord ?? chord;
  const le = input.reference?.leadingEdge;
  const leadingEdge: Point = le ? [le[0], le[1]] : [nose[0], nose[1]];
  const referenceSource = input.reference?.chord !== undefined || le ? 'input' : 'outline';
  const mp = input.reference?.momentPoint;
  const momentPoint: Point = mp ? [mp[0], mp[1]] : [leadingEdge[0] + 0.25 * refChord, leadingEdge[1]];
  const upperChain = split.upper;
  const lowerChain = split.lower;

  const geometry = {
    chord,
    noseIndex: split.noseIndex,
    tailIndex: split.tailIndex,
    nose,
    tail,
    upper: upperChain.vertices.slice(),
    lower: lowerChain.vertices.slice(),
    momentPoint,
    maxThicknessRatio: maxThicknessRatio(upperChain, lowerChain),
    reference: { chord: refChord, leadingEdge, source: referenceSource } as SolveResult['geometry']['reference'],
  };
  const condition = { mach, alphaDeg, gamma };

  const thetaU = facetDeflections(upperChain, alpha, 'upper');
  const thetaL = facetDeflections(lowerChain, alpha, 'lower');
  const { c1, c2 } = busemannCoefficients(mach, gamma);
  // Ackeret's Cp is linear in θ: its slope is linearTheoryCp(1 rad).
  const linearSlope = linearTheoryCp(1, mach);
  const theoryU = theoryCp(thetaU, linearSlope, c1, c2);
  const theoryL = theoryCp(thetaL, linearSlope, c1, c2);
  const cpLinU = theoryU.linear;
  const cpLinL = theoryL.linear;
  const cp2U = theoryU.secondOrder;
  const cp2L = theoryL.secondOrder;

  const ctx: FacetContext = { mach, gamma, chord: refChord, noseX: leadingEdge[0], cpVacuum: -2 / (gamma * mach * mach) };

  if (split.bluntNose || split.bluntTail) {
    const limits: SolveLimit[] = [];
    if (split.bluntNose) limits.push(bluntLimit(points, split.bluntNose, 'nose'));
    if (split.bluntTail) limits.push(bluntLimit(points, split.bluntTail, 'tail'));
    return {
      status: 'blunt',
      limits,
      condition,
      geometry,
      surfaces: {
        // No theory applies to a vertical face: the thin-section Cp is not given either.
        upper: buildFacets(upperChain, thetaU, null, null, null, ctx),
        lower: buildFacets(lowerChain, thetaL, null, null, null, ctx),
      },
      coefficients: null,
      bySurface: null,
      theories: null,
      trailingEdge: noTrailingEdge('The section is blunt, so the trailing edge was not solved.'),
      waves: [],
      intersections: [],
      warnings: [],
    };
  }

  const marchU = marchSurface(thetaU, mach, gamma);
  const marchL = marchSurface(thetaL, mach, gamma);
  // buildFacets writes every entry (0 where the march stopped short of a vacuum).
  const cpU: number[] = new Array(thetaU.length);
  const cpL: number[] = new Array(thetaL.length);
  const facetsU = buildFacets(upperChain, thetaU, marchU, cpLinU, cp2U, ctx, cpU);
  const facetsL = buildFacets(lowerChain, thetaL, marchL, cpLinL, cp2L, ctx, cpL);

  const limits: SolveLimit[] = [];
  if (marchU.limit) limits.push(surfaceLimit(marchU.limit, 'upper', upperChain, points, gamma));
  if (marchL.limit) limits.push(surfaceLimit(marchL.limit, 'lower', lowerChain, points, gamma));
  const status: SolveStatus = limits.length === 0 ? 'ok' : worstStatus(limits);
  const ok = status === 'ok';

  // A `vacuum` limit still has well-defined loads: the facets past the Prandtl-Meyer limit carry
  // p = 0 (buildFacets wrote Cp = −2/(γM∞²) there), so the coefficients are given, flagged.
  // One pass over the geometry integrates all three (the exact set is read only when valid).
  const [exact, linear, second] = integrateLoadsOfThree(
    upperChain,
    [cpU, cpLinU, cp2U],
    lowerChain,
    [cpL, cpLinL, cp2L],
    alpha,
    momentPoint,
    leadingEdge,
    refChord,
  );
  let coefficients: Coefficients | null = null;
  let bySurface: SolveResult['bySurface'] = null;
  if (ok || status === 'vacuum') {
    coefficients = exact.total;
    bySurface = { upper: exact.upper, lower: exact.lower };
  }
  const theories = {
    linear: theoryResult(linear, coefficients),
    secondOrder: theoryResult(second, coefficients),
  };

  const warnings: string[] = [];
  let match: TailMatch | null = null;
  let trailingEdge: TrailingEdge;
  if (ok) {
    match = matchTrailingEdge(streamAtTail(marchU, upperChain), streamAtTail(marchL, lowerChain), gamma);
    trailingEdge = trailingEdgeResult(match);
    if (trailingEdge.message) warnings.push(trailingEdge.message);
  } else if (status === 'vacuum') {
    trailingEdge = noTrailingEdge('A stream reaches the trailing edge at zero pressure (the vacuum limit), so the trailing edge was not solved.');
  } else {
    trailingEdge = noTrailingEdge('The march did not reach the trailing edge, so it was not solved.');
  }
  if (status === 'vacuum') {
    for (const [name, facets, march] of [
      ['upper', facetsU, marchU],
      ['lower', facetsL, marchL],
    ] as const) {
      if (march.limit?.status !== 'vacuum') continue;
      const count = facets.length - march.solved;
      warnings.push(
        `The exact coefficients include zero pressure (p = 0, Cp = ${ctx.cpVacuum.toPrecision(4)}) on ` +
          `${count === 1 ? 'the last facet' : `the last ${count} facets`} of the ${name} surface, from vertex ` +
          `${itemAt(upperOrLower(name, upperChain, lowerChain).vertices, march.solved)}, where the expansion reaches the Prandtl-Meyer limit: the theory's limiting value, not a measured one.`,
      );
    }
  }

  collectWarnings(warnings, mach, upperChain, lowerChain, Math.max(theoryU.maxAbsTheta, theoryL.maxAbsTheta), marchU, marchL, match);

  let waves: SolveResult['waves'] = [];
  let intersections: SolveResult['intersections'] = [];
  if (input.options?.waves ?? true) {
    const map = traceWaves({
      points,
      upper: upperChain,
      lower: lowerChain,
      marchUpper: marchU,
      marchLower: marchL,
      tail: match && match.status === 'matched' ? match : null,
      tailIndex: split.tailIndex,
      alpha,
      mach,
      gamma,
      box: fieldBox(split, input.options?.fieldExtentChords ?? FIELD_EXTENT_CHORDS_DEFAULT),
      chord,
      fanRayStepDeg: input.options?.fanRayStepDeg,
    });
    waves = map.waves;
    intersections = map.intersections;
  }

  return {
    status,
    limits,
    condition,
    geometry,
    surfaces: { upper: facetsU, lower: facetsL },
    coefficients,
    bySurface,
    theories,
    trailingEdge,
    waves,
    intersections,
    warnings,
  };
}

interface FacetContext {
  mach: number;
  gamma: number;
  /** Reference chord and leading-edge x for x/c. */
  chord: number;
  noseX: number;
  /** Cp at p = 0: −2/(γM∞²). */
  cpVacuum: number;
}

function upperOrLower(name: SurfaceName, upper: SurfaceChain, lower: SurfaceChain): SurfaceChain {
  return name === 'upper' ? upper : lower;
}

/** The stream on a surface's last facet (every facet solved): what the trailing edge matches. */
function streamAtTail(march: SurfaceMarch, chain: SurfaceChain): { mach: number; pRatio: number; direction: number; nu: number } {
  const last = chain.phi.length - 1;
  return {
    mach: present(march.mach[last], last, march.mach),
    pRatio: present(march.pRatio[last], last, march.pRatio),
    direction: present(chain.phi[last], last, chain.phi),
    nu: present(march.nu[last], last, march.nu),
  };
}

/**
 * Thin-airfoil pressure coefficients per facet, in one pass: Ackeret's slope·θ (written as
 * slope·θ + 0·θ², the second-order form with c2 = 0) and Busemann's c1·θ + c2·θ²; and the
 * largest |θ| (for the small-deflection warning).
 */
function theoryCp(
  theta: readonly number[],
  slope: number,
  c1: number,
  c2: number,
): { linear: number[]; secondOrder: number[]; maxAbsTheta: number } {
  const m = theta.length;
  const linear: number[] = new Array(m);
  const secondOrder: number[] = new Array(m);
  let maxAbsTheta = 0;
  for (let k = 0; k < m; k++) {
    const t = present(theta[k], k, theta);
    // The same expression for both, as Busemann's with c2 = 0, so the two agree bit for bit
    // where they should.
    linear[k] = slope * t + 0 * t * t;
    secondOrder[k] = c1 * t + c2 * t * t;
    const a = Math.abs(t);
    if (a > maxAbsTheta) maxAbsTheta = a;
  }
  return { linear, secondOrder, maxAbsTheta };
}

/**
 * Facet records of one surface. Consecutive facets share their common vertex's point array
 * (one facet's `to` is the next one's `from`). Writes the exact Cp of solved facets — and the
 * p = 0 value of the facets past a vacuum limit — into `cpOut` (for the load integration).
 * `cpLin`/`cp2` null (a blunt section) gives null theory Cp.
 */
function buildFacets(
  chain: SurfaceChain,
  theta: readonly number[],
  march: SurfaceMarch | null,
  cpLin: readonly number[] | null,
  cp2: readonly number[] | null,
  ctx: FacetContext,
  cpOut?: number[],
): Facet[] {
  const { mach, gamma, chord, noseX, cpVacuum } = ctx;
  // Constants read once: an imported binding may be a getter call under some module loaders
  // (tsx compiles to one), which measured ~15 % of the core solve in this loop.
  const degPerRad = DEG_PER_RAD;
  const zeroTurn = ZERO_TURN_RAD;
  const h = 0.5 * (gamma - 1);
  const t0 = 1 + h * mach * mach; // T0/T∞
  const qScale = 2 / (gamma * mach * mach); // p∞/q∞
  const m = theta.length;
  const out: Facet[] = new Array(m);
  const xs = chain.xs;
  const ys = chain.ys;
  const solvedCount = march ? march.solved : 0;
  const vacuumFrom = march && march.limit?.status === 'vacuum' ? march.solved : m;
  let from: Point = [present(xs[0], 0, xs), present(ys[0], 0, ys)];
  let thetaBefore = 0; // the free stream's: the first facet's turn is its deflection
  for (let k = 0; k < m; k++) {
    // Facet k of the chain runs from vertex k to vertex k + 1; theta, the march and the
    // chain's per-facet lists all have one entry per facet, so k indexes each of them.
    const thetaK = present(theta[k], k, theta);
    const turn = thetaK - thetaBefore;
    thetaBefore = thetaK;
    const to: Point = [present(xs[k + 1], k + 1, xs), present(ys[k + 1], k + 1, ys)];
    const index = present(chain.edges[k], k, chain.edges);
    const length = present(chain.length[k], k, chain.length);
    const phiDeg = present(chain.phi[k], k, chain.phi) * degPerRad;
    const thetaDeg = thetaK * degPerRad;
    const turnDeg = turn * degPerRad;
    const cpLinear = cpLin ? present(cpLin[k], k, cpLin) : null;
    const cpSecondOrder = cp2 ? present(cp2[k], k, cp2) : null;
    const xMidOverC = (0.5 * (from[0] + to[0]) - noseX) / chord;
    const wave: FacetWave = march
      ? present(march.wave[k], k, march.wave)
      : turn > zeroTurn
        ? 'shock'
        : turn < -zeroTurn
          ? 'fan'
          : k === 0
            ? 'mach'
            : 'none';
    // Full object literals of one shape on purpose: building facets from shared parts with
    // object spread measured ~100× slower in this hot loop (V8 loses the fixed object shape).
    let facet: Facet;
    if (march && k < solvedCount) {
      const mk = present(march.mach[k], k, march.mach);
      const p = present(march.pRatio[k], k, march.pRatio);
      const t = t0 / (1 + h * mk * mk);
      const cp = (p - 1) * qScale;
      if (cpOut) cpOut[k] = cp;
      facet = {
        index,
        from,
        to,
        length,
        phiDeg,
        thetaDeg,
        turnDeg,
        wave,
        solved: true,
        mach: mk,
        pRatio: p,
        tRatio: t,
        rhoRatio: p / t,
        p0Ratio: present(march.p0Ratio[k], k, march.p0Ratio),
        cp,
        cpLinear,
        cpSecondOrder,
        vacuum: false,
        xMidOverC,
      };
    } else if (k >= vacuumFrom) {
      if (cpOut) cpOut[k] = cpVacuum;
      facet = {
        index,
        from,
        to,
        length,
        phiDeg,
        thetaDeg,
        turnDeg,
        wave,
        solved: false,
        mach: null,
        pRatio: 0,
        tRatio: null,
        rhoRatio: null,
        p0Ratio: null,
        cp: cpVacuum,
        cpLinear,
        cpSecondOrder,
        vacuum: true,
        xMidOverC,
      };
    } else {
      if (cpOut) cpOut[k] = 0;
      facet = {
        index,
        from,
        to,
        length,
        phiDeg,
        thetaDeg,
        turnDeg,
        wave,
        solved: false,
        mach: null,
        pRatio: null,
        tRatio: null,
        rhoRatio: null,
        p0Ratio: null,
        cp: null,
        cpLinear,
        cpSecondOrder,
        vacuum: false,
        xMidOverC,
      };
    }
    out[k] = facet;
    from = to;
  }
  return out;
}

function theoryResult(loads: Loads, exact: Coefficients | null): TheoryResult {
  const t = loads.total;
  return {
    cl: t.cl,
    cd: t.cd,
    cm: t.cm,
    cn: t.cn,
    ca: t.ca,
    xcpOverC: t.xcpOverC,
    liftToDrag: t.liftToDrag,
    difference: exact
      ? { cl: percent(t.cl, exact.cl), cd: percent(t.cd, exact.cd), cm: percent(t.cm, exact.cm) }
      : { cl: null, cd: null, cm: null },
  };
}

/** 100·(theory − exact)/|exact|, or null when the exact value is ~0. */
function percent(theory: number, exact: number): number | null {
  return Math.abs(exact) < COEFFICIENT_ZERO ? null : (100 * (theory - exact)) / Math.abs(exact);
}

const STATUS_RANK: Record<SolveStatus, number> = { blunt: 4, detached: 3, subsonic: 2, vacuum: 1, ok: 0 };

function worstStatus(limits: readonly SolveLimit[]): SolveStatus {
  let worst: SolveStatus = 'ok';
  for (const l of limits) if (STATUS_RANK[l.status] > STATUS_RANK[worst]) worst = l.status;
  return worst;
}

const deg = (rad: number) => (rad * DEG_PER_RAD).toFixed(1);
const m2 = (mach: number) => mach.toFixed(2);

/**
 * The fewest decimals, from `min` up to 9, at which every pair [a, b] prints differently, so a
 * sentence comparing them never reads "23.0° exceeds the maximum 23.0°" (rounding is monotone,
 * so differing texts keep the order of the numbers).
 */
function decimalsFor(pairs: readonly (readonly [number, number])[], min: number): number {
  let d = min;
  for (; d < 9; d++) if (pairs.every(([a, b]) => a === b || a.toFixed(d) !== b.toFixed(d))) break;
  return d;
}

/** Angles (radians) in degrees, with enough decimals that each pair reads as different. */
function degreesApart(pairs: readonly (readonly [number, number])[]): (rad: number) => string {
  const d = decimalsFor(
    pairs.map(([a, b]) => [a * DEG_PER_RAD, b * DEG_PER_RAD] as const),
    1,
  );
  return (rad) => (rad * DEG_PER_RAD).toFixed(d);
}

/** A Mach number near 1 printed so that it reads on the right side of 1 ("0.9996", not "1.00"). */
function machNearOne(mach: number): string {
  return mach.toFixed(decimalsFor([[mach, 1]], 2));
}

function surfaceLimit(
  limit: SurfaceLimit,
  surface: SurfaceName,
  chain: SurfaceChain,
  points: readonly (readonly [number, number])[],
  gamma: number,
): SolveLimit {
  const vertex = itemAt(chain.vertices, limit.facet);
  const [x, y] = itemAt(points, vertex);
  const at: Point = [x, y];
  const atNose = limit.facet === 0;
  const where = atNose ? 'at the nose' : `at vertex ${vertex}`;
  const what = atNose ? 'deflection' : 'turn';
  const machWords = atNose ? `M ${m2(limit.machAhead)}` : `local M ${m2(limit.machAhead)}`;
  const base = { surface, vertex, at, thetaDeg: limit.turn * DEG_PER_RAD };
  if (limit.status === 'detached') {
    const thetaMax = limit.thetaMax ?? 0;
    const f = degreesApart([[limit.turn, thetaMax]]);
    return {
      status: 'detached',
      ...base,
      thetaMaxDeg: thetaMax * DEG_PER_RAD,
      message:
        `${atNose ? 'Nose shock' : `Shock at vertex ${vertex}`} detaches on the ${surface} surface: ` +
        `${what} ${f(limit.turn)}° exceeds the maximum ${f(thetaMax)}° at ${machWords}.`,
    };
  }
  if (limit.status === 'subsonic') {
    const thetaMax = limit.thetaMax ?? 0;
    const thetaSonic = limit.thetaSonic ?? 0;
    const machBehind = limit.machBehind ?? 0;
    const f = degreesApart([
      [limit.turn, thetaSonic],
      [limit.turn, thetaMax],
    ]);
    return {
      status: 'subsonic',
      ...base,
      thetaMaxDeg: thetaMax * DEG_PER_RAD,
      machBehind,
      message:
        `Flow behind the ${atNose ? 'nose shock' : `shock at vertex ${vertex}`} on the ${surface} surface ` +
        `is subsonic (M ${machNearOne(machBehind)}): ${what} ${f(limit.turn)}° lies between the sonic ` +
        `${f(thetaSonic)}° and the maximum ${f(thetaMax)}° at ${machWords}.`,
    };
  }
  const nu = limit.nu ?? 0;
  const nuMax = limit.nuMax ?? 0;
  const f = degreesApart([[nu, nuMax]]);
  return {
    status: 'vacuum',
    ...base,
    nuDeg: nu * DEG_PER_RAD,
    nuMaxDeg: nuMax * DEG_PER_RAD,
    message:
      `Expansion ${where} on the ${surface} surface reaches the Prandtl-Meyer limit: ` +
      `${what} ${deg(-limit.turn)}° would need ν ${f(nu)}°, ` +
      `${nu > nuMax ? 'beyond' : 'at (within one part in 10⁹ of)'} the maximum ${f(nuMax)}° for γ ${gamma.toFixed(2)}; ` +
      'the pressure is zero from there to the trailing edge.',
  };
}

function bluntLimit(
  points: readonly (readonly [number, number])[],
  tied: readonly number[],
  end: 'nose' | 'tail',
): SolveLimit {
  // The face's vertex of least y is the one the geometry reports as nose/tail.
  // A vertical face has at least two vertices.
  let vertex = firstItem(tied);
  let at = itemAt(points, vertex);
  for (const i of tied) {
    const p = itemAt(points, i);
    if (p[1] < at[1]) {
      vertex = i;
      at = p;
    }
  }
  const [a, b] = firstItems(tied, 2);
  const list = tied.length === 2 ? `vertices ${a} and ${b}` : `vertices ${tied.slice(0, -1).join(', ')} and ${lastItem(tied)}`;
  return {
    status: 'blunt',
    surface: end === 'nose' ? 'leadingEdge' : 'trailingEdge',
    vertex,
    at: [at[0], at[1]],
    message:
      `Blunt ${end}: ${list} form a vertical face at the ${end === 'nose' ? 'minimum' : 'maximum'} x; ` +
      `the shock-expansion method needs a single sharp ${end}.`,
  };
}

function noTrailingEdge(message: string): TrailingEdge {
  return { slipDeg: null, pressureRatio: null, upperWave: null, lowerWave: null, message };
}

function tailWave(turn: TailTurn): TailWave {
  const w: TailWave = {
    kind: turn.kind,
    deflectionDeg: turn.deflection * DEG_PER_RAD,
    machAfter: turn.machAfter,
    pRatioAfter: turn.pRatioAfter,
  };
  if (turn.kind === 'shock') w.betaDeg = turn.beta * DEG_PER_RAD;
  return w;
}

function trailingEdgeResult(match: TailMatch): TrailingEdge {
  if (match.status === 'unmatched') {
    return noTrailingEdge(
      `No attached wave pattern matches the two streams at the trailing edge: ${match.reason}.`,
    );
  }
  return {
    slipDeg: match.slip * DEG_PER_RAD,
    pressureRatio: match.pRatio,
    upperWave: tailWave(match.upper),
    lowerWave: tailWave(match.lower),
  };
}

function collectWarnings(
  warnings: string[],
  mach: number,
  upperChain: SurfaceChain,
  lowerChain: SurfaceChain,
  maxTheta: number,
  marchU: SurfaceMarch,
  marchL: SurfaceMarch,
  match: TailMatch | null,
): void {
  if (maxTheta * DEG_PER_RAD > SMALL_DEFLECTION_WARNING_DEG) {
    warnings.push(
      `Linear and second-order theories assume small deflections; the largest facet deflection here ` +
        `is ${deg(maxTheta)}°, so read them as indicative only.`,
    );
  }
  shockWarnings(warnings, 'upper', marchU, upperChain, mach);
  shockWarnings(warnings, 'lower', marchL, lowerChain, mach);
  if (match && match.status === 'matched') {
    for (const [side, turn] of [
      ['upper', match.upper],
      ['lower', match.lower],
    ] as const) {
      if (turn.kind === 'shock' && turn.machAfter < 1) {
        warnings.push(
          `Flow behind the trailing-edge shock in the ${side} stream is subsonic (M ${machNearOne(turn.machAfter)}); ` +
            'the wake pattern there is approximate.',
        );
      }
    }
  }
  if (mach > PERFECT_GAS_WARNING_MACH) {
    warnings.push(
      `At M ${m2(mach)} a constant γ (perfect gas) is an approximation; real-gas effects grow with Mach number.`,
    );
  }
}

function shockWarnings(
  warnings: string[],
  surface: SurfaceName,
  march: SurfaceMarch,
  chain: SurfaceChain,
  machInf: number,
): void {
  for (let k = 0; k < march.solved; k++) {
    if (march.wave[k] !== 'shock') continue;
    // k < solved: facet k and the one before it carry a state.
    const turn = present(march.turn[k], k, march.turn);
    const thetaMax = present(march.thetaMax[k], k, march.thetaMax);
    const machBehind = present(march.mach[k], k, march.mach);
    const nearDetachment = (thetaMax - turn) * DEG_PER_RAD < NEAR_DETACHMENT_WARNING_DEG;
    const nearSonic = machBehind < NEAR_SONIC_WARNING_MACH;
    if (!nearDetachment && !nearSonic) continue;
    const name = k === 0 ? 'nose shock' : `shock at vertex ${itemAt(chain.vertices, k)}`;
    const mAhead = k === 0 ? machInf : itemAt(march.mach, k - 1);
    if (nearDetachment) {
      const f = degreesApart([[turn, thetaMax]]);
      warnings.push(
        `The ${name} on the ${surface} surface is within 1° of detachment: ` +
          `${k === 0 ? 'deflection' : 'turn'} ${f(turn)}° against a maximum of ` +
          `${f(thetaMax)}° at ${k === 0 ? 'M' : 'local M'} ${m2(mAhead)}.`,
      );
    }
    if (nearSonic) {
      warnings.push(
        `Flow behind the ${name} on the ${surface} surface is barely supersonic ` +
          `(M ${machNearOne(machBehind)}); a slightly larger deflection would make it subsonic.`,
      );
    }
  }
}

function fieldBox(
  split: { minX: number; maxX: number; minY: number; maxY: number; chord: number },
  extentChords: number,
): { minX: number; maxX: number; minY: number; maxY: number } {
  const e = extentChords * split.chord;
  return { minX: split.minX - e, maxX: split.maxX + e, minY: split.minY - e, maxY: split.maxY + e };
}
