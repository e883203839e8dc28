import { interpolateViridis } from 'd3-scale-chromatic';
import { firstItems, present } from '@shared/util/invariant';

/**
 * Canvas colours. The canvas is a dark slate so that thin wave lines read as light strokes;
 * the pressure scale is viridis (perceptually uniform, readable in colour-vision deficiency)
 * cut at its dark end so that every colour keeps at least 3:1 contrast with the background
 * (the WCAG 2.1 figure for graphical objects) — see [C1] in src/canvas/README.md.
 */
export const CANVAS_BACKGROUND = '#111c22';
export const GRID_MINOR = '#1a2a32';
export const GRID_MAJOR = '#243841';
export const AXIS = '#3b5963';
export const GRID_LABEL = '#7f98a2';
export const SECTION_FILL = '#2b3c44';
export const SECTION_OUTLINE = '#c9d6da';
export const SECTION_INVALID = '#ff6b5e';
export const VERTEX_FILL = '#e9f1f2';
export const VERTEX_SELECTED = '#5fd0c4';
export const UNSOLVED_FACET = '#6b7d84';
export const LIMIT_COLOUR = '#ffb547';
export const MARQUEE = '#5fd0c4';
export const HOVER = '#ffffff';

/** Part of viridis used for pressure: [PRESSURE_SCALE_START, 1]. */
export const PRESSURE_SCALE_START = 0.4;

/** Steps of the colour table: finer than the eye can tell apart on a thin line. */
export const PRESSURE_COLOUR_STEPS = 256;
let table: string[] | null = null;

/**
 * Colour for a position t ∈ [0, 1] along the pressure scale (0 = lowest pressure), from a
 * table of 256 viridis samples built once: a drag recolours hundreds of lines per frame.
 */
export function pressureColourAt(t: number): string {
  const c = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0.5));
  table ??= Array.from({ length: PRESSURE_COLOUR_STEPS }, (_, i) => interpolateViridis(PRESSURE_SCALE_START + ((1 - PRESSURE_SCALE_START) * i) / (PRESSURE_COLOUR_STEPS - 1)));
  const k = Math.round(c * (PRESSURE_COLOUR_STEPS - 1));
  return present(table[k], k, table);
}

let words: Uint32Array | null = null;

/**
 * The pressure scale's 256 colours as opaque RGBA pixels: each entry is the 32-bit word whose
 * bytes in memory are R, G, B, 255 on this machine (for a Uint32Array view of ImageData).
 */
export function pressureColourWords(): Uint32Array {
  if (words) return words;
  pressureColourAt(0);
  const out = new Uint32Array(PRESSURE_COLOUR_STEPS);
  const bytes = new Uint8Array(out.buffer);
  (table as string[]).forEach((c, i) => {
    const [r, g, b] = parseColour(c);
    bytes.set([r, g, b, 255], 4 * i);
  });
  words = out;
  return out;
}

/**
 * The pressure range the colours span ([C2] in src/canvas/README.md): the range of p/p∞ present
 * in the flow, free stream (p/p∞ = 1) included, at least 0.8 … 1.25 wide (a nearly uniform flow
 * is not painted in full contrast), rounded outwards to steps of 0.05 in ln(p/p∞) (about 5 %) so
 * that the colours and the legend hold still during a small drag. Its low end stops at
 * `PRESSURE_FLOOR`: an expansion towards vacuum (p/p∞ → 0, ln → −∞) would otherwise take most
 * of the scale for Cp differences nobody can read; lower pressures take the end colour and
 * `below` says that they exist. Nothing beyond the flow's own extremes is ever spanned.
 */
export interface PressureDomain {
  min: number;
  max: number;
  /** Some pressure lies below `min` (the floor) and is painted in the scale's low end colour. */
  below?: boolean;
}

/** Rounding step of the colour domain's ends, in ln(p/p∞). */
export const DOMAIN_STEP_LN = 0.05;
/** The domain spans at least 1/1.25 … 1.25 in p/p∞. */
export const DOMAIN_MIN_HALF_LN = Math.log(1.25);
/**
 * Lowest p/p∞ the scale spans. Below it Cp differs from the vacuum's by under 1 % of
 * 2/(γM²) — nothing a colour could tell apart.
 */
export const PRESSURE_FLOOR = 0.01;

export function pressureDomain(pressureRatios: readonly number[]): PressureDomain {
  let lo = -DOMAIN_MIN_HALF_LN;
  let hi = DOMAIN_MIN_HALF_LN;
  let vacuum = false;
  for (const p of pressureRatios) {
    if (p === 0) vacuum = true;
    if (!(p > 0) || !Number.isFinite(p)) continue;
    const l = Math.log(p);
    if (l < lo) lo = l;
    if (l > hi) hi = l;
  }
  const floor = Math.log(PRESSURE_FLOOR);
  const below = vacuum || lo < floor - 1e-12;
  lo = Math.max(floor, Math.floor(lo / DOMAIN_STEP_LN + 1e-9) * DOMAIN_STEP_LN);
  hi = Math.ceil(hi / DOMAIN_STEP_LN - 1e-9) * DOMAIN_STEP_LN;
  const domain: PressureDomain = { min: Math.exp(lo), max: Math.exp(hi) };
  if (below) domain.below = true;
  return domain;
}

/** Position of a pressure ratio on the scale, log-normalised in the domain. */
export function pressureT(p: number, domain: PressureDomain): number {
  if (!(p > 0)) return 0;
  const lo = Math.log(domain.min);
  const hi = Math.log(domain.max);
  return hi > lo ? (Math.log(p) - lo) / (hi - lo) : 0.5;
}

export function pressureColour(p: number, domain: PressureDomain): string {
  return pressureColourAt(pressureT(p, domain));
}

/** Cp from p/p∞ at free-stream Mach M: Cp = 2/(γM²)·(p/p∞ − 1) (definition). */
export function cpFromPressureRatio(p: number, mach: number, gamma: number): number {
  return (2 / (gamma * mach * mach)) * (p - 1);
}

/** p/p∞ from Cp (inverse of `cpFromPressureRatio`). */
export function pressureRatioFromCp(cp: number, mach: number, gamma: number): number {
  return 1 + (cp * gamma * mach * mach) / 2;
}

/** WCAG relative luminance of an `#rrggbb` or `rgb(r, g, b)` colour. */
export function relativeLuminance(colour: string): number {
  const rgb = parseColour(colour);
  const lin = (v: number) => {
    const s = v / 255;
    return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(rgb[0]) + 0.7152 * lin(rgb[1]) + 0.0722 * lin(rgb[2]);
}

/** WCAG contrast ratio (1…21) of two colours. */
export function contrastRatio(a: string, b: string): number {
  const la = relativeLuminance(a);
  const lb = relativeLuminance(b);
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}

function parseColour(c: string): [number, number, number] {
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(c);
  if (hex) {
    const [, r, g, b] = firstItems(hex, 4);
    return [parseInt(r, 16), parseInt(g, 16), parseInt(b, 16)];
  }
  const fn = /^rgb\((\d+),\s*(\d+),\s*(\d+)\)$/.exec(c);
  if (fn) {
    const [, r, g, b] = firstItems(fn, 4);
    return [Number(r), Number(g), Number(b)];
  }
  throw new Error(`Not a colour: ${c}`);
}
