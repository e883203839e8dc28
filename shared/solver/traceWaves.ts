import type { XY } from '../model/polygon';
import { firstItem, invariant, itemAt, present } from '../util/invariant.ts';
import { bodyHitTest } from './bodyHitTest';
import { DEG_PER_RAD, WAVE_ORIGIN_EPS_CHORDS } from './constants';
import { fanInteriorRays } from './fanInteriorRays';
import { crossWaveFamilies } from './crossWaveFamilies';
import { interactWaves, type FlowState, type LineSeed } from './interactWaves';
import type { SurfaceMarch } from './marchSurface';
import type { TailTurn } from './matchTrailingEdge';
import { machAngle } from './machAngle';
import { machFromPrandtlMeyer, prandtlMeyer } from './prandtlMeyer';
import type { SurfaceChain } from './splitSurfaces';
import type { FanRay, Point, SurfaceName, Wave, WaveIntersection } from './types';

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
  /** Most Prandtl-Meyer turning between neighbouring rays of a fan, degrees (`fanInteriorRays`);
   *  FAN_RAY_STEP_DEG_DEFAULT when left out. */
  fanRayStepDeg?: number;
}

/** The drawn wave pattern: waves and the points where they first meet. */
export interface WaveMap {
  waves: Wave[];
  intersections: WaveIntersection[];
}

/**
 * Builds the wave map: every shock, fan, Mach line and slip line, with directions in body
 * axes, the states on both sides, the path each line takes through the field and where the
 * waves meet.
 *
 * Directions: a wave from the upper surface leans up and aft of the local flow direction ψ
 * (shock at ψ + β, fan rays at ψ_j + μ_j); a lower-surface wave is mirrored (ψ − β, ψ − μ).
 * Fans carry a head ray, interior rays evenly spaced in turning and a tail ray, each with its
 * own Mach number and pressure: as many interior rays as keep neighbours at most
 * `fanRayStepDeg` (default 0.25°) apart, at least 1 and at most 3 (at ¼, ½, ¾ of the turn) —
 * `fanInteriorRays`. The trailing-edge waves stand in the upper and lower
 * streams (surface `upper` / `lower`, vertex = the tail); the slip line runs along the common
 * flow direction (surface `trailingEdge`).
 *
 * Interactions (`interactWaves`): waves of one stream that meet merge — a fan ray or Mach
 * line meeting a shock ends there and the shock goes on, bent and weakened (or strengthened)
 * to the oblique shock between the state ahead and the flow direction behind; two shocks
 * merge into one and start a slip line. Waves of the two streams cross and go on unchanged
 * (`crossWaveFamilies`; a weak wave crossing one of the other family keeps its strength to
 * first order), as do waves crossing a slip line (its refraction is neglected). Lines run to
 * the field box or the body unless absorbed. Each meeting is listed in `intersections`.
 *
 * Cost: O(L log L) for L lines plus O(log n) per line for the body test (O(n) only for lines
 * in a concave pocket of the section); see interactWaves. Edge case: a surface whose march
 * stopped has waves up to the last solved facet only; without a trailing-edge matching there
 * are no tail waves.
 *
 * Sources: wave geometry of the shock-expansion method (Mach angle μ = asin(1/M), shock angle β
 * from the θ-β-M relation; NACA Report 1135); interactions as in interactWaves.
 */
export function traceWaves(input: WaveTraceInput): WaveMap {
  const seeds: LineSeed[] = [];
  const waves: Wave[] = [];
  addSurfaceWaves(input, 'upper', waves, seeds);
  addSurfaceWaves(input, 'lower', waves, seeds);
  if (input.tail) addTailWaves(input, input.tail, waves, seeds);

  const eps = WAVE_ORIGIN_EPS_CHORDS * input.chord;
  const body = bodyHitTest(input.points, eps);
  const traced = interactWaves(seeds, { gamma: input.gamma, box: input.box, eps, body });

  const intersections: WaveIntersection[] = [];
  // Every seed names the wave it was made for (an index into waves).
  const waveOfLine = (line: number): Wave => {
    const seed = present(seeds[line], line, seeds);
    return present(waves[seed.wave], seed.wave, waves);
  };
  const idOf = (line: number) => waveOfLine(line).id;
  for (const m of traced.meetings) {
    intersections.push({ at: [m.x, m.y], waves: [idOf(m.front), idOf(m.rear)], kind: m.kind, survivor: idOf(m.survivor) });
  }

  const { coords, start, pAhead, pBehind } = traced;
  for (let i = 0; i < seeds.length; i++) {
    const seed = present(seeds[i], i, seeds);
    const w = present(waves[seed.wave], seed.wave, waves);
    const first = present(start[i], i, start);
    const points = present(start[i + 1], i + 1, start) - first;
    const path: Point[] = new Array(points);
    path[0] = w.origin;
    for (let k = 1; k < points; k++) {
      const c = 2 * (first + k);
      path[k] = [present(coords[c], c, coords), present(coords[c + 1], c + 1, coords)];
    }
    const end = present(path[points - 1], points - 1, path);
    if (seed.ray >= 0) {
      // The message is built only when it is needed (this runs for every fan ray).
      if (!w.rays) invariant(false, `a fan ray's wave ${w.id} has rays`);
      const ray = present(w.rays[seed.ray], seed.ray, w.rays);
      ray.end = end;
      ray.path = path;
    }
    if (seed.ray <= 0) {
      w.end = end;
      w.endReason = present(traced.reason[i], i, traced.reason);
      w.path = path;
    }
    if (seed.ray < 0) {
      const from = first - i;
      const to = from + points - 1;
      const ahead = plainList(pAhead, from, to, 1);
      const behind = plainList(pBehind, from, to, 1);
      w.pRatioAheadAlong = ahead;
      w.pRatioBehindAlong = behind;
      if (w.kind === 'shock') {
        w.pRatioAlong = behind.map((p, k) => p / present(ahead[k], k, ahead));
        w.betaDegAlong = plainList(traced.angleFromFlow, from, to, DEG_PER_RAD);
        w.machBehindAlong = plainList(traced.machBehind, from, to, 1);
      }
    }
  }

  // Slip lines from merged shocks (straight along the flow behind the merged shock).
  const slipCount = { upper: 0, lower: 0 };
  const slipWaves: Wave[] = [];
  for (const s of traced.slips) {
    const shockWave = waveOfLine(s.shock);
    const surface: SurfaceName = s.family === 1 ? 'upper' : 'lower';
    slipCount[surface]++;
    const origin: Point = [s.x, s.y];
    const state = { mach: 0, pRatio: s.pRatio };
    const w: Wave = {
      id: `wave_slip_${surface}_${slipCount[surface]}`,
      kind: 'slip',
      surface,
      vertex: shockWave.vertex,
      origin,
      angleDeg: s.direction * DEG_PER_RAD,
      end: s.end,
      endReason: s.reason,
      path: [origin, s.end],
      upstream: state,
      downstream: state,
      pRatioBehind: s.pRatio,
      deflectionDeg: 0,
      pRatioAheadAlong: [s.pRatio],
      pRatioBehindAlong: [s.pRatio],
    };
    slipWaves.push(w);
    waves.push(w);
  }

  // Waves of the two streams cross and go on, and so do waves crossing a slip line.
  let allCoords = coords;
  let allStart = start;
  const families: (1 | -1 | 0)[] = seeds.map((s) => s.family);
  if (slipWaves.length > 0) {
    const points = present(start[seeds.length], seeds.length, start);
    allCoords = new Float64Array(coords.length + 4 * slipWaves.length);
    allCoords.set(coords);
    allStart = new Int32Array(start.length + slipWaves.length);
    allStart.set(start);
    slipWaves.forEach((w, n) => {
      const k = points + 2 * n;
      allCoords[2 * k] = w.origin[0];
      allCoords[2 * k + 1] = w.origin[1];
      allCoords[2 * k + 2] = w.end[0];
      allCoords[2 * k + 3] = w.end[1];
      allStart[seeds.length + n + 1] = k + 2;
      families.push(0);
    });
  }
  const lineId = (line: number) => (line < seeds.length ? idOf(line) : present(slipWaves[line - seeds.length], line - seeds.length, slipWaves).id);
  const crossings = crossWaveFamilies(allCoords, allStart, families, eps);
  crossings.sort((p, q) => p.x - q.x || p.y - q.y);
  for (const c of crossings) intersections.push({ at: [c.x, c.y], waves: [lineId(c.a), lineId(c.b)], kind: 'crossed' });
  return { waves, intersections };
}

/**
 * `values[from…to)` times `scale`, as a plain list (the result is plain JSON). A loop: Array.from
 * of a typed array walks an iterator, several times slower for the long paths of far-field shocks.
 */
function plainList(values: Float64Array, from: number, to: number, scale: number): number[] {
  const out: number[] = new Array(to - from);
  for (let k = from; k < to; k++) out[k - from] = present(values[k], k, values) * scale;
  return out;
}

interface StreamState {
  mach: number;
  pRatio: number;
  nu: number;
  /** Flow direction in body axes. */
  psi: number;
}

function addSurfaceWaves(input: WaveTraceInput, surface: SurfaceName, waves: Wave[], seeds: LineSeed[]): void {
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
        : {
            mach: present(march.mach[k - 1], k - 1, march.mach),
            pRatio: present(march.pRatio[k - 1], k - 1, march.pRatio),
            nu: present(march.nu[k - 1], k - 1, march.nu),
            psi: present(chain.phi[k - 1], k - 1, chain.phi),
          };
    const down: StreamState = {
      mach: present(march.mach[k], k, march.mach),
      pRatio: present(march.pRatio[k], k, march.pRatio),
      nu: present(march.nu[k], k, march.nu),
      psi: present(chain.phi[k], k, chain.phi),
    };
    const vertex = present(chain.vertices[k], k, chain.vertices);
    const origin: Point = [present(chain.xs[k], k, chain.xs), present(chain.ys[k], k, chain.ys)];
    const id = `wave_${surface}_${vertex}`;
    if (kind === 'fan') {
      addFan(input, waves, seeds, id, surface, vertex, origin, sigma, up, down, present(march.turn[k], k, march.turn));
    } else {
      const beta = kind === 'shock' ? present(march.beta[k], k, march.beta) : machAngle(up.mach);
      addStraight(waves, seeds, {
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
        deflection: kind === 'shock' ? present(march.turn[k], k, march.turn) : 0,
        family: sigma,
      });
    }
  }
}

function addTailWaves(input: WaveTraceInput, tail: NonNullable<WaveTraceInput['tail']>, waves: Wave[], seeds: LineSeed[]): void {
  const vertex = input.tailIndex;
  const tailPoint = itemAt(input.points, vertex);
  const origin: Point = [tailPoint[0], tailPoint[1]];
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
      mach: present(march.mach[last], last, march.mach),
      pRatio: present(march.pRatio[last], last, march.pRatio),
      nu: present(march.nu[last], last, march.nu),
      psi: present(chain.phi[last], last, chain.phi),
    };
    const down = after[surface];
    const id = `wave_tail_${surface}`;
    if (turn.kind === 'shock') {
      addStraight(waves, seeds, {
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
        family: sigma,
      });
    } else if (turn.kind === 'fan') {
      const downFan = { ...down, nu: up.nu - turn.deflection };
      addFan(input, waves, seeds, id, surface, vertex, origin, sigma, up, downFan, turn.deflection);
    }
  }
  addStraight(waves, seeds, {
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
    family: 0,
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
  family: 1 | -1 | 0;
}

function flow(s: StreamState): FlowState {
  return { mach: s.mach, pRatio: s.pRatio, psi: s.psi };
}

function addStraight(waves: Wave[], seeds: LineSeed[], w: StraightWave): void {
  const wave: Wave = {
    id: w.id,
    kind: w.kind,
    surface: w.surface,
    vertex: w.vertex,
    origin: w.origin,
    angleDeg: w.direction * DEG_PER_RAD,
    end: w.origin,
    endReason: 'field',
    path: [w.origin],
    upstream: { mach: w.up.mach, pRatio: w.up.pRatio },
    downstream: { mach: w.down.mach, pRatio: w.down.pRatio },
    pRatioBehind: w.pRatioBehind,
    deflectionDeg: w.deflection * DEG_PER_RAD,
  };
  if (w.beta !== undefined) wave.betaDeg = w.beta * DEG_PER_RAD;
  const ahead = flow(w.up);
  seeds.push({
    wave: waves.length,
    ray: -1,
    vertex: w.vertex,
    family: w.family,
    shock: w.kind === 'shock',
    ox: w.origin[0],
    oy: w.origin[1],
    direction: w.direction,
    ahead,
    // A Mach line is a wave of no strength: the same state on both sides.
    behind: w.kind === 'mach' ? ahead : flow(w.down),
  });
  waves.push(wave);
}

function addFan(
  input: WaveTraceInput,
  waves: Wave[],
  seeds: LineSeed[],
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
  const count = fanInteriorRays(size, input.fanRayStepDeg) + 2;
  const rays: FanRay[] = [];
  const index = waves.length;
  const degPerRad = DEG_PER_RAD; // read once (an imported binding may be a getter call)
  let mPrev = up.mach;
  let before: FlowState = flow(up);
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
    const at: FlowState = { mach: m, pRatio: p, psi };
    // Ray j carries the change from the state at ray j − 1 to its own (the head ray: none).
    rays.push({ angleDeg: dir * degPerRad, end: origin, pRatio: p, mach: m, path: [origin], pRatioAhead: before.pRatio });
    seeds.push({
      wave: index,
      ray: j,
      vertex,
      family: sigma,
      shock: false,
      ox: origin[0],
      oy: origin[1],
      direction: dir,
      ahead: before,
      behind: at,
    });
    before = at;
  }
  waves.push({
    id,
    kind: 'fan',
    surface,
    vertex,
    origin,
    angleDeg: firstItem(rays).angleDeg,
    rays,
    end: origin,
    endReason: 'field',
    path: [origin],
    upstream: { mach: up.mach, pRatio: up.pRatio },
    downstream: { mach: down.mach, pRatio: down.pRatio },
    pRatioBehind: down.pRatio,
    deflectionDeg: turn * degPerRad,
  });
}
