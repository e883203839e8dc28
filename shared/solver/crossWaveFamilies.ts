import { present } from '../util/invariant.ts';

/** A crossing of two drawn lines: the point and the two line indices. */
export interface LineCrossing {
  x: number;
  y: number;
  a: number;
  b: number;
  /** Segment indices of the crossing on line a and line b. */
  segA: number;
  segB: number;
}

/**
 * Where lines of opposite families cross: an upper-stream wave (family +1) with a
 * lower-stream one (−1), either with a slip line (0), or two slip lines (straight here, so
 * they can meet far from where they started). Line i's path is the points
 * k = start[i] … start[i + 1] − 1 at (coords[2k], coords[2k + 1]);
 * a crossing closer than `eps` to the start of either segment (a shared origin: the nose,
 * the tail) does not count.
 *
 * Upper-stream waves live above the lower-stream ones except where the section's own
 * thickness and camber let their heights overlap, so only the parts of segments inside that
 * band of heights are compared, in vertical slabs of x: each part is put in the slabs its
 * x-range spans and compared with the other family's parts in the same slab; a crossing
 * counts in the slab that holds its x. Cost O(L + K + pairs within slabs); lines of one
 * family never cross each other (interactWaves merges them), so they are not compared. The
 * slip lines (a handful) are compared with every segment and with each other.
 *
 * Sources: segment intersection by cross products (common practice); opposite families of
 * characteristics cross, same families merge (method of characteristics, e.g. Liepmann &
 * Roshko, Elements of Gasdynamics, 1957, ch. 12, from memory).
 */
export function crossWaveFamilies(coords: Float64Array, start: Int32Array, families: readonly (1 | -1 | 0)[], eps: number): LineCrossing[] {
  const lineCount = start.length - 1;
  const out: LineCrossing[] = [];
  let bandLo = Infinity;
  let bandHi = -Infinity;
  for (let i = 0; i < lineCount; i++) {
    const f = families[i];
    if (f === 0) continue;
    // start has lineCount + 1 entries: line i's points are start[i] … start[i + 1] − 1.
    const end = present(start[i + 1], i + 1, start);
    for (let k = present(start[i], i, start); k < end; k++) {
      const y = present(coords[2 * k + 1], 2 * k + 1, coords);
      if (f === 1 && y < bandLo) bandLo = y;
      if (f === -1 && y > bandHi) bandHi = y;
    }
  }

  // Parts of segments inside the band of heights both families reach.
  interface Part {
    line: number;
    seg: number;
    x0: number;
    x1: number;
  }
  const ups: Part[] = [];
  const downs: Part[] = [];
  let minX = Infinity;
  let maxX = -Infinity;
  if (bandLo < bandHi) {
    for (let i = 0; i < lineCount; i++) {
      const f = families[i];
      if (f === 0) continue;
      const first = present(start[i], i, start);
      const end = present(start[i + 1], i + 1, start);
      for (let k = first; k + 1 < end; k++) {
        const ax = present(coords[2 * k], 2 * k, coords);
        const ay = present(coords[2 * k + 1], 2 * k + 1, coords);
        const bx = present(coords[2 * k + 2], 2 * k + 2, coords);
        const by = present(coords[2 * k + 3], 2 * k + 3, coords);
        let t0 = 0;
        let t1 = 1;
        const ey = by - ay;
        if (ey === 0) {
          if (ay < bandLo || ay > bandHi) continue;
        } else {
          const ta = (bandLo - ay) / ey;
          const tb = (bandHi - ay) / ey;
          t0 = Math.max(t0, Math.min(ta, tb));
          t1 = Math.min(t1, Math.max(ta, tb));
          if (t0 > t1) continue;
        }
        const xa = ax + t0 * (bx - ax);
        const xb = ax + t1 * (bx - ax);
        const x0 = Math.min(xa, xb);
        const x1 = Math.max(xa, xb);
        (f === 1 ? ups : downs).push({ line: i, seg: k - first, x0, x1 });
        if (x0 < minX) minX = x0;
        if (x1 > maxX) maxX = x1;
      }
    }
  }
  if (ups.length > 0 && downs.length > 0) {
    const slabs = Math.max(1, Math.min(4096, Math.ceil(Math.sqrt(ups.length + downs.length))));
    const width = (maxX - minX) / slabs || 1;
    const slabOf = (x: number) => Math.min(slabs - 1, Math.max(0, Math.floor((x - minX) / width)));
    const bins: [number[], number[]][] = Array.from({ length: slabs }, () => [[], []]);
    for (const [side, list] of [
      [0, ups],
      [1, downs],
    ] as const) {
      for (let n = 0; n < list.length; n++) {
        const part = present(list[n], n, list);
        for (let s = slabOf(part.x0); s <= slabOf(part.x1); s++) present(bins[s], s, bins)[side].push(n);
      }
    }
    for (let s = 0; s < slabs; s++) {
      const [us, ds] = present(bins[s], s, bins);
      for (const u of us) {
        const pu = present(ups[u], u, ups);
        for (const d of ds) {
          const pd = present(downs[d], d, downs);
          const hit = segmentCrossing(coords, start, pu.line, pu.seg, pd.line, pd.seg, eps);
          if (hit && slabOf(hit[0]) === s) out.push({ x: hit[0], y: hit[1], a: pu.line, b: pd.line, segA: pu.seg, segB: pd.seg });
        }
      }
    }
  }

  // Slip lines against every wave segment.
  for (let i = 0; i < lineCount; i++) {
    if (families[i] !== 0) continue;
    const slipSegments = present(start[i + 1], i + 1, start) - present(start[i], i, start) - 1;
    for (let j = 0; j < lineCount; j++) {
      if (families[j] === 0 && j <= i) continue; // each pair of slip lines once
      const segments = present(start[j + 1], j + 1, start) - present(start[j], j, start) - 1;
      for (let k = 0; k < segments; k++) {
        for (let m = 0; m < slipSegments; m++) {
          const hit = segmentCrossing(coords, start, j, k, i, m, eps);
          if (hit) out.push({ x: hit[0], y: hit[1], a: j, b: i, segA: k, segB: m });
        }
      }
    }
  }
  return out;
}

/** The crossing point of segment sa of line a and segment sb of line b, if inside both. */
function segmentCrossing(coords: Float64Array, start: Int32Array, a: number, sa: number, b: number, sb: number, eps: number): [number, number] | null {
  const ka = 2 * (present(start[a], a, start) + sa);
  const kb = 2 * (present(start[b], b, start) + sb);
  const ax = present(coords[ka], ka, coords);
  const ay = present(coords[ka + 1], ka + 1, coords);
  const ex = present(coords[ka + 2], ka + 2, coords) - ax;
  const ey = present(coords[ka + 3], ka + 3, coords) - ay;
  const bx = present(coords[kb], kb, coords);
  const by = present(coords[kb + 1], kb + 1, coords);
  const fx = present(coords[kb + 2], kb + 2, coords) - bx;
  const fy = present(coords[kb + 3], kb + 3, coords) - by;
  const den = ex * fy - ey * fx;
  if (den === 0) return null;
  const wx = bx - ax;
  const wy = by - ay;
  const s = (wx * fy - wy * fx) / den;
  const t = (wx * ey - wy * ex) / den;
  const la = Math.hypot(ex, ey);
  const lb = Math.hypot(fx, fy);
  if (!(s * la > eps && t * lb > eps && s <= 1 && t <= 1)) return null;
  return [ax + s * ex, ay + s * ey];
}
