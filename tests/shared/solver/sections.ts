/**
 * Section builders and input helpers for the solver tests. All sections here are our own
 * (diamonds, wedges, lenses with made-up proportions).
 */
import type { SolveInput } from '../../../shared/model/solveInput';
import type { SolveResult } from '../../../shared/solver/types';

export type Pts = [number, number][];

export function input(
  points: Pts,
  mach: number,
  alphaDeg: number,
  extra: { gamma?: number; momentPoint?: [number, number]; waves?: boolean; fieldExtentChords?: number } = {},
): SolveInput {
  return {
    section: { points },
    flow: { mach, alphaDeg, gamma: extra.gamma ?? 1.4 },
    reference: extra.momentPoint ? { momentPoint: extra.momentPoint } : undefined,
    options: { fieldExtentChords: extra.fieldExtentChords ?? 1.5, waves: extra.waves ?? true },
  };
}

/** Symmetric double wedge (diamond), chord 1, thickness t, ridge at x = ridge; clockwise. */
export function diamond(t: number, ridge = 0.5): Pts {
  return [
    [0, 0],
    [ridge, t / 2],
    [1, 0],
    [ridge, -t / 2],
  ];
}

/** Wedge-nosed section: upper and lower nose half-angles (degrees), then a sharp tail. */
export function wedgeNose(upperDeg: number, lowerDeg: number): Pts {
  const r = Math.PI / 180;
  return [
    [0, 0],
    [0.5, 0.5 * Math.tan(upperDeg * r)],
    [1, 0],
    [0.5, -0.5 * Math.tan(lowerDeg * r)],
  ];
}

/** Cambered lens with m facets per surface and cosine spacing (clockwise). */
/** Symmetric biconvex (parabolic-arc) section, chord 1, thickness t, m facets per surface. */
export function biconvex(m: number, t: number): Pts {
  const upper: Pts = [];
  const lower: Pts = [];
  for (let i = 0; i <= m; i++) {
    const x = i / m;
    const y = 2 * t * x * (1 - x);
    upper.push([x, y]);
    lower.push([x, -y]);
  }
  return [...upper, ...lower.slice(1, -1).reverse()];
}

export function lens(m: number, thickness: number, camber: number): Pts {
  const upper: Pts = [];
  const lower: Pts = [];
  for (let i = 0; i <= m; i++) {
    const x = 0.5 * (1 - Math.cos((Math.PI * i) / m));
    const half = thickness * 2 * x * (1 - x);
    const c = camber * 4 * x * (1 - x);
    upper.push([x, c + half]);
    lower.push([x, c - half]);
  }
  return [...upper, ...lower.slice(1, -1).reverse()];
}

/** Every number anywhere in the value, with its path. */
export function numbersIn(value: unknown, path = 'result', out: [string, number][] = []): [string, number][] {
  if (typeof value === 'number') out.push([path, value]);
  else if (Array.isArray(value)) value.forEach((v, i) => numbersIn(v, `${path}[${i}]`, out));
  else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) numbersIn(v, `${path}.${k}`, out);
  }
  return out;
}

/** Paths of any NaN, ±Infinity or undefined-valued key in a result. */
export function badValues(result: SolveResult): string[] {
  const bad = numbersIn(result)
    .filter(([, v]) => !Number.isFinite(v))
    .map(([p, v]) => `${p} = ${v}`);
  const undef: string[] = [];
  const walk = (v: unknown, p: string) => {
    if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${p}[${i}]`));
    else if (v && typeof v === 'object') {
      for (const [k, x] of Object.entries(v)) {
        if (x === undefined) undef.push(`${p}.${k} = undefined`);
        else walk(x, `${p}.${k}`);
      }
    }
  };
  walk(result, 'result');
  return [...bad, ...undef];
}
