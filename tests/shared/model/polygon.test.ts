import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { reached } from '../../helpers/reached';
import { expectClose } from '../../helpers/expectClose';
import {
  allCollinear,
  findRepeatedPoint,
  findSelfIntersection,
  findSelfIntersectionNear,
  isSimplePolygon,
  signedArea,
  type XY,
} from '../../../shared/model/polygon';

const square: XY[] = [
  [0, 0],
  [1, 0],
  [1, 1],
  [0, 1],
];

describe('signedArea', () => {
  it('signedArea(unit square, counter-clockwise) = +1, clockwise = −1 (shoelace formula)', () => {
    expectClose(signedArea(square), 1, 1e-15);
    expectClose(signedArea([...square].reverse()), -1, 1e-15);
  });

  it('signedArea of a far-off triangle keeps its digits (coordinates taken relative to vertex 0)', () => {
    const off = 1e9;
    expectClose(signedArea([[off, off], [off + 1, off], [off, off + 1]]), 0.5, 1e-12);
  });

  it('signedArea of fewer than 3 points or collinear points is 0 (degenerate)', () => {
    expect(signedArea([[0, 0], [1, 1]])).toBe(0);
    expect(signedArea([[0, 0], [1, 1], [2, 2]])).toBe(0);
  });
});

describe('findSelfIntersection', () => {
  it('findSelfIntersection(square) is null (simple polygon)', () => {
    expect(findSelfIntersection(square)).toBeNull();
  });

  it('findSelfIntersection(bow tie) reports the two crossing sides', () => {
    const bowTie: XY[] = [[0, 0], [1, 1], [1, 0], [0, 1]];
    expect(findSelfIntersection(bowTie)).toEqual({ edgeA: 0, edgeB: 2 });
  });

  it('findSelfIntersection catches a spike folding back along its own side (adjacent overlap)', () => {
    const spike: XY[] = [[0, 0], [2, 0], [1, 0], [1, 1]];
    expect(findSelfIntersection(spike)).not.toBeNull();
  });

  it('findSelfIntersection catches a vertex touching a non-adjacent side', () => {
    const touching: XY[] = [[0, 0], [2, 0], [2, 2], [1, 0], [0, 2]];
    expect(findSelfIntersection(touching)).not.toBeNull();
  });
});

describe('findSelfIntersection: the sweep gives the full pairwise scan\'s answer', () => {
  const everyEdge = (points: readonly XY[]) => points.map((_, i) => i);

  it('on random polygons of a small integer grid (exact touches, shared lines, folds, crossings): the same pair or null as the scan (property)', () => {
    const checked = reached('sweep against the pairwise scan');
    let crossed = 0;
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer({ min: 0, max: 6 }), fc.integer({ min: 0, max: 6 })), { minLength: 3, maxLength: 24 }), (raw) => {
        const points = raw as XY[];
        const full = findSelfIntersectionNear(points, everyEdge(points));
        checked.hit();
        if (full) crossed++;
        expect(findSelfIntersection(points)).toEqual(full);
      }),
      { numRuns: 400 },
    );
    checked.expectAtLeast(400);
    // Both outcomes were exercised.
    expect(crossed).toBeGreaterThan(50);
    expect(crossed).toBeLessThan(400);
  });

  it('a faceted lens of 400 vertices is simple; dent one vertex through the other surface and the first crossing pair is the scan\'s', () => {
    const m = 200;
    const upper: XY[] = [];
    const lower: XY[] = [];
    for (let i = 0; i <= m; i++) {
      const x = i / m;
      upper.push([x, 0.12 * x * (1 - x)]);
      lower.push([x, -0.12 * x * (1 - x)]);
    }
    const lens = [...upper, ...lower.slice(1, -1).reverse()];
    expect(findSelfIntersection(lens)).toBeNull();
    const dented = lens.map((p, i) => (i === 60 ? ([p[0], -0.05] as XY) : p));
    const full = findSelfIntersectionNear(dented, everyEdge(dented));
    expect(full).not.toBeNull();
    expect(findSelfIntersection(dented)).toEqual(full);
  });
});

describe('allCollinear', () => {
  it('allCollinear is true for points on one line and false for a triangle', () => {
    expect(allCollinear([[0, 0], [1, 0.5], [2, 1], [-1, -0.5]])).toBe(true);
    expect(allCollinear([[0, 0], [1, 0.5], [2, 1.0001]])).toBe(false);
  });
});

describe('findRepeatedPoint and isSimplePolygon', () => {
  it('findRepeatedPoint finds the first repeat (and treats −0 as 0)', () => {
    expect(findRepeatedPoint([[0, 0], [1, 0], [0, 1], [1, 0]])).toEqual([1, 3]);
    expect(findRepeatedPoint([[0, 0], [1, 0], [-0, 0]])).toEqual([0, 2]);
    expect(findRepeatedPoint(square)).toBeNull();
  });

  it('findRepeatedPoint counts vertices within 1e-9 of the section size as repeated (tolerance edge)', () => {
    expect(findRepeatedPoint([[0, 0], [1, 0], [0.5, 0.2], [1 + 4e-10, 0]])).toEqual([1, 3]);
    expect(findRepeatedPoint([[0, 0], [1, 0], [0.5, 0.2], [1 + 4e-9, 0]])).toBeNull();
  });

  it('isSimplePolygon accepts a square and rejects repeats, crossings and zero area', () => {
    expect(isSimplePolygon(square)).toBe(true);
    expect(isSimplePolygon([[0, 0], [1, 0], [1, 0], [0, 1]])).toBe(false);
    expect(isSimplePolygon([[0, 0], [1, 1], [1, 0], [0, 1]])).toBe(false);
    expect(isSimplePolygon([[0, 0], [1, 1], [2, 2]])).toBe(false);
    expect(isSimplePolygon([[0, 0], [1, 1]])).toBe(false);
  });
});
