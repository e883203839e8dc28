import { present } from '../util/invariant.ts';
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
    const f = present(seeds[i], i, seeds).family === 1 ? 0 : 1;
    return x * present(axisX[f], f, axisX) + y * present(axisY[f], f, axisY);
  };
  const headsOn = (i: number): boolean => {
    const f = present(seeds[i], i, seeds).family === 1 ? 0 : 1;
    return present(dx[i], i, dx) * present(axisX[f], f, axisX) + present(dy[i], i, dy) * present(axisY[f], f, axisY) > 1e-9;
  };
  const addEvent = (key: number, i: number, j: number, x: number, y: number): void => {
    heapPush(heap, key, evI.length);
    evI.push(i);
    evJ.push(j);
    evVi.push(present(version[i], i, version));
    evVj.push(j >= 0 ? present(version[j], j, version) : 0);
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
    if (present(seeds[f], f, seeds).wave === present(seeds[r], r, seeds).wave) return; // one fan's rays fan out
    const fdx = present(dx[f], f, dx);
    const fdy = present(dy[f], f, dy);
    const rdx = present(dx[r], r, dx);
    const rdy = present(dy[r], r, dy);
    const den = fdx * rdy - fdy * rdx;
    if (Math.abs(den) < 1e-14) return;
    const wx = present(ox[r], r, ox) - present(ox[f], f, ox);
    const wy = present(oy[r], r, oy) - present(oy[f], f, oy);
    const tf = (wx * rdy - wy * rdx) / den;
    const tr = (wx * fdy - wy * fdx) / den;
    if (!(tf > eps && tr > eps && tf <= present(end[f], f, end) && tr <= present(end[r], r, end))) return;
    const x = present(ox[f], f, ox) + tf * fdx;
    const y = present(oy[f], f, oy) + tf * fdy;
    addEvent(sweepKey(f, x, y), f, r, x, y);
  };
  const unlink = (i: number): void => {
    const p = present(prev[i], i, prev);
    const q = present(next[i], i, next);
    if (p >= 0) next[p] = q;
    if (q >= 0) prev[q] = p;
    prev[i] = -1;
    next[i] = -1;
    schedulePair(p, q);
  };

  for (let i = 0; i < count; i++) {
    const s = present(seeds[i], i, seeds);
    ahead[i] = s.ahead;
    behind[i] = s.behind;
    shock[i] = s.shock ? 1 : 0;
    setSegment(i, s.ox, s.oy, s.direction, s.vertex);
  }
  // Each family as a linked list in order of origin; lines heading forward stay out of it.
  for (const family of [1, -1] as const) {
    let last = -1;
    for (let i = 0; i < count; i++) {
      if (present(seeds[i], i, seeds).family !== family || !headsOn(i)) continue;
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
    addEvent(sweepKey(i, present(endXs[i], i, endXs), present(endYs[i], i, endYs)), i, -1, 0, 0);
    schedulePair(i, present(next[i], i, next));
  }

  while (heap.keys.length > 0) {
    const e = heapPop(heap);
    const i = present(evI[e], e, evI);
    const j = present(evJ[e], e, evJ);
    if (!alive[i] || version[i] !== evVi[e]) continue;
    if (j < 0) {
      alive[i] = 0;
      unlink(i);
      continue;
    }
    if (!alive[j] || version[j] !== evVj[e] || next[i] !== j) continue;
    const x = present(evX[e], e, evX);
    const y = present(evY[e], e, evY);
    const bothShocks = shock[i] === 1 && shock[j] === 1;
    const survivor = shock[i] === 1 || shock[j] === 0 ? i : j;
    const gone = survivor === i ? j : i;
    stop(gone, x, y);
    unlink(gone);
    meetings.push({ x, y, front: i, rear: j, kind: bothShocks ? 'merged' : 'absorbed', survivor });
    if (shock[survivor] !== 1) continue; // two weak lines: the front one goes on unchanged

    const family = present(seeds[survivor], survivor, seeds).family;
    if (family === 0) throw new Error('Invariant broken: a slip line never enters the sweep');
    const a = present(ahead[i], i, ahead);
    const turned = turnFlow(a, present(behind[j], j, behind).psi, family, gamma);
    if (!turned) {
      stop(survivor, x, y);
      unlink(survivor);
      continue;
    }
    ahead[survivor] = a;
    behind[survivor] = turned.behind;
    version[survivor] = present(version[survivor], survivor, version) + 1;
    bends[survivor] = present(bends[survivor], survivor, bends) + 1;
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
    addEvent(sweepKey(survivor, present(endXs[survivor], survivor, endXs), present(endYs[survivor], survivor, endYs)), survivor, -1, 0, 0);
    schedulePair(present(prev[survivor], survivor, prev), survivor);
    schedulePair(survivor, present(next[survivor], survivor, next));
  }

  // Flatten: origin, bends, end for every line.
  const start = new Int32Array(count + 1);
  for (let i = 0; i < count; i++) start[i + 1] = present(start[i], i, start) + 2 + present(bends[i], i, bends);
  const total = present(start[count], count, start);
  const coords = new Float64Array(2 * total);
  const pAhead = new Float64Array(total - count);
  const pBehind = new Float64Array(total - count);
  const angleFromFlow = new Float64Array(total - count);
  const machBehind = new Float64Array(total - count);
  const fill = new Int32Array(count);
  for (let i = 0; i < count; i++) {
    const s = present(seeds[i], i, seeds);
    const k = present(start[i], i, start);
    coords[2 * k] = s.ox;
    coords[2 * k + 1] = s.oy;
    pAhead[k - i] = s.ahead.pRatio;
    pBehind[k - i] = s.behind.pRatio;
    angleFromFlow[k - i] = s.family * (s.direction - s.ahead.psi);
    machBehind[k - i] = s.behind.mach;
    fill[i] = 1;
    const last = present(start[i + 1], i + 1, start) - 1;
    coords[2 * last] = present(endXs[i], i, endXs);
    coords[2 * last + 1] = present(endYs[i], i, endYs);
  }
  for (let b = 0; b < bendLine.length; b++) {
    const i = present(bendLine[b], b, bendLine);
    const k = present(start[i], i, start) + present(fill[i], i, fill);
    coords[2 * k] = present(bendX[b], b, bendX);
    coords[2 * k + 1] = present(bendY[b], b, bendY);
    pAhead[k - i] = present(bendPA[b], b, bendPA);
    pBehind[k - i] = present(bendPB[b], b, bendPB);
    angleFromFlow[k - i] = present(bendAngle[b], b, bendAngle);
    machBehind[k - i] = present(bendMach[b], b, bendMach);
    fill[i] = present(fill[i], i, fill) + 1;
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
    const pk = present(keys[p], p, keys);
    if (pk <= key) break;
    keys[k] = pk;
    items[k] = present(items[p], p, items);
    k = p;
  }
  keys[k] = key;
  items[k] = item;
}

/** Removes and returns the item of least key (the heap must not be empty). */
function heapPop(h: EventHeap): number {
  const { keys, items } = h;
  const top = present(items[0], 0, items);
  const lastKey = keys.pop();
  const lastItem = items.pop();
  if (lastKey === undefined || lastItem === undefined) throw new Error('Invariant broken: heapPop on an empty heap');
  const n = keys.length;
  if (n === 0) return top;
  let k = 0;
  for (;;) {
    let c = 2 * k + 1;
    if (c >= n) break;
    if (c + 1 < n && present(keys[c + 1], c + 1, keys) < present(keys[c], c, keys)) c++;
    const ck = present(keys[c], c, keys);
    if (ck >= lastKey) break;
    keys[k] = ck;
    items[k] = present(items[c], c, items);
    k = c;
  }
  keys[k] = lastKey;
  items[k] = lastItem;
  return top;
}
