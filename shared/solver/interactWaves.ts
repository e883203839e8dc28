import type { BodyHit } from './bodyHitTest';
import { ZERO_TURN_RAD } from './constants';

/** Read once: an imported binding may be a getter call under some module loaders. */
const ZERO_TURN = ZERO_TURN_RAD;
import { obliqueShock } from './obliqueShock';
import { machFromPrandtlMeyer, prandtlMeyer, prandtlMeyerMax } from './prandtlMeyer';
import type { WaveEndReason } from './types';

/** A uniform flow state beside a wave: Mach, p/p∞ and flow direction (radians, body axes). */
export interface FlowState {
  mach: number;
  pRatio: number;
  psi: number;
}

/**
 * One straight line of the wave map as it leaves its origin: a shock, a Mach line, one fan
 * ray, or a slip line. `family` +1 = a wave in the upper stream (it leans up and aft of the
 * flow, ψ + β or ψ + μ), −1 = the lower stream (mirrored), 0 = a slip line (passive).
 */
export interface LineSeed {
  /** Index of the wave the line belongs to, and its fan ray (−1 for a single-line wave). */
  wave: number;
  ray: number;
  /** Input vertex the line starts from (its two sides are skipped in the body test). */
  vertex: number;
  family: 1 | -1 | 0;
  shock: boolean;
  ox: number;
  oy: number;
  /** Direction in body axes, radians. */
  direction: number;
  ahead: FlowState;
  behind: FlowState;
}

/** Where two lines of one family met: the rear one ends there, the front one goes on. */
export interface WaveMeeting {
  x: number;
  y: number;
  /** Seed indices: `front` is the one further from the body (it goes on unless only the
   *  rear one is a shock), `rear` the one that caught up or was overtaken. */
  front: number;
  rear: number;
  /** `merged`: two shocks became one (a slip line starts here); `absorbed`: a fan ray or
   *  Mach line ended on a shock (or two weak lines met). */
  kind: 'absorbed' | 'merged';
  /** The seed index of the line that goes on. */
  survivor: number;
}

/** A slip line started where two shocks merged (entropy differs across it). */
export interface InteractionSlip {
  x: number;
  y: number;
  direction: number;
  family: 1 | -1;
  pRatio: number;
  end: [number, number];
  reason: WaveEndReason;
  /** Seed index of the merged shock. */
  shock: number;
}

/**
 * The lines as drawn after the interactions, flat: line i's path is the points
 * k = start[i] … start[i + 1] − 1 at (coords[2k], coords[2k + 1]), origin → end; its segment
 * s (0 ≤ s < points − 1) has p/p∞ pAhead[start[i] − i + s] ahead and pBehind[…] behind.
 */
export interface Interactions {
  coords: Float64Array;
  start: Int32Array;
  pAhead: Float64Array;
  pBehind: Float64Array;
  /** On each segment (indexed like pAhead): the line's angle from the flow ahead, σ(dir − ψ)
   *  (radians; β for a shock), and the Mach number behind it. */
  angleFromFlow: Float64Array;
  machBehind: Float64Array;
  reason: WaveEndReason[];
  meetings: WaveMeeting[];
  slips: InteractionSlip[];
}

export interface InteractionContext {
  gamma: number;
  box: { minX: number; maxX: number; minY: number; maxY: number };
  /** Lengths below this (body units) count as zero: a crossing at a line's own origin. */
  eps: number;
  body: BodyHit;
}

/**
 * The interactions of the wave map among waves of one family, by the method of
 * characteristics with the waves as discrete lines: a fan ray or Mach line that meets a shock
 * is absorbed, and the shock goes on from the meeting point with the angle and strength of
 * the oblique shock between the state ahead of the front line and the flow direction behind
 * the rear one (turn θ = σ(ψ_behind − ψ_ahead)); two shocks that meet merge the same way and
 * start a slip line along the flow behind them. A net turn that is an expansion (θ < 0) goes
 * on as an isentropic (Prandtl-Meyer) jump of that turn along the mean characteristic; a turn
 * beyond θmax is held just below it.
 *
 * Neglected, as in the usual shock-expansion far field: the weak wave reflected from each
 * meeting (its strength is of third order in the wave strengths for weak waves — G. B.
 * Whitham, Linear and Nonlinear Waves, 1974, ch. 9 on weak shocks, from memory), so the
 * pressure behind the new shock follows from the flow direction alone; the entropy jump
 * across the new slip line (also third order) does not refract the waves crossing it.
 *
 * The sweep: within a family the lines never cross, so at any sweep position their order
 * across the stream is their order of origin along the surface (nose → tail, fan rays head →
 * tail, then the trailing-edge wave). Only neighbours in that order can meet next; events
 * (meetings and line ends at the field box or the body) are taken in order of the sweep
 * coordinate from a binary heap, and after each one only the new neighbours are tested. Cost
 * O(L log L) for L lines. The sweep runs along x, tilted to the mean of the family's
 * extreme directions, so that a Mach line standing upright behind a near-sonic shock still
 * heads on along it. A line heading back against the sweep (none in an ordinary pattern),
 * and the slip lines, do not interact; they run straight to the box or the body.
 *
 * Sources: oblique-shock and Prandtl-Meyer relations, NACA Report 1135; the shock-expansion
 * wave interactions of the method of characteristics (e.g. Liepmann & Roshko, Elements of
 * Gasdynamics, 1957, ch. 4 and 12, from memory).
 */
export function interactWaves(seeds: readonly LineSeed[], ctx: InteractionContext): Interactions {
  const count = seeds.length;
  const { gamma, eps } = ctx;
  const ox = new Float64Array(count);
  const oy = new Float64Array(count);
  const dx = new Float64Array(count);
  const dy = new Float64Array(count);
  const end = new Float64Array(count);
  const endXs = new Float64Array(count);
  const endYs = new Float64Array(count);
  const prev = new Int32Array(count).fill(-1);
  const next = new Int32Array(count).fill(-1);
  const version = new Int32Array(count);
  const alive = new Uint8Array(count);
  const shock = new Uint8Array(count);
  const bends = new Int32Array(count);
  const reason: WaveEndReason[] = new Array(count);
  const ahead: FlowState[] = new Array(count);
  const behind: FlowState[] = new Array(count);
  const meetings: WaveMeeting[] = [];
  const slips: InteractionSlip[] = [];
  // Bends of the lines that change direction (shocks), in the order they happen.
  const bendLine: number[] = [];
  const bendX: number[] = [];
  const bendY: number[] = [];
  const bendPA: number[] = [];
  const bendPB: number[] = [];
  const bendAngle: number[] = [];
  const bendMach: number[] = [];
  // Events: a meeting of lines i (front) and j (rear), or the end of line i (j = −1); vi, vj
  // are the lines' versions when it was scheduled (a stale event is skipped).
  const evI: number[] = [];
  const evJ: number[] = [];
  const evVi: number[] = [];
  const evVj: number[] = [];
  const evX: number[] = [];
  const evY: number[] = [];
  const heap: EventHeap = { keys: [], items: [] };
  // The sweep axis of each family: the mean of its lines' extreme directions, so that every
  // line heads forward along it (x for the usual pattern; tilted when rays near M 1 stand
  // upright or lean forward). Index 0: family +1, 1: family −1.
  const axisX = [1, 1];
  const axisY = [0, 0];
  for (const family of [1, -1] as const) {
    let lo = Infinity;
    let hi = -Infinity;
    for (const seed of seeds) {
      if (seed.family !== family) continue;
      lo = Math.min(lo, seed.direction);
      hi = Math.max(hi, seed.direction);
    }
    if (hi - lo < Math.PI * 0.95) {
      const mid = 0.5 * (lo + hi);
      axisX[family === 1 ? 0 : 1] = Math.cos(mid);
      axisY[family === 1 ? 0 : 1] = Math.sin(mid);
    }
  }
  const sweepKey = (i: number, x: number, y: number): number => {
    const f = (seeds[i] as LineSeed).family === 1 ? 0 : 1;
    return x * (axisX[f] as number) + y * (axisY[f] as number);
  };
  const headsOn = (i: number): boolean => {
    const f = (seeds[i] as LineSeed).family === 1 ? 0 : 1;
    return (dx[i] as number) * (axisX[f] as number) + (dy[i] as number) * (axisY[f] as number) > 1e-9;
  };
  const addEvent = (key: number, i: number, j: number, x: number, y: number): void => {
    heapPush(heap, key, evI.length);
    evI.push(i);
    evJ.push(j);
    evVi.push(version[i] as number);
    evVj.push(j >= 0 ? (version[j] as number) : 0);
    evX.push(x);
    evY.push(y);
  };

  const setSegment = (i: number, x: number, y: number, dir: number, skipVertex: number): void => {
    ox[i] = x;
    oy[i] = y;
    const cx = Math.cos(dir);
    const cy = Math.sin(dir);
    dx[i] = cx;
    dy[i] = cy;
    const box = boxExit(x, y, cx, cy, ctx.box);
    const hit = ctx.body(x, y, cx, cy, skipVertex);
    const t = hit < box ? hit : box;
    end[i] = t;
    reason[i] = hit < box ? 'body' : 'field';
    endXs[i] = x + t * cx;
    endYs[i] = y + t * cy;
  };
  const stop = (i: number, x: number, y: number): void => {
    endXs[i] = x;
    endYs[i] = y;
    reason[i] = 'wave';
    alive[i] = 0;
  };
  const schedulePair = (f: number, r: number): void => {
    if (f < 0 || r < 0) return;
    if ((seeds[f] as LineSeed).wave === (seeds[r] as LineSeed).wave) return; // one fan's rays fan out
    const fdx = dx[f] as number;
    const fdy = dy[f] as number;
    const rdx = dx[r] as number;
    const rdy = dy[r] as number;
    const den = fdx * rdy - fdy * rdx;
    if (Math.abs(den) < 1e-14) return;
    const wx = (ox[r] as number) - (ox[f] as number);
    const wy = (oy[r] as number) - (oy[f] as number);
    const tf = (wx * rdy - wy * rdx) / den;
    const tr = (wx * fdy - wy * fdx) / den;
    if (!(tf > eps && tr > eps && tf <= (end[f] as number) && tr <= (end[r] as number))) return;
    const x = (ox[f] as number) + tf * fdx;
    const y = (oy[f] as number) + tf * fdy;
    addEvent(sweepKey(f, x, y), f, r, x, y);
  };
  const unlink = (i: number): void => {
    const p = prev[i] as number;
    const q = next[i] as number;
    if (p >= 0) next[p] = q;
    if (q >= 0) prev[q] = p;
    prev[i] = -1;
    next[i] = -1;
    schedulePair(p, q);
  };

  for (let i = 0; i < count; i++) {
    const s = seeds[i] as LineSeed;
    ahead[i] = s.ahead;
    behind[i] = s.behind;
    shock[i] = s.shock ? 1 : 0;
    setSegment(i, s.ox, s.oy, s.direction, s.vertex);
  }
  // Each family as a linked list in order of origin; lines heading forward stay out of it.
  for (const family of [1, -1] as const) {
    let last = -1;
    for (let i = 0; i < count; i++) {
      if ((seeds[i] as LineSeed).family !== family || !headsOn(i)) continue;
      alive[i] = 1;
      if (last >= 0) {
        next[last] = i;
        prev[i] = last;
      }
      last = i;
    }
  }
  for (let i = 0; i < count; i++) {
    if (!alive[i]) continue;
    addEvent(sweepKey(i, endXs[i] as number, endYs[i] as number), i, -1, 0, 0);
    schedulePair(i, next[i] as number);
  }

  while (heap.keys.length > 0) {
    const e = heapPop(heap);
    const i = evI[e] as number;
    const j = evJ[e] as number;
    if (!alive[i] || version[i] !== evVi[e]) continue;
    if (j < 0) {
      alive[i] = 0;
      unlink(i);
      continue;
    }
    if (!alive[j] || version[j] !== evVj[e] || next[i] !== j) continue;
    const x = evX[e] as number;
    const y = evY[e] as number;
    const bothShocks = shock[i] === 1 && shock[j] === 1;
    const survivor = shock[i] === 1 || shock[j] === 0 ? i : j;
    const gone = survivor === i ? j : i;
    stop(gone, x, y);
    unlink(gone);
    meetings.push({ x, y, front: i, rear: j, kind: bothShocks ? 'merged' : 'absorbed', survivor });
    if (shock[survivor] !== 1) continue; // two weak lines: the front one goes on unchanged

    const family = (seeds[survivor] as LineSeed).family as 1 | -1;
    const a = ahead[i] as FlowState;
    const turned = turnFlow(a, (behind[j] as FlowState).psi, family, gamma);
    if (!turned) {
      stop(survivor, x, y);
      unlink(survivor);
      continue;
    }
    ahead[survivor] = a;
    behind[survivor] = turned.behind;
    version[survivor] = (version[survivor] as number) + 1;
    bends[survivor] = (bends[survivor] as number) + 1;
    bendLine.push(survivor);
    bendX.push(x);
    bendY.push(y);
    bendPA.push(a.pRatio);
    bendPB.push(turned.behind.pRatio);
    bendAngle.push(family * (turned.direction - a.psi));
    bendMach.push(turned.behind.mach);
    setSegment(survivor, x, y, turned.direction, -1);
    if (bothShocks) {
      const sx = Math.cos(turned.behind.psi);
      const sy = Math.sin(turned.behind.psi);
      const hit = ctx.body(x, y, sx, sy, -1);
      const box = boxExit(x, y, sx, sy, ctx.box);
      const t = hit < box ? hit : box;
      slips.push({
        x,
        y,
        direction: turned.behind.psi,
        family,
        pRatio: turned.behind.pRatio,
        end: [x + t * sx, y + t * sy],
        reason: hit < box ? 'body' : 'field',
        shock: survivor,
      });
    }
    if (!headsOn(survivor)) {
      // Turned back against the sweep: it leaves it and runs straight on.
      alive[survivor] = 0;
      unlink(survivor);
      continue;
    }
    addEvent(sweepKey(survivor, endXs[survivor] as number, endYs[survivor] as number), survivor, -1, 0, 0);
    schedulePair(prev[survivor] as number, survivor);
    schedulePair(survivor, next[survivor] as number);
  }

  // Flatten: origin, bends, end for every line.
  const start = new Int32Array(count + 1);
  for (let i = 0; i < count; i++) start[i + 1] = (start[i] as number) + 2 + (bends[i] as number);
  const total = start[count] as number;
  const coords = new Float64Array(2 * total);
  const pAhead = new Float64Array(total - count);
  const pBehind = new Float64Array(total - count);
  const angleFromFlow = new Float64Array(total - count);
  const machBehind = new Float64Array(total - count);
  const fill = new Int32Array(count);
  for (let i = 0; i < count; i++) {
    const s = seeds[i] as LineSeed;
    const k = start[i] as number;
    coords[2 * k] = s.ox;
    coords[2 * k + 1] = s.oy;
    pAhead[k - i] = s.ahead.pRatio;
    pBehind[k - i] = s.behind.pRatio;
    angleFromFlow[k - i] = s.family * (s.direction - s.ahead.psi);
    machBehind[k - i] = s.behind.mach;
    fill[i] = 1;
    const last = (start[i + 1] as number) - 1;
    coords[2 * last] = endXs[i] as number;
    coords[2 * last + 1] = endYs[i] as number;
  }
  for (let b = 0; b < bendLine.length; b++) {
    const i = bendLine[b] as number;
    const k = (start[i] as number) + (fill[i] as number);
    coords[2 * k] = bendX[b] as number;
    coords[2 * k + 1] = bendY[b] as number;
    pAhead[k - i] = bendPA[b] as number;
    pBehind[k - i] = bendPB[b] as number;
    angleFromFlow[k - i] = bendAngle[b] as number;
    machBehind[k - i] = bendMach[b] as number;
    fill[i] = (fill[i] as number) + 1;
  }
  return { coords, start, pAhead, pBehind, angleFromFlow, machBehind, reason, meetings, slips };
}

/**
 * The wave that turns the stream `a` to the direction `psiBehind` in the stream of family
 * `sigma`: an oblique shock (compression), a Mach line (no turn) or an isentropic
 * Prandtl-Meyer jump along the fan's mean characteristic (expansion). Null when the stream
 * is not supersonic (no wave of this kind exists).
 */
function turnFlow(a: FlowState, psiBehind: number, sigma: 1 | -1, gamma: number): { direction: number; behind: FlowState } | null {
  if (!(a.mach > 1)) return null;
  const theta = sigma * (psiBehind - a.psi);
  const muA = Math.asin(1 / a.mach);
  if (theta > ZERO_TURN) {
    let s = obliqueShock(a.mach, theta, gamma);
    if (s.status === 'detached') s = obliqueShock(a.mach, s.thetaMax * (1 - 1e-9), gamma);
    if (s.status === 'detached') return null;
    return {
      direction: a.psi + sigma * s.beta,
      behind: { mach: s.mach2, pRatio: a.pRatio * s.pRatio, psi: a.psi + sigma * s.theta },
    };
  }
  if (theta >= -ZERO_TURN) return { direction: a.psi + sigma * muA, behind: a };
  const nuA = prandtlMeyer(a.mach, gamma);
  const nuB = Math.min(nuA - theta, prandtlMeyerMax(gamma) * (1 - 1e-9));
  const machB = machFromPrandtlMeyer(nuB, gamma, a.mach, nuA);
  const h = 0.5 * (gamma - 1);
  const pRatio = a.pRatio * Math.pow((1 + h * a.mach * a.mach) / (1 + h * machB * machB), gamma / (gamma - 1));
  const turn = nuA - nuB; // = θ unless held at the vacuum limit
  return {
    direction: a.psi + sigma * (0.5 * turn + 0.5 * (muA + Math.asin(1 / machB))),
    behind: { mach: machB, pRatio, psi: a.psi + sigma * turn },
  };
}

/** Distance along a line to the field box's edge (the origin lies inside the box). */
function boxExit(x: number, y: number, dx: number, dy: number, box: InteractionContext['box']): number {
  let t = Infinity;
  if (dx > 0) t = Math.min(t, (box.maxX - x) / dx);
  else if (dx < 0) t = Math.min(t, (box.minX - x) / dx);
  if (dy > 0) t = Math.min(t, (box.maxY - y) / dy);
  else if (dy < 0) t = Math.min(t, (box.minY - y) / dy);
  return Math.max(0, t);
}

/** A binary min-heap of event indices keyed by x (plain arrays, no class). */
interface EventHeap {
  keys: number[];
  items: number[];
}

function heapPush(h: EventHeap, key: number, item: number): void {
  const { keys, items } = h;
  let k = keys.length;
  keys.push(key);
  items.push(item);
  while (k > 0) {
    const p = (k - 1) >> 1;
    const pk = keys[p] as number;
    if (pk <= key) break;
    keys[k] = pk;
    items[k] = items[p] as number;
    k = p;
  }
  keys[k] = key;
  items[k] = item;
}

/** Removes and returns the item of least key (the heap must not be empty). */
function heapPop(h: EventHeap): number {
  const { keys, items } = h;
  const top = items[0] as number;
  const lastKey = keys.pop() as number;
  const lastItem = items.pop() as number;
  const n = keys.length;
  if (n === 0) return top;
  let k = 0;
  for (;;) {
    let c = 2 * k + 1;
    if (c >= n) break;
    if (c + 1 < n && (keys[c + 1] as number) < (keys[c] as number)) c++;
    const ck = keys[c] as number;
    if (ck >= lastKey) break;
    keys[k] = ck;
    items[k] = items[c] as number;
    k = c;
  }
  keys[k] = lastKey;
  items[k] = lastItem;
  return top;
}
