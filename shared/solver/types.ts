/**
 * Result types of the solver. Everything is plain JSON-serialisable data: no NaN or Infinity
 * anywhere (a value that does not exist is `null`), angles in degrees with `Deg` in the name,
 * coordinates in the input's body axes and length unit.
 */

/** A point [x, y] in body axes (x toward the tail, y up). */
export type Point = [number, number];

/** The solver's status words (see the glossary). `ok` = attached flow over the whole section. */
export type SolveStatus = 'ok' | 'detached' | 'subsonic' | 'vacuum' | 'blunt';

/** The status of one limit: why the march stopped somewhere. */
export type LimitStatus = Exclude<SolveStatus, 'ok'>;

/** Which part of the section a limit or wave belongs to. */
export type SurfaceName = 'upper' | 'lower';

/**
 * Where a limit sits: a surface, the trailing edge, or (blunt nose only) the leading edge.
 * `leadingEdge` is used only by a `blunt` limit for a vertical nose face.
 */
export type LimitPlace = SurfaceName | 'trailingEdge' | 'leadingEdge';

/** One reason the result is not `ok`, in words and numbers. */
export interface SolveLimit {
  status: LimitStatus;
  surface: LimitPlace;
  /** Index into the input points of the vertex where the march stopped. */
  vertex: number;
  at: Point;
  /** One plain sentence with the numbers. */
  message: string;
  /** The deflection (turn) asked for at that vertex, degrees (+ = compression). */
  thetaDeg?: number;
  /** The largest attached-shock deflection at the local Mach number, degrees. */
  thetaMaxDeg?: number;
  /** Mach number behind the shock (subsonic limits). */
  machBehind?: number;
  /** Prandtl-Meyer angle the expansion would need, degrees (vacuum limits). */
  nuDeg?: number;
  /** The Prandtl-Meyer limit ν_max, degrees (vacuum limits). */
  nuMaxDeg?: number;
}

/** The wave at a facet's leading vertex. */
export type FacetWave = 'shock' | 'fan' | 'mach' | 'none';

/** One facet (polygon edge) with its uniform state. Ratios are over free-stream values. */
export interface Facet {
  /** Input edge index: the edge from points[index] to points[(index + 1) % n]. */
  index: number;
  /** Ends in nose → tail order (may be the reverse of the input edge). */
  from: Point;
  to: Point;
  length: number;
  /** Facet angle φ = atan2(dy, dx) taken nose → tail, degrees. */
  phiDeg: number;
  /** Deflection from the free stream, degrees: φ − α (upper), α − φ (lower); + = into the flow. */
  thetaDeg: number;
  /** Turn at the facet's leading vertex, degrees (+ = compression); the first facet's is θ. */
  turnDeg: number;
  wave: FacetWave;
  /** False when the march stopped at or before this facet; the state fields are then null. */
  solved: boolean;
  mach: number | null;
  pRatio: number | null;
  tRatio: number | null;
  rhoRatio: number | null;
  p0Ratio: number | null;
  /** Exact (shock-expansion) pressure coefficient (p − p∞)/q∞. On a `vacuum` facet it is the
   *  limiting value −2/(γM∞²) (p = 0). */
  cp: number | null;
  /** Ackeret (linear) pressure coefficient 2θ/√(M∞²−1); null on a blunt section (no theory
   *  applies to a vertical face). */
  cpLinear: number | null;
  /** Busemann (second-order) pressure coefficient C1θ + C2θ²; null on a blunt section. */
  cpSecondOrder: number | null;
  /** True on the facets at and after a surface's `vacuum` vertex: the expansion reached the
   *  Prandtl-Meyer limit there, so the pressure is zero (p = 0, Cp = −2/(γM∞²)); `solved` is
   *  false and the other state fields are null, except pRatio = 0. */
  vacuum: boolean;
  /** Facet midpoint x from the reference leading edge, over the reference chord. */
  xMidOverC: number;
}

/** Section force and moment coefficients, over the reference chord c (`geometry.reference`). */
export interface Coefficients {
  /** Lift over q∞·c, along (−sin α, cos α). */
  cl: number;
  /** Drag over q∞·c, along the free stream (cos α, sin α). */
  cd: number;
  /** Pitching moment over q∞·c² about the moment point, positive nose up. */
  cm: number;
  /** Normal force over q∞·c, along body +y. */
  cn: number;
  /** Axial force over q∞·c, along body +x (aft). */
  ca: number;
  /** Where the resultant's line of action crosses the line y = y_le (the reference leading
   *  edge's y), from the reference leading edge, over c; null when the normal force is ~0. */
  xcpOverC: number | null;
  /** cl / cd; null when cd is ~0. */
  liftToDrag: number | null;
}

/** Lift, drag and moment of one surface (same axes, reference and moment point as the total). */
export interface SurfaceCoefficients {
  cl: number;
  cd: number;
  cm: number;
}

/** A thin-airfoil theory's coefficients beside the exact ones. */
export interface TheoryResult extends Coefficients {
  /** 100·(theory − exact)/|exact|, percent; null when the exact result is not `ok` or ~0. */
  difference: { cl: number | null; cd: number | null; cm: number | null };
}

/** One stream's wave at the trailing edge. */
export interface TailWave {
  kind: 'shock' | 'fan' | 'none';
  /** Deflection of that stream, degrees (+ = compression). */
  deflectionDeg: number;
  /** Shock angle from the stream's upstream direction, degrees (shocks only). */
  betaDeg?: number;
  machAfter: number;
  /** p/p∞ after the wave (equal on both sides: the slip-line pressure). */
  pRatioAfter: number;
}

/** The trailing-edge matching: common flow direction and pressure of the two streams. */
export interface TrailingEdge {
  /** Slip-line direction in body axes, degrees from +x toward +y; null when no attached
   *  matching exists (or the march did not reach the tail). */
  slipDeg: number | null;
  /** Common p/p∞ behind the tail waves; null with slipDeg. */
  pressureRatio: number | null;
  upperWave: TailWave | null;
  lowerWave: TailWave | null;
  /** Why there is no matching, in one sentence (absent when there is one). */
  message?: string;
}

/** A flow state on one side of a wave. */
export interface WaveState {
  mach: number;
  pRatio: number;
}

/** One ray of an expansion fan. */
export interface FanRay {
  /** Ray direction in body axes, degrees from +x toward +y. */
  angleDeg: number;
  end: Point;
  /** p/p∞ and Mach of the flow at this ray (head ray: upstream state; tail ray: downstream);
   *  the flow just aft of the ray, up to the next ray. */
  pRatio: number;
  mach: number;
  /** The ray's drawn line, origin → end (a ray that meets a shock ends there). */
  path: Point[];
  /** p/p∞ just ahead of the ray (the previous ray's pressure; the head ray's own). */
  pRatioAhead: number;
}

/** What stopped a wave's line. */
export type WaveEndReason = 'field' | 'wave' | 'body';

/** One wave of the wave map. */
export interface Wave {
  /** `wave_<surface>_<vertex>` for surface waves, `wave_tail_upper` / `wave_tail_lower` /
   *  `wave_slip` at the trailing edge, `wave_slip_<surface>_<n>` for a slip line that starts
   *  where two shocks met (`vertex` is then the surviving shock's). */
  id: string;
  kind: 'shock' | 'fan' | 'mach' | 'slip';
  /** The stream the wave stands in; the slip line says `trailingEdge`. */
  surface: SurfaceName | 'trailingEdge';
  /** Input index of the origin vertex. */
  vertex: number;
  origin: Point;
  /** Direction in body axes, degrees from +x toward +y: the shock, Mach line or slip line;
   *  for a fan, its head ray. */
  angleDeg: number;
  /** Shock angle measured from the upstream flow direction, degrees (shocks only). */
  betaDeg?: number;
  /** Fans: head ray, interior rays, tail ray, in that order. */
  rays?: FanRay[];
  /** Where the wave's line (a fan's head ray) stops, and why. */
  end: Point;
  endReason: WaveEndReason;
  /** The drawn line (a fan's head ray) from `origin` to `end`: a shock bends at every point
   *  where it absorbs a fan ray or merges with another shock. */
  path: Point[];
  /** Shocks only: static pressure ratio across the shock (behind over ahead) on each segment
   *  of `path` (length = path.length − 1). Below 1 only where absorbed expansions outweigh
   *  the shock (an isentropic jump; the line is then no longer a shock). */
  pRatioAlong?: number[];
  /** Shocks only: the shock angle β from the flow ahead (degrees) and the Mach number behind,
   *  on each segment of `path`. */
  betaDegAlong?: number[];
  machBehindAlong?: number[];
  /** p/p∞ ahead of and behind the line on each segment of `path` (not for fans: see their
   *  rays; a slip line: above and below). */
  pRatioAheadAlong?: number[];
  pRatioBehindAlong?: number[];
  /** State ahead of the wave (slip line: the upper stream). */
  upstream: WaveState;
  /** State behind the wave (slip line: the lower stream). */
  downstream: WaveState;
  /** p/p∞ behind the wave. */
  pRatioBehind: number;
  /** Flow turn across the wave, degrees (+ = compression); 0 for Mach and slip lines. */
  deflectionDeg: number;
}

/**
 * A point where two waves meet. `absorbed`: a fan ray or Mach line ended on a shock, which
 * bends there; `merged`: two shocks of one stream became one (a slip line starts there);
 * `crossed`: waves of the two streams (or a wave and a slip line) crossed and both go on.
 * `waves[0]` is the one further from the body (for `absorbed`/`merged`), and the wave that
 * goes on is listed in `survivor` (absent for `crossed`).
 */
export interface WaveIntersection {
  at: Point;
  waves: [string, string];
  kind: 'absorbed' | 'merged' | 'crossed';
  survivor?: string;
}

/** The section as the solver sees it. */
export interface SectionGeometry {
  /** max x − min x. */
  chord: number;
  noseIndex: number;
  tailIndex: number;
  nose: Point;
  tail: Point;
  /** Vertex indices nose → tail over the top (upper) and the bottom (lower); both include
   *  the nose and the tail. */
  upper: number[];
  lower: number[];
  momentPoint: Point;
  /** Largest thickness normal to the chord line (nose → tail), over the chord line's length. */
  maxThicknessRatio: number;
  /** What every coefficient is referred to: cl, cd, cn, ca over q∞·chord, cm over q∞·chord²
   *  about `momentPoint`, x/c from `leadingEdge`. `source` is `outline` when these are the
   *  solved outline's own chord and nose, `input` when the caller gave them (e.g. the drawn
   *  section of a deflected flap, so that coefficients do not move with the flap's chord). */
  reference: { chord: number; leadingEdge: Point; source: 'outline' | 'input' };
}

/** The flight condition as solved. */
export interface SolveCondition {
  mach: number;
  alphaDeg: number;
  gamma: number;
}

/** Everything `solveSection` returns. */
export interface SolveResult {
  status: SolveStatus;
  limits: SolveLimit[];
  condition: SolveCondition;
  geometry: SectionGeometry;
  surfaces: { upper: Facet[]; lower: Facet[] };
  coefficients: Coefficients | null;
  bySurface: { upper: SurfaceCoefficients; lower: SurfaceCoefficients } | null;
  theories: { linear: TheoryResult; secondOrder: TheoryResult } | null;
  trailingEdge: TrailingEdge;
  waves: Wave[];
  intersections: WaveIntersection[];
  warnings: string[];
}
