import type { XY } from '../model/polygon';
import { DEG_PER_RAD, FAN_INTERIOR_RAYS, WAVE_ORIGIN_EPS_CHORDS } from './constants';
import type { SurfaceMarch } from './marchSurface';
import type { TailTurn } from './matchTrailingEdge';
import { machAngle } from './machAngle';
import { machFromPrandtlMeyer, prandtlMeyer } from './prandtlMeyer';
import type { SurfaceChain } from './splitSurfaces';
import type { FanRay, Point, SurfaceName, Wave, WaveEndReason, WaveIntersection } from './types';
import { itemAt } from '../util/invariant.ts';

/** Everything the wave map needs from a solve. Angles in radians. */
export interface WaveTraceInput {
  points: readonly XY[];
  upper: SurfaceChain;
  lower: SurfaceChain;
  marchUpper: SurfaceMarch;
  marchLower: SurfaceMarch;
  /** The trailing-edge matching, when one exists. */
  tail: { slip: number; pRatio: number; upper: TailTurn; lower: TailTurn } | null;
  tailIndex: number;
  alpha: number;
  mach: number;
  gamma: number;
  /** Field box in body axes: waves stop at its edges. */
  box: { minX: number; maxX: number; minY: number; maxY: number };
  chord: number;
}

/** The drawn wave pattern: waves and the points where they first meet. */
export interface WaveMap {
  waves: Wave[];
  intersections: WaveIntersection[];
}

/**
 * Builds the wave map: every shock, fan, Mach line and the slip line, with directions in body
 * axes, the states on both sides and where each line stops.
 *
 * Directions: a wave from the upper surface leans up and aft of the local flow direction ψ
 * (shock at ψ + β, fan rays at ψ_j + μ_j); a lower-surface wave is mirrored (ψ − β, ψ − μ).
 * Fans carry a head ray, 3 interior rays (at ¼, ½, ¾ of the turn) and a tail ray, each with
 * its own Mach number and pressure. The trailing-edge waves stand in the upper and lower
 * streams (surface `upper` / `lower`, vertex = the tail); the slip line runs along the common
 * flow direction (surface `trailingEdge`).
 *
 * Each line (a fan: each ray) runs from its origin to the field box, or stops where it first
 * meets the body (`body`) or another wave (`wave`). Crossings are taken in order of how far
 * the later-arriving line has travelled, and one counts only if both lines are still running
 * there; each accepted crossing stops both lines and is listed in `intersections` (it marks
 * where an interaction begins; the interaction itself is not computed). A wave's `end` and
 * `endReason` are its line's (a fan's head ray's).
 *
 * Cost: O(L·(L + n)) for L lines and n vertices — quadratic, unlike the O(n) march, which is
 * why `solveSection` can skip it. Edge case: a surface whose march stopped has waves up to
 * the last solved facet only; without a trailing-edge matching there are no tail waves.
 *
 * Sources: wave geometry of the shock-expansion method (Mach angle μ = asin(1/M), shock angle β
 * from the θ-β-M relation; NACA Report 1135).
 */
export function traceWaves(input: WaveTraceInput): WaveMap {
  const lines: Line[] = [];
  const waves: Wave[] = [];
  addSurfaceWaves(input, 'upper', waves, lines);
  addSurfaceWaves(input, 'lower', waves, lines);
  if (input.tail) addTailWaves(input, waves, lines);

  const eps = WAVE_ORIGIN_EPS_CHORDS * input.chord;
  for (const line of lines) {
    line.end = boxExit(line, input.box);
    line.reason = 'field';
    const hit = bodyHit(line, input.points, eps);
    if (hit < line.end) {
      line.end = hit;
      line.reason = 'body';
    }
  }

  // Candidate crossings between lines of different waves.
  const cand: { a: number; b: number; ta: number; tb: number; key: number }[] = [];
  for (let i = 0; i < lines.length; i++) {
    const a = itemAt(lines, i);
    for (let j = i + 1; j < lines.length; j++) {
      const b = itemAt(lines, j);
      if (a.wave === b.wave) continue;
      const den = a.dx * b.dy - a.dy * b.dx;
      if (Math.abs(den) < 1e-14) continue;
      const wx = b.ox - a.ox;
      const wy = b.oy - a.oy;
      const ta = (wx * b.dy - wy * b.dx) / den;
      const tb = (wx * a.dy - wy * a.dx) / den;
      if (ta <= eps || tb <= eps || ta > a.end || tb > b.end) continue;
      cand.push({ a: i, b: j, ta, tb, key: Math.max(ta, tb) });
    }
  }
  cand.sort((p, q) => p.key - q.key);
  const intersections: WaveIntersection[] = [];
  for (const c of cand) {
    const a = itemAt(lines, c.a);
    const b = itemAt(lines, c.b);
    if (c.ta > a.end || c.tb > b.end) continue;
    a.end = c.ta;
    a.reason = 'wave';
    b.end = c.tb;
    b.reason = 'wave';
    intersections.push({
      at: [a.ox + c.ta * a.dx, a.oy + c.ta * a.dy],
      waves: [itemAt(waves, a.wave).id, itemAt(waves, b.wave).id],
    });
  }

  for (const line of lines) {
    const end: Point = [line.ox + line.end * line.dx, line.oy + line.end * line.dy];
    const w = itemAt(waves, line.wave);
    if (line.ray >= 0) {
      const ray = itemAt((w.rays as FanRay[]), line.ray);
      ray.end = end;
    }
    if (line.ray <= 0) {
      w.end = end;
      w.endReason = line.reason;
    }
  }
  return { waves, intersections };
}

/** One straight line of the map: a shock, Mach line, slip line or one fan ray. */
interface Line {
  wave: number;
  /** Fan ray index, or −1 for a single-line wave. */
  ray: number;
  /** Input vertex the line starts from (its two sides are skipped in the body test). */
  vertex: number;
  ox: number;
  oy: number;
  /** Unit direction. */
  dx: number;
  dy: number;
  end: number;
  reason: WaveEndReason;
}

interface StreamState {
  mach: number;
  pRatio: number;
  nu: number;
  /** Flow direction in body axes. */
  psi: number;
}

function addSurfaceWaves(input: WaveTraceInput, surface: SurfaceName, waves: Wave[], lines: Line[]): void {
  const chain = surface === 'upper' ? input.upper : input.lower;
  const march = surface === 'upper' ? input.marchUpper : input.marchLower;
  const sigma = surface === 'upper' ? 1 : -1;
  const free: StreamState = {
    mach: input.mach,
    pRatio: 1,
    nu: prandtlMeyer(input.mach, input.gamma),
    psi: input.alpha,
  };
  for (let k = 0; k < march.solved; k++) {
    const kind = march.wave[k];
    if (kind === 'none') continue;
    const up: StreamState =
      k === 0
        ? free
        : { mach: itemAt(march.mach, k - 1), pRatio: itemAt(march.pRatio, k - 1), nu: itemAt(march.nu, k - 1), psi: itemAt(chain.phi, k - 1) };
    const down: StreamState = { mach: itemAt(march.mach, k), pRatio: itemAt(march.pRatio, k), nu: itemAt(march.nu, k), psi: itemAt(chain.phi, k) };
    const vertex = itemAt(chain.vertices, k);
    const origin: Point = [itemAt(chain.xs, k), itemAt(chain.ys, k)];
    const id = `wave_${surface}_${vertex}`;
    if (kind === 'fan') {
      addFan(input, waves, lines, id, surface, vertex, origin, sigma, up, down, itemAt(march.turn, k));
    } else {
      const beta = kind === 'shock' ? itemAt(march.beta, k) : machAngle(up.mach);
      addStraight(waves, lines, {
        id,
        kind: kind === 'shock' ? 'shock' : 'mach',
        surface,
        vertex,
        origin,
        direction: up.psi + sigma * beta,
        beta: kind === 'shock' ? beta : undefined,
        up,
        down,
        pRatioBehind: down.pRatio,
        deflection: kind === 'shock' ? itemAt(march.turn, k) : 0,
      });
    }
  }
}

function addTailWaves(input: WaveTraceInput, waves: Wave[], lines: Line[]): void {
  const tail = input.tail as NonNullable<WaveTraceInput['tail']>;
  const vertex = input.tailIndex;
  const origin: Point = [itemAt(input.points, vertex)[0], itemAt(input.points, vertex)[1]];
  const after: Record<SurfaceName, StreamState> = {
    upper: { mach: tail.upper.machAfter, pRatio: tail.upper.pRatioAfter, nu: 0, psi: tail.slip },
    lower: { mach: tail.lower.machAfter, pRatio: tail.lower.pRatioAfter, nu: 0, psi: tail.slip },
  };
  for (const surface of ['upper', 'lower'] as const) {
    const chain = surface === 'upper' ? input.upper : input.lower;
    const march = surface === 'upper' ? input.marchUpper : input.marchLower;
    const turn = surface === 'upper' ? tail.upper : tail.lower;
    const sigma = surface === 'upper' ? 1 : -1;
    const last = march.solved - 1;
    const up: StreamState = {
      mach: itemAt(march.mach, last),
      pRatio: itemAt(march.pRatio, last),
      nu: itemAt(march.nu, last),
      psi: itemAt(chain.phi, last),
    };
    const down = after[surface];
    const id = `wave_tail_${surface}`;
    if (turn.kind === 'shock') {
      addStraight(waves, lines, {
        id,
        kind: 'shock',
        surface,
        vertex,
        origin,
        direction: up.psi + sigma * turn.beta,
        beta: turn.beta,
        up,
        down,
        pRatioBehind: down.pRatio,
        deflection: turn.deflection,
      });
    } else if (turn.kind === 'fan') {
      const downFan = { ...down, nu: up.nu - turn.deflection };
      addFan(input, waves, lines, id, surface, vertex, origin, sigma, up, downFan, turn.deflection);
    }
  }
  addStraight(waves, lines, {
    id: 'wave_slip',
    kind: 'slip',
    surface: 'trailingEdge',
    vertex,
    origin,
    direction: tail.slip,
    beta: undefined,
    up: after.upper,
    down: after.lower,
    pRatioBehind: tail.pRatio,
    deflection: 0,
  });
}

interface StraightWave {
  id: string;
  kind: 'shock' | 'mach' | 'slip';
  surface: SurfaceName | 'trailingEdge';
  vertex: number;
  origin: Point;
  direction: number;
  beta: number | undefined;
  up: StreamState;
  down: StreamState;
  pRatioBehind: number;
  deflection: number;
}

function addStraight(waves: Wave[], lines: Line[], w: StraightWave): void {
  const wave: Wave = {
    id: w.id,
    kind: w.kind,
    surface: w.surface,
    vertex: w.vertex,
    origin: w.origin,
    angleDeg: w.direction * DEG_PER_RAD,
    end: w.origin,
    endReason: 'field',
    upstream: { mach: w.up.mach, pRatio: w.up.pRatio },
    downstream: { mach: w.down.mach, pRatio: w.down.pRatio },
    pRatioBehind: w.pRatioBehind,
    deflectionDeg: w.deflection * DEG_PER_RAD,
  };
  if (w.beta !== undefined) wave.betaDeg = w.beta * DEG_PER_RAD;
  lines.push(line(waves.length, -1, w.vertex, w.origin, w.direction));
  waves.push(wave);
}

function addFan(
  input: WaveTraceInput,
  waves: Wave[],
  lines: Line[],
  id: string,
  surface: SurfaceName,
  vertex: number,
  origin: Point,
  sigma: 1 | -1,
  up: StreamState,
  down: StreamState,
  turn: number,
): void {
  const gamma = input.gamma;
  const h = 0.5 * (gamma - 1);
  const pExp = gamma / (gamma - 1);
  const size = -turn; // > 0 for an expansion
  const count = FAN_INTERIOR_RAYS + 2;
  const rays: FanRay[] = [];
  const index = waves.length;
  let mPrev = up.mach;
  for (let j = 0; j < count; j++) {
    const f = j / (count - 1);
    let m: number;
    let p: number;
    if (j === 0) {
      m = up.mach;
      p = up.pRatio;
    } else if (j === count - 1) {
      m = down.mach;
      p = down.pRatio;
    } else {
      m = machFromPrandtlMeyer(up.nu + f * size, gamma, mPrev);
      p = up.pRatio * Math.exp(pExp * (Math.log1p(h * up.mach * up.mach) - Math.log1p(h * m * m)));
    }
    mPrev = m;
    const psi = up.psi - sigma * f * size;
    const dir = psi + sigma * Math.asin(1 / m);
    rays.push({ angleDeg: dir * DEG_PER_RAD, end: origin, pRatio: p, mach: m });
    lines.push(line(index, j, vertex, origin, dir));
  }
  waves.push({
    id,
    kind: 'fan',
    surface,
    vertex,
    origin,
    angleDeg: itemAt(rays, 0).angleDeg,
    rays,
    end: origin,
    endReason: 'field',
    upstream: { mach: up.mach, pRatio: up.pRatio },
    downstream: { mach: down.mach, pRatio: down.pRatio },
    pRatioBehind: down.pRatio,
    deflectionDeg: turn * DEG_PER_RAD,
  });
}

function line(wave: number, ray: number, vertex: number, origin: Point, direction: number): Line {
  return {
    wave,
    ray,
    vertex,
    ox: origin[0],
    oy: origin[1],
    dx: Math.cos(direction),
    dy: Math.sin(direction),
    end: 0,
    reason: 'field',
  };
}

/** Distance along the line to the field box's edge (the origin lies inside the box). */
function boxExit(l: Line, box: WaveTraceInput['box']): number {
  let t = Infinity;
  if (l.dx > 0) t = Math.min(t, (box.maxX - l.ox) / l.dx);
  else if (l.dx < 0) t = Math.min(t, (box.minX - l.ox) / l.dx);
  if (l.dy > 0) t = Math.min(t, (box.maxY - l.oy) / l.dy);
  else if (l.dy < 0) t = Math.min(t, (box.minY - l.oy) / l.dy);
  return Math.max(0, t);
}

/**
 * Distance to the first polygon side the line meets, skipping the sides at its own vertex.
 * Each side is taken from its lexicographically smaller end, so the input's vertex order
 * cannot change the rounding.
 */
function bodyHit(l: Line, points: readonly XY[], eps: number): number {
  const n = points.length;
  let best = Infinity;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    if (i === l.vertex || j === l.vertex) continue;
    const pi = itemAt(points, i);
    const pj = itemAt(points, j);
    const first = pi[0] < pj[0] || (pi[0] === pj[0] && pi[1] < pj[1]);
    const p = first ? pi : pj;
    const q = first ? pj : pi;
    const ax = p[0];
    const ay = p[1];
    const ex = q[0] - ax;
    const ey = q[1] - ay;
    const den = l.dx * ey - l.dy * ex;
    if (den === 0) continue;
    const wx = ax - l.ox;
    const wy = ay - l.oy;
    const t = (wx * ey - wy * ex) / den;
    const u = (wx * l.dy - wy * l.dx) / den;
    if (t > eps && u >= 0 && u <= 1 && t < best) best = t;
  }
  return best;
}
