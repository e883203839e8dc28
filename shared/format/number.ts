/**
 * The one way Shockwright prints a number for people to read — the editor, the tables, the
 * canvas legend and tooltips, the PDF report and the PNG caption all call these. CSV and JSON
 * files keep plain machine-readable numbers instead.
 *
 * - A negative number has a true minus sign (U+2212), never a hyphen.
 * - Ordinary magnitudes, 10⁻⁵ ≤ |v| < 10⁷, are written out ("0.00013", "−0.0421", "12,340"):
 *   no "e" notation for the coefficients, differences and loads people compare.
 * - Outside that range, powers of ten are typeset: "1.234 × 10⁷", "−3.1 × 10⁻⁸".
 * - `digits` significant figures, trailing zeros dropped; thousands grouped with commas (1,327).
 */
export const MINUS = '\u2212';
const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** Written out between these magnitudes; powers of ten outside. */
export const FIXED_MIN = 1e-5;
export const FIXED_MAX = 1e7;

export function formatNumber(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || Number.isNaN(v)) return '—';
  if (!Number.isFinite(v)) return v > 0 ? '∞' : `${MINUS}∞`;
  if (v === 0) return '0';
  const sign = v < 0 ? MINUS : '';
  const abs = Math.abs(v);
  // Round first: 9.99995 at 4 figures is 10, which may cross a threshold.
  const rounded = Number(abs.toPrecision(digits));
  if (rounded >= FIXED_MIN && rounded < FIXED_MAX) return sign + fixed(rounded, digits);
  const exp = rounded.toExponential(digits - 1); // "d.ddde±n"
  const at = exp.indexOf('e');
  const m = trimZeros(exp.slice(0, at));
  const e = String(Number(exp.slice(at + 1))).split('').map((c) => SUPERSCRIPT[c]).join('');
  return `${sign}${m} × 10${e}`;
}

/** A difference with its sign always shown: "+0.0021", "−0.013", "0". */
export function formatSigned(v: number | null | undefined, digits = 3): string {
  if (v === null || v === undefined || Number.isNaN(v)) return '—';
  if (v === 0) return '0';
  const s = formatNumber(v, digits);
  return v > 0 ? `+${s}` : s;
}

/** A number with a fixed count of decimals (angles, percentages), true minus sign. */
export function formatFixed(v: number | null | undefined, decimals: number): string {
  if (v === null || v === undefined || Number.isNaN(v)) return '—';
  const s = Math.abs(v).toFixed(decimals);
  const zero = Number(s) === 0;
  return `${v < 0 && !zero ? MINUS : ''}${group(s)}`;
}

/** Reads back a number this module printed (tests, pasted values): true minus, commas, × 10ⁿ. */
export function parseFormatted(text: string): number {
  const t = text.trim().replace(/\u2212/g, '-').replace(/,/g, '');
  const sci = /^([-+]?[\d.]+) × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)$/.exec(t);
  if (sci?.[1] !== undefined && sci[2] !== undefined) {
    const back: Record<string, string> = Object.fromEntries(Object.entries(SUPERSCRIPT).map(([k, v]) => [v, k]));
    return Number(`${sci[1]}e${sci[2].split('').map((c) => back[c]).join('')}`);
  }
  return Number(t);
}

function fixed(abs: number, digits: number): string {
  // Decimals needed for `digits` significant figures at this magnitude.
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(abs)));
  return group(trimZeros(abs.toFixed(Math.min(decimals, 20))));
}

function trimZeros(s: string): string {
  return s.includes('.') ? s.replace(/0+$/, '').replace(/\.$/, '') : s;
}

function group(s: string): string {
  const dot = s.indexOf('.');
  const int = dot < 0 ? s : s.slice(0, dot);
  const frac = dot < 0 ? undefined : s.slice(dot + 1);
  if (int.length <= 3) return s;
  const grouped = int.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return frac === undefined ? grouped : `${grouped}.${frac}`;
}
