import { findRepeatedPoint, findSelfIntersection, signedArea } from './polygon.ts';
import { MAX_SECTION_VERTICES, type Point } from './sketch.ts';
import { firstItem, itemAt, lastItem } from '../util/invariant.ts';

/**
 * Reading a section from a coordinates file as people have them. Two layouts:
 *
 * - **Loop**: one vertex per line, going round the outline; a last point equal to the first
 *   (a closed outline) is dropped.
 * - **Two blocks**: a title line, a count line with the numbers of upper and lower points
 *   (`17 17`), the upper surface nose → tail, a blank line, the lower surface nose → tail. The
 *   blocks are joined into one loop (upper nose → tail, lower tail → nose) and a nose or tail the
 *   two surfaces share is kept once. Recognised only when the first data line is two whole
 *   numbers (≥ 2) AND the rest of the file is exactly two blank-separated blocks or exactly that
 *   many points, so a loop file is never read as blocks by accident.
 *
 * Values on a line are separated by spaces, tabs, a comma or a semicolon; `#` starts a comment;
 * the first non-blank line may be a title or header (text that is not two numbers).
 *
 * Decimal commas (`0,0125;0,0031`, `0,0125 0,0031`) are recognised per file: each data line is
 * read both ways — decimal point with `,` as a separator, and decimal comma with only spaces,
 * tabs and `;` as separators — and the file takes the reading under which more lines give two
 * numbers. The two readings can both give two numbers on a line only when it holds no comma
 * inside a number, and then they give the same numbers, so the choice is never a guess between
 * two different outlines. What was assumed is said in `notes`.
 *
 * The file is checked as a whole — text or binary, numbers, count lines and blocks, number of
 * points, repeated vertices, crossing facets — and every refusal names its line; a caller
 * replaces nothing unless `ok`.
 */

export interface CoordinatesIssue {
  /** 1-based line number, or null for a problem with the file as a whole. */
  line: number | null;
  message: string;
}

export type CoordinatesLayout = 'loop' | 'twoBlocks';
export type DecimalMark = 'point' | 'comma';

export interface CoordinatesRead {
  ok: true;
  /** The outline as one loop, in file units. */
  points: Point[];
  /** The title or header line that was skipped, if any. */
  header: string | null;
  /** What was assumed or tidied, in sentences. */
  notes: string[];
  layout: CoordinatesLayout;
  decimalMark: DecimalMark;
  /** Two-block layout: points read per surface (before a shared nose or tail was joined). */
  surfaces: { upper: number; lower: number } | null;
}

export type CoordinatesParseResult = CoordinatesRead | { ok: false; issues: CoordinatesIssue[] };

/** Beyond this many, line problems are summarised as "… and N more". */
export const MAX_LISTED_ISSUES = 20;

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const NUMBER_COMMA = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;
const SEPARATORS: Record<DecimalMark, RegExp> = { point: /[\s,;]+/, comma: /[\s;]+/ };

/** C0 controls other than tab, line feed, vertical tab, form feed and carriage return, and DEL. */
function isControl(code: number): boolean {
  return code <= 0x08 || (code >= 0x0e && code <= 0x1f) || code === 0x7f;
}

interface DataLine {
  line: number;
  content: string;
}

function tokens(content: string, mark: DecimalMark): string[] {
  return content.split(SEPARATORS[mark]).filter((t) => t.length > 0);
}

function isNumber(token: string, mark: DecimalMark): boolean {
  return mark === 'point' ? NUMBER.test(token) : NUMBER_COMMA.test(token);
}

function toNumber(token: string, mark: DecimalMark): number {
  return Number(mark === 'point' ? token : token.replace(',', '.'));
}

/** The two numbers on a line read with `mark`, or null. */
function pairOf(content: string, mark: DecimalMark): [number, number] | null {
  const t = tokens(content, mark);
  if (t.length !== 2 || !t.every((x) => isNumber(x, mark))) return null;
  const a = toNumber(itemAt(t, 0), mark);
  const b = toNumber(itemAt(t, 1), mark);
  return Number.isFinite(a) && Number.isFinite(b) ? [a + 0, b + 0] : null;
}

function allNumeric(content: string, mark: DecimalMark): boolean {
  return tokens(content, mark).every((t) => isNumber(t, mark));
}

/**
 * Where a file stops being text: the first NUL, or the line where unreadable bytes (U+FFFD from
 * decoding, C0 controls) pass 8 and 2 % of what was read. A title with one odd byte is text.
 */
export function findBinaryContent(text: string): { line: number; what: string } | null {
  let line = 1;
  let odd = 0;
  let firstOddLine = 1;
  const scanned = Math.min(text.length, 65_536);
  for (let i = 0; i < scanned; i++) {
    const ch = text.charAt(i);
    if (ch === '\n') line++;
    else if (ch === '\u0000') return { line, what: 'it holds NUL bytes' };
    else if (ch === '\uFFFD' || isControl(ch.charCodeAt(0))) {
      if (odd === 0) firstOddLine = line;
      odd++;
    }
  }
  if (odd > 8 && odd > scanned * 0.02) return { line: firstOddLine, what: `${odd} of its first ${scanned} characters are not readable text` };
  return null;
}

export function parseCoordinates(input: string): CoordinatesParseResult {
  const text = input.replace(/^\uFEFF/, '');
  const binary = findBinaryContent(text);
  if (binary) {
    return {
      ok: false,
      issues: [{ line: binary.line, message: `not a text file (${binary.what}). Save the coordinates as plain text (.txt, .dat or .csv) and choose that file.` }],
    };
  }

  // Lines without comments; blank ones kept as null (they separate blocks).
  const rows: (DataLine | null)[] = text.split(/\r\n|\n|\r/).map((raw, i) => {
    const content = (raw.includes('#') ? raw.slice(0, raw.indexOf('#')) : raw).trim();
    return content ? { line: i + 1, content } : null;
  });

  let header: string | null = null;
  const firstIndex = rows.findIndex((r) => r !== null);
  const first = firstIndex >= 0 ? itemAt(rows, firstIndex) : null;
  if (first && !allNumeric(first.content, 'point') && !allNumeric(first.content, 'comma')) {
    header = first.content;
    rows[firstIndex] = null;
  }
  const data = rows.filter((r): r is DataLine => r !== null);

  // One decimal mark per file: the reading under which more lines give two numbers.
  const pointLines = data.filter((d) => pairOf(d.content, 'point')).length;
  const commaLines = data.filter((d) => pairOf(d.content, 'comma')).length;
  const mark: DecimalMark = commaLines > pointLines ? 'comma' : 'point';
  const other: DecimalMark = mark === 'point' ? 'comma' : 'point';

  const issues: CoordinatesIssue[] = [];
  const values = new Map<number, Point>();
  for (const d of data) {
    const pair = pairOf(d.content, mark);
    if (pair) {
      values.set(d.line, pair);
      continue;
    }
    issues.push({ line: d.line, message: lineProblem(d.content, mark, other) });
  }
  if (issues.length > 0) return { ok: false, issues: capped(issues) };

  const notes: string[] = [];
  if (mark === 'comma') {
    const sample = data.map((d) => tokens(d.content, 'comma').find((t) => t.includes(','))).find((t) => t !== undefined) ?? '0,5';
    const sep = data.some((d) => d.content.includes(';')) ? 'semicolons' : 'spaces or tabs';
    notes.push(`Decimal commas: the file writes numbers such as “${sample}” (read as ${sample.replace(',', '.')}), with ${sep} between x and y.`);
  }

  const blocks = twoBlocks(rows, data, values);
  if (blocks && 'issue' in blocks) return { ok: false, issues: [blocks.issue] };

  let points: Point[];
  let lineOf: number[];
  let layout: CoordinatesLayout = 'loop';
  let surfaces: CoordinatesRead['surfaces'] = null;
  if (blocks) {
    ({ points, lineOf } = blocks);
    layout = 'twoBlocks';
    surfaces = { upper: blocks.upper, lower: blocks.lower };
    notes.push(...blocks.notes);
  } else {
    points = data.map((d) => values.get(d.line) as Point);
    lineOf = data.map((d) => d.line);
    if (points.length > 3) {
      const a = firstItem(points);
      const b = lastItem(points);
      if (a[0] === b[0] && a[1] === b[1]) {
        points.pop();
        const dropped = lineOf.pop();
        notes.push(`Line ${dropped} repeats the first point to close the outline; it was left out.`);
      }
    }
  }

  const problem = checkOutline(points, lineOf);
  if (problem) return { ok: false, issues: [problem] };
  return { ok: true, points, header, notes, layout, decimalMark: mark, surfaces };
}

/** Why a data line does not give two numbers under the file's decimal mark. */
function lineProblem(content: string, mark: DecimalMark, other: DecimalMark): string {
  const t = tokens(content, mark);
  const mixed = t.find((x) => /\d[.,]\d*[.,]/.test(x) || (x.includes('.') && x.includes(',')));
  if (mixed !== undefined) return `“${mixed}” mixes a decimal point and a decimal comma; a file uses one decimal mark.`;
  const otherPair = pairOf(content, other);
  if (otherPair) {
    const [mine, theirs] = mark === 'comma' ? ['decimal commas', 'decimal points'] : ['decimal points', 'decimal commas'];
    return `reads as (${otherPair[0]}, ${otherPair[1]}) only with ${theirs}, but the rest of the file uses ${mine}; a file uses one decimal mark.`;
  }
  const dotted = mark === 'comma' ? t.find((x) => x.includes('.') && NUMBER.test(x)) : undefined;
  if (dotted !== undefined) return `“${dotted}” has a decimal point, but the rest of the file uses decimal commas; a file uses one decimal mark.`;
  const bad = t.find((x) => !isNumber(x, mark));
  if (bad !== undefined) return `“${bad}” is not a number.`;
  if (t.length !== 2) return `expected two values (x y), found ${t.length}.`;
  return 'the value is too large to be a coordinate.';
}

const isCount = (v: number) => Number.isInteger(v) && v >= 2;

type Blocks = { points: Point[]; lineOf: number[]; upper: number; lower: number; notes: string[] };

/**
 * The two-block layout, when the file has it (see the module's comment): the joined loop, or the
 * one problem that stops it, or null for a loop file.
 */
function twoBlocks(rows: (DataLine | null)[], data: DataLine[], values: Map<number, Point>): Blocks | { issue: CoordinatesIssue } | null {
  if (data.length < 5) return null;
  const countLine = firstItem(data);
  const [nUpper, nLower] = values.get(countLine.line) as Point;
  if (!isCount(nUpper) || !isCount(nLower)) return null;

  // The data after the count line, in blank-separated runs.
  const runs: DataLine[][] = [];
  let current: DataLine[] = [];
  const start = rows.findIndex((r) => r === countLine) + 1;
  for (const r of rows.slice(start)) {
    if (r === null) {
      if (current.length > 0) runs.push(current);
      current = [];
    } else current.push(r);
  }
  if (current.length > 0) runs.push(current);
  const rest = runs.flat();

  let upper: DataLine[];
  let lower: DataLine[];
  if (runs.length === 2) {
    upper = itemAt(runs, 0);
    lower = itemAt(runs, 1);
    if (upper.length !== nUpper || lower.length !== nLower) {
      return {
        issue: {
          line: countLine.line,
          message:
            `the count line announces ${nUpper} upper and ${nLower} lower points, but the upper surface (${span(upper)}) ` +
            `has ${upper.length} and the lower (${span(lower)}) has ${lower.length}.`,
        },
      };
    }
  } else if (rest.length === nUpper + nLower) {
    upper = rest.slice(0, nUpper);
    lower = rest.slice(nUpper);
  } else return null;

  const at = (d: DataLine) => values.get(d.line) as Point;
  for (const [name, block] of [['upper', upper], ['lower', lower]] as const) {
    const a = at(firstItem(block));
    const b = at(lastItem(block));
    if (!(a[0] < b[0])) {
      return {
        issue: {
          line: firstItem(block).line,
          message: `the ${name} surface (${span(block)}) runs from x = ${a[0]} to x = ${b[0]}; in the two-block layout each surface goes from the nose to the tail.`,
        },
      };
    }
  }

  const notes = [`Two blocks (count on line ${countLine.line}): ${nUpper} upper points (${span(upper)}) and ${nLower} lower points (${span(lower)}), each nose → tail.`];
  const same = (p: DataLine, q: DataLine) => at(p)[0] === at(q)[0] && at(p)[1] === at(q)[1];
  let low = lower;
  const joined: string[] = [];
  if (same(firstItem(low), firstItem(upper))) {
    low = low.slice(1);
    joined.push('nose');
  }
  if (low.length > 0 && same(lastItem(low), lastItem(upper))) {
    low = low.slice(0, -1);
    joined.push('tail');
  }
  if (joined.length > 0) notes.push(`The surfaces share the ${joined.join(' and the ')}; ${joined.length === 1 ? 'it is' : 'they are'} kept once.`);
  const loop = [...upper, ...low.reverse()];
  return { points: loop.map(at), lineOf: loop.map((d) => d.line), upper: nUpper, lower: nLower, notes };
}

function span(block: DataLine[]): string {
  const a = firstItem(block).line;
  const b = lastItem(block).line;
  return a === b ? `line ${a}` : `lines ${a}–${b}`;
}

/** Count, repeated vertices, crossing facets and area of the assembled loop. */
function checkOutline(points: Point[], lineOf: number[]): CoordinatesIssue | null {
  if (points.length < 3) return { line: null, message: `a section needs at least 3 points; the file has ${points.length}.` };
  if (points.length > MAX_SECTION_VERTICES) return { line: null, message: `a section has at most ${MAX_SECTION_VERTICES} points; the file has ${points.length}.` };
  const repeated = findRepeatedPoint(points);
  if (repeated) {
    const [a, b] = repeated;
    const [x, y] = itemAt(points, a);
    return { line: itemAt(lineOf, b), message: `repeats the point on line ${itemAt(lineOf, a)} (${x}, ${y}); each vertex must be distinct.` };
  }
  const crossing = findSelfIntersection(points);
  if (crossing) {
    const n = points.length;
    const { edgeA, edgeB } = crossing;
    return {
      line: itemAt(lineOf, edgeB),
      message:
        `the facet from line ${itemAt(lineOf, edgeB)} to line ${itemAt(lineOf, (edgeB + 1) % n)} crosses or touches the facet ` +
        `from line ${itemAt(lineOf, edgeA)} to line ${itemAt(lineOf, (edgeA + 1) % n)}; the outline must not cross itself.`,
    };
  }
  if (signedArea(points) === 0) return { line: null, message: 'the points all lie on one line and enclose no area.' };
  return null;
}

function capped(issues: CoordinatesIssue[]): CoordinatesIssue[] {
  if (issues.length <= MAX_LISTED_ISSUES) return issues;
  const more = issues.length - MAX_LISTED_ISSUES;
  return [...issues.slice(0, MAX_LISTED_ISSUES), { line: null, message: `… and ${more} more line${more === 1 ? '' : 's'} with problems.` }];
}

/** "line 7: …" or the message alone for a whole-file problem. */
export function formatCoordinatesIssue(issue: CoordinatesIssue): string {
  return issue.line === null ? capitalise(issue.message) : `Line ${issue.line}: ${issue.message}`;
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}
