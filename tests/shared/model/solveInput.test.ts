import { describe, expect, it } from 'vitest';
import { formatPath, parseSolveInput } from '../../../shared/model/solveInput';
import { itemAt } from '../../../shared/util/invariant.ts';

const diamond = [
  [0, 0],
  [0.5, 0.04],
  [1, 0],
  [0.5, -0.04],
];

function issuesOf(raw: unknown) {
  const r = parseSolveInput(raw);
  if (r.ok) throw new Error('expected the input to be refused');
  return r.issues;
}

describe('parseSolveInput', () => {
  it('parseSolveInput applies defaults: γ 1.4, field 1.5 chords, waves on, no reference', () => {
    const r = parseSolveInput({ section: { points: diamond }, flow: { mach: 2, alphaDeg: 1 } });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.flow).toEqual({ mach: 2, alphaDeg: 1, gamma: 1.4 });
    expect(r.value.options).toEqual({ fieldExtentChords: 1.5, waves: true });
    expect(r.value.reference).toBeUndefined();
    expect(r.value.section.points).toEqual(diamond);
  });

  it('parseSolveInput keeps given options and a moment point', () => {
    const r = parseSolveInput({
      section: { points: diamond },
      flow: { mach: 3, alphaDeg: -2, gamma: 1.3 },
      reference: { momentPoint: [0.4, 0] },
      options: { fieldExtentChords: 3, waves: false },
    });
    expect(r.ok && r.value.reference?.momentPoint).toEqual([0.4, 0]);
    expect(r.ok && r.value.options).toEqual({ fieldExtentChords: 3, waves: false });
  });

  it.each([
    [{ mach: 1, alphaDeg: 0 }, 'flow.mach', /above 1/],
    [{ mach: 0.8, alphaDeg: 0 }, 'flow.mach', /supersonic/],
    [{ mach: 51, alphaDeg: 0 }, 'flow.mach', /at most 50/],
    [{ mach: 2, alphaDeg: 90 }, 'flow.alphaDeg', /between −90 and 90/],
    [{ mach: 2, alphaDeg: -90 }, 'flow.alphaDeg', /between −90 and 90/],
    [{ mach: 2, alphaDeg: 0, gamma: 1 }, 'flow.gamma', /above 1/],
    [{ mach: 2, alphaDeg: 0, gamma: 1.7 }, 'flow.gamma', /at most 5\/3/],
    [{ alphaDeg: 0 }, 'flow.mach', /missing/],
    [{ mach: 'fast', alphaDeg: 0 }, 'flow.mach', /finite number/],
  ])('parseSolveInput refuses flow %j naming %s', (flow, path, message) => {
    const issues = issuesOf({ section: { points: diamond }, flow });
    expect(itemAt(issues, 0).path).toBe(path);
    expect(itemAt(issues, 0).message).toMatch(message);
    expect(itemAt(issues, 0).message).toContain(path);
  });

  it('parseSolveInput accepts the bounds themselves: M = 50, γ = 5/3, α = ±89.99', () => {
    for (const flow of [
      { mach: 50, alphaDeg: 89.99, gamma: 5 / 3 },
      { mach: 1.0001, alphaDeg: -89.99, gamma: 1.0001 },
    ]) {
      expect(parseSolveInput({ section: { points: diamond }, flow }).ok).toBe(true);
    }
  });

  it('parseSolveInput refuses a non-finite coordinate naming section.points[1]', () => {
    const issues = issuesOf({ section: { points: [[0, 0], [0.5, Number.NaN], [1, 0]] }, flow: { mach: 2, alphaDeg: 0 } });
    expect(itemAt(issues, 0).path).toBe('section.points[1]');
    expect(itemAt(issues, 0).message).toMatch(/finite numbers/);
    const inf = issuesOf({ section: { points: [[0, 0], [0.5, 1], [Infinity, 0]] }, flow: { mach: 2, alphaDeg: 0 } });
    expect(itemAt(inf, 0).path).toBe('section.points[2]');
  });

  it('parseSolveInput refuses a point that is not a pair', () => {
    const issues = issuesOf({ section: { points: [[0, 0], [0.5, 1, 3], [1, 0]] }, flow: { mach: 2, alphaDeg: 0 } });
    expect(itemAt(issues, 0).path).toBe('section.points[1]');
  });

  it('parseSolveInput refuses fewer than 3 points', () => {
    const issues = issuesOf({ section: { points: [[0, 0], [1, 0]] }, flow: { mach: 2, alphaDeg: 0 } });
    expect(issues[0]).toEqual({
      path: 'section.points',
      message: 'section.points needs at least 3 points to enclose a section; got 2.',
    });
  });

  it('parseSolveInput refuses more than 2000 points (bounds the quadratic checks)', () => {
    const many = Array.from({ length: 2001 }, (_, i) => [Math.cos((2 * Math.PI * i) / 2001), Math.sin((2 * Math.PI * i) / 2001)]);
    const issues = issuesOf({ section: { points: many }, flow: { mach: 2, alphaDeg: 0 } });
    expect(issues[0]).toEqual({ path: 'section.points', message: 'section.points has 2001 points; at most 2000 are accepted.' });
    expect(parseSolveInput({ section: { points: many.slice(0, 2000) }, flow: { mach: 2, alphaDeg: 0 } }).ok).toBe(true);
  });

  it('parseSolveInput refuses a point practically on top of another (within a billionth of the size)', () => {
    const issues = issuesOf({
      section: { points: [[0, 0], [0.5, 0.1], [1, 0], [1 + 1e-12, 1e-12], [0.5, -0.1]] },
      flow: { mach: 2, alphaDeg: 0 },
    });
    expect(itemAt(issues, 0).path).toBe('section.points[3]');
    expect(itemAt(issues, 0).message).toMatch(/practically the same point as section\.points\[2\]/);
  });

  it('parseSolveInput refuses a repeated point naming the repeat', () => {
    const issues = issuesOf({
      section: { points: [[0, 0], [0.5, 0.1], [1, 0], [0.5, 0.1]] },
      flow: { mach: 2, alphaDeg: 0 },
    });
    expect(itemAt(issues, 0).path).toBe('section.points[3]');
    expect(itemAt(issues, 0).message).toMatch(/repeats section.points\[1\]/);
  });

  it('parseSolveInput refuses a self-intersecting section', () => {
    const issues = issuesOf({
      section: { points: [[0, 0], [1, 1], [1, 0], [0, 1]] },
      flow: { mach: 2, alphaDeg: 0 },
    });
    expect(itemAt(issues, 0).path).toBe('section.points[2]');
    expect(itemAt(issues, 0).message).toMatch(/simple polygon/);
  });

  it('parseSolveInput refuses points on one line (zero area)', () => {
    const issues = issuesOf({ section: { points: [[0, 0], [1, 0.5], [2, 1]] }, flow: { mach: 2, alphaDeg: 0 } });
    expect(itemAt(issues, 0).path).toBe('section.points');
    expect(itemAt(issues, 0).message).toMatch(/no area/);
  });

  it('parseSolveInput refuses a missing section, a non-object input and bad options', () => {
    expect(itemAt(issuesOf({ flow: { mach: 2, alphaDeg: 0 } }), 0).path).toBe('section');
    expect(itemAt(issuesOf(42), 0).path).toBe('input');
    expect(itemAt(issuesOf(null), 0).message).toMatch(/JSON object/);
    const opt = issuesOf({ section: { points: diamond }, flow: { mach: 2, alphaDeg: 0 }, options: { fieldExtentChords: 0 } });
    expect(itemAt(opt, 0).path).toBe('options.fieldExtentChords');
    const waves = issuesOf({ section: { points: diamond }, flow: { mach: 2, alphaDeg: 0 }, options: { waves: 'yes' } });
    expect(itemAt(waves, 0).path).toBe('options.waves');
    const ref = issuesOf({ section: { points: diamond }, flow: { mach: 2, alphaDeg: 0 }, reference: { momentPoint: [1] } });
    expect(itemAt(ref, 0).path).toMatch(/^reference\.momentPoint/);
  });

  it('parseSolveInput takes options.fanRayStepDeg (the wave map\'s fan discretisation) above 0 and up to 180 degrees, left out by default, and names it when refused', () => {
    const base = { section: { points: diamond }, flow: { mach: 2, alphaDeg: 0 } };
    const ok = parseSolveInput({ ...base, options: { fanRayStepDeg: 1 } });
    expect(ok.ok && ok.value.options).toEqual({ fieldExtentChords: 1.5, waves: true, fanRayStepDeg: 1 });
    for (const bad of [0, -1, 181, 'fine']) {
      const issues = issuesOf({ ...base, options: { fanRayStepDeg: bad } });
      expect(itemAt(issues, 0).path).toBe('options.fanRayStepDeg');
      expect(itemAt(issues, 0).message).toMatch(/^options\.fanRayStepDeg must be/);
    }
  });

  it('parseSolveInput refuses an unknown key at every level by name, so a misspelt field never falls back to its default', () => {
    const base = { section: { points: diamond }, flow: { mach: 2, alphaDeg: 1 } };
    const flow = issuesOf({ ...base, flow: { mach: 2, alphaDeg: 1, gama: 1.3 } });
    expect(flow).toEqual([{ path: 'flow', message: 'flow has an unknown key "gama" (it takes mach, alphaDeg, gamma).' }]);
    expect(itemAt(issuesOf({ ...base, flows: {} }), 0).message).toBe('The solve input has an unknown key "flows" (it takes name, section, flow, reference, options).');
    expect(itemAt(issuesOf({ ...base, section: { points: diamond, closed: true } }), 0).message).toMatch(/^section has an unknown key "closed"/);
    expect(itemAt(issuesOf({ ...base, reference: { chrod: 2 } }), 0).message).toMatch(/^reference has an unknown key "chrod" \(it takes momentPoint, chord, leadingEdge\)/);
    expect(itemAt(issuesOf({ ...base, options: { wave: false } }), 0).message).toMatch(/^options has an unknown key "wave"/);
    expect(itemAt(issuesOf({ ...base, flow: { mach: 2, alphaDeg: 1, gama: 1.3, machNumber: 2 } }), 0).message).toMatch(/unknown keys "gama", "machNumber"/);
  });

  it('parseSolveInput takes a reference chord and leading edge, and refuses a non-positive chord', () => {
    const r = parseSolveInput({ section: { points: diamond }, flow: { mach: 2, alphaDeg: 1 }, reference: { chord: 1.2, leadingEdge: [0, 0] } });
    expect(r.ok && r.value.reference).toEqual({ chord: 1.2, leadingEdge: [0, 0] });
    expect(issuesOf({ section: { points: diamond }, flow: { mach: 2, alphaDeg: 1 }, reference: { chord: 0 } })[0]).toEqual({
      path: 'reference.chord',
      message: 'reference.chord must be a positive length; got 0.',
    });
  });

  it('formatPath writes array indices in brackets', () => {
    expect(formatPath(['section', 'points', 3])).toBe('section.points[3]');
    expect(formatPath(['flow', 'mach'])).toBe('flow.mach');
    expect(formatPath([])).toBe('input');
  });
});
