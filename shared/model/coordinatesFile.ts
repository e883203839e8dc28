import { findRepeatedPoint, findSelfIntersection, signedArea } from './polygon.ts';
import { MAX_SECTION_VERTICES, type Point } from './sketch.ts';
import { firstItem, itemAt, lastItem } from '../util/invariant.ts';

/**
 * Reading a section from a coordinates file: one vertex per line, `x y` separated by spaces,
 * tabs, a comma or a semicolon; `#` starts a comment (whole line or after the values); blank
 * lines are skipped; the first non-blank line may be a header (any text that is not two
 * numbers, e.g. `x,y`). A last point equal to the first (a closed outline) is dropped.
 *
 * The file is checked as a whole — numbers, count, repeated vertices, crossing facets — and
 * every problem is reported with its line number; a caller replaces nothing unless `ok`.
 */

export interface CoordinatesIssue {
  /** 1-based line number, or null for a problem with the file as a whole. */
  line: number | null;
  message: string;
}

export type CoordinatesParseResult =
  | { ok: true; points: Point[]; header: string | null; notes: string[] }
  | { ok: false; issues: CoordinatesIssue[] };

/** Beyond this many, line problems are summarised as "… and N more". */
export const MAX_LISTED_ISSUES = 20;

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

export function parseCoordinates(text: string): CoordinatesParseResult {
  const lines = text.split(/\r\n|\n|\r/);
  const issues: CoordinatesIssue[] = [];
  const points: Point[] = [];
  const lineOf: number[] = [];
  let header: string | null = null;
  let seenContent = false;

  lines.forEach((raw, i) => {
    const line = i + 1;
    const content = (raw.includes('#') ? raw.slice(0, raw.indexOf('#')) : raw).replace(/^\uFEFF/, '').trim();
    if (!content) return;
    const tokens = content.split(/[\s,;]+/).filter((t) => t.length > 0);
    const allNumeric = tokens.every((t) => NUMBER.test(t));
    if (!seenContent && !allNumeric) {
      seenContent = true;
      header = content;
      return;
    }
    seenContent = true;
    const bad = tokens.find((t) => !NUMBER.test(t));
    if (bad !== undefined) {
      issues.push({ line, message: `“${bad}” is not a number.` });
      return;
    }
    if (tokens.length !== 2) {
      issues.push({ line, message: `expected two values (x y), found ${tokens.length}.` });
      return;
    }
    const x = Number(tokens[0]);
    const y = Number(tokens[1]);
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      issues.push({ line, message: 'the value is too large to be a coordinate.' });
      return;
    }
    points.push([x + 0, y + 0]);
    lineOf.push(line);
  });

  if (issues.length > 0) return { ok: false, issues: capped(issues) };

  const notes: string[] = [];
  if (points.length > 3) {
    const first = firstItem(points);
    const last = lastItem(points);
    if (first[0] === last[0] && first[1] === last[1]) {
      points.pop();
      const dropped = lineOf.pop();
      notes.push(`Line ${dropped} repeats the first point to close the outline; it was left out.`);
    }
  }
  if (points.length < 3) {
    return { ok: false, issues: [{ line: null, message: `a section needs at least 3 points; the file has ${points.length}.` }] };
  }
  if (points.length > MAX_SECTION_VERTICES) {
    return { ok: false, issues: [{ line: null, message: `a section has at most ${MAX_SECTION_VERTICES} points; the file has ${points.length}.` }] };
  }
  const repeated = findRepeatedPoint(points);
  if (repeated) {
    const [a, b] = repeated;
    const [x, y] = itemAt(points, a);
    return {
      ok: false,
      issues: [{ line: itemAt(lineOf, b), message: `repeats the point on line ${itemAt(lineOf, a)} (${x}, ${y}); each vertex must be distinct.` }],
    };
  }
  const crossing = findSelfIntersection(points);
  if (crossing) {
    const n = points.length;
    const { edgeA, edgeB } = crossing;
    return {
      ok: false,
      issues: [
        {
          line: itemAt(lineOf, edgeB),
          message:
            `the facet from line ${itemAt(lineOf, edgeB)} to line ${itemAt(lineOf, (edgeB + 1) % n)} crosses or touches the facet ` +
            `from line ${itemAt(lineOf, edgeA)} to line ${itemAt(lineOf, (edgeA + 1) % n)}; the outline must not cross itself.`,
        },
      ],
    };
  }
  if (signedArea(points) === 0) {
    return { ok: false, issues: [{ line: null, message: 'the points all lie on one line and enclose no area.' }] };
  }
  return { ok: true, points, header, notes };
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
