import type { Point } from './sketch.ts';
import { invariant } from '../util/invariant.ts';

/**
 * Section templates: pure generators of common supersonic sections from a few parameters.
 * Every template has chord 1 with the nose at (0, 0) and the tail at (1, 0), lists its vertices
 * nose → upper surface → tail → lower surface, and yields a simple polygon for every parameter
 * value its ranges allow ([T1] in shared/model/README.md).
 *
 * The flat plate is a thin lens (a double wedge of tiny thickness), not a zero-thickness plate:
 * a section must enclose area to be a simple polygon. At the default 0.1 % thickness its results
 * differ from the exact flat plate's by: cd + 4(t/c)²/√(M²−1) at α = 0 (Ackeret's thickness drag
 * of a double wedge: 2.3e-6 at M 2, 3.6e-6 at M 1.5), a few 1e-6 at most up to α = 10°; cl by
 * under 4e-5 of its value (M 1.5–3, α ≤ 10°), an error of order (t/c)·α² — first order in the
 * thickness, from the entropy of the lens's own shocks — so 0.01 % gives a tenth to a quarter of it
 * (tests/shared/model/templates.test.ts).
 */

export interface TemplateParam {
  key: string;
  label: string;
  /** Shown after the value: '%', '°', '' … */
  unit: string;
  /** Range, inclusive, in the unit shown (percent values are entered as percent). */
  min: number;
  max: number;
  step: number;
  default: number;
  integer?: boolean;
  help: string;
}

export interface SectionTemplate {
  id: TemplateId;
  name: string;
  summary: string;
  params: TemplateParam[];
  /** Vertices for valid params (see `checkTemplateParams`). */
  generate(params: Record<string, number>): Point[];
}

export const TEMPLATE_IDS = ['wedge', 'doubleWedge', 'hexagonal', 'biconvex', 'flatPlate'] as const;
export type TemplateId = (typeof TEMPLATE_IDS)[number];

const pct = (v: number) => v / 100;

/** A generator's parameter; `generateSection` checked every one of the template's parameters first. */
function param(p: Record<string, number>, key: string): number {
  const v = p[key];
  invariant(v !== undefined, `template parameter ${key} is missing`);
  return v;
}
const DEG = Math.PI / 180;

/** Rounds away binary noise so the vertex table shows 0.3 rather than 0.30000000000000004. */
function clean(v: number): number {
  const r = Math.round(v * 1e12) / 1e12;
  return r === 0 ? 0 : r;
}
const pt = (x: number, y: number): Point => [clean(x), clean(y)];

export const SECTION_TEMPLATES: Record<TemplateId, SectionTemplate> = {
  wedge: {
    id: 'wedge',
    name: 'Wedge',
    summary: 'Flat underside, one ramp up to a ridge, then a straight closing facet down to the tail.',
    params: [
      { key: 'rampDeg', label: 'Ramp angle', unit: '°', min: 0.5, max: 30, step: 0.5, default: 6, help: 'Angle of the ramp from the nose.' },
      { key: 'ridgePercent', label: 'Ridge position', unit: '% c', min: 10, max: 95, step: 5, default: 70, help: 'Where the ramp ends, from the nose.' },
    ],
    generate: (p) => {
      const r = pct(param(p, 'ridgePercent'));
      return [pt(0, 0), pt(r, r * Math.tan(param(p, 'rampDeg') * DEG)), pt(1, 0)];
    },
  },
  doubleWedge: {
    id: 'doubleWedge',
    name: 'Double wedge',
    summary: 'Symmetric diamond: straight facets from nose and tail to a ridge on each surface.',
    params: [
      { key: 'thicknessPercent', label: 'Thickness ratio', unit: '% c', min: 0.5, max: 30, step: 0.5, default: 5, help: 'Maximum thickness over chord.' },
      { key: 'ridgePercent', label: 'Ridge position', unit: '% c', min: 5, max: 95, step: 5, default: 50, help: 'Where the ridge sits, from the nose.' },
    ],
    generate: (p) => {
      const h = pct(param(p, 'thicknessPercent')) / 2;
      const r = pct(param(p, 'ridgePercent'));
      return [pt(0, 0), pt(r, h), pt(1, 0), pt(r, -h)];
    },
  },
  hexagonal: {
    id: 'hexagonal',
    name: 'Hexagonal',
    summary: 'Symmetric, flat-topped: wedge nose, a flat of constant thickness, wedge tail.',
    params: [
      { key: 'thicknessPercent', label: 'Thickness ratio', unit: '% c', min: 0.5, max: 30, step: 0.5, default: 4, help: 'Thickness of the flat over chord.' },
      { key: 'flatPercent', label: 'Flat length', unit: '% c', min: 5, max: 90, step: 5, default: 50, help: 'Length of the flat part, centred on mid-chord.' },
    ],
    generate: (p) => {
      const h = pct(param(p, 'thicknessPercent')) / 2;
      const f = pct(param(p, 'flatPercent'));
      const a = (1 - f) / 2;
      return [pt(0, 0), pt(a, h), pt(a + f, h), pt(1, 0), pt(a + f, -h), pt(a, -h)];
    },
  },
  biconvex: {
    id: 'biconvex',
    name: 'Faceted biconvex',
    summary: 'Two circular arcs through nose and tail, each drawn as equal-length-in-x facets.',
    params: [
      { key: 'thicknessPercent', label: 'Thickness ratio', unit: '% c', min: 0.5, max: 30, step: 0.5, default: 6, help: 'Thickness of the arcs at mid-chord over chord.' },
      { key: 'facetsPerSide', label: 'Facets per side', unit: '', min: 2, max: 200, step: 1, default: 8, integer: true, help: 'Straight facets on each surface.' },
    ],
    generate: (p) => {
      const h = pct(param(p, 'thicknessPercent')) / 2;
      const n = Math.round(param(p, 'facetsPerSide'));
      // Circular arc through (0,0), (1,0) and (0.5,h): radius R, centre at (0.5, h − R).
      const radius = (0.25 + h * h) / (2 * h);
      const arcY = (x: number) => Math.sqrt(Math.max(0, radius * radius - (x - 0.5) ** 2)) - (radius - h);
      const upper: Point[] = [];
      for (let i = 0; i <= n; i++) {
        const x = i / n;
        upper.push(pt(x, i === 0 || i === n ? 0 : arcY(x)));
      }
      const lower = upper.slice(1, -1).reverse().map(([x, y]) => pt(x, -y));
      return [...upper, ...lower];
    },
  },
  flatPlate: {
    id: 'flatPlate',
    name: 'Flat plate (thin lens)',
    summary: 'A plate modelled as a very thin double wedge, so that it encloses area.',
    params: [
      { key: 'thicknessPercent', label: 'Lens thickness', unit: '% c', min: 0.01, max: 1, step: 0.01, default: 0.1, help: 'Kept tiny: at 0.1 % cl differs from a true plate by under 4e-5 of its value and cd by a few 1e-6.' },
    ],
    generate: (p) => {
      const h = pct(param(p, 'thicknessPercent')) / 2;
      return [pt(0, 0), pt(0.5, h), pt(1, 0), pt(0.5, -h)];
    },
  },
};

export const TEMPLATE_LIST: SectionTemplate[] = TEMPLATE_IDS.map((id) => SECTION_TEMPLATES[id]);

/** The template's default parameters. */
export function defaultTemplateParams(id: TemplateId): Record<string, number> {
  return Object.fromEntries(SECTION_TEMPLATES[id].params.map((p) => [p.key, p.default]));
}

/**
 * Checks parameters against the template's ranges. Returns one message per bad key (empty
 * object = valid), e.g. `{ thicknessPercent: 'Thickness ratio must be from 0.5 to 30 % c.' }`.
 */
export function checkTemplateParams(id: TemplateId, params: Record<string, unknown>): Record<string, string> {
  const errors: Record<string, string> = {};
  for (const p of SECTION_TEMPLATES[id].params) {
    const v = params[p.key];
    const unit = p.unit ? ` ${p.unit}` : '';
    if (typeof v !== 'number' || !Number.isFinite(v)) errors[p.key] = `${p.label} needs a number.`;
    else if (p.integer && !Number.isInteger(v)) errors[p.key] = `${p.label} must be a whole number.`;
    else if (v < p.min || v > p.max) errors[p.key] = `${p.label} must be from ${p.min} to ${p.max}${unit}.`;
  }
  return errors;
}

export type GenerateResult = { ok: true; points: Point[] } | { ok: false; errors: Record<string, string> };

/** Validates the parameters and generates the section. */
export function generateSection(id: TemplateId, params: Record<string, unknown>): GenerateResult {
  const errors = checkTemplateParams(id, params);
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  return { ok: true, points: SECTION_TEMPLATES[id].generate(params as Record<string, number>) };
}

/** A short title for a sketch made from a template, e.g. "Double wedge — thickness ratio 5 % c, ridge position 50 % c". */
export function templateTitle(id: TemplateId, params: Record<string, number>): string {
  const t = SECTION_TEMPLATES[id];
  const parts = t.params.map((p) => `${p.label.toLowerCase()} ${params[p.key]}${p.unit && p.unit !== '°' ? ` ${p.unit}` : p.unit}`);
  return `${t.name} — ${parts.join(', ')}`;
}
