/**
 * The batch CLI (`npm run --silent solve -- CASE.json`), run as a child process on the example
 * cases in tests/fixtures/cases (sections of our own invention).
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { SolveResult } from '../../../shared/solver/types';
import { itemAt } from '../../../shared/util/invariant.ts';

function run(args: string[], stdin?: string) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/solve.ts', ...args], {
    input: stdin,
    encoding: 'utf8',
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const CASES = 'tests/fixtures/cases';

describe('solve CLI', () => {
  it('prints one JSON result and exits 0 for an attached case (fin root)', () => {
    const r = run([`${CASES}/fin-root-kestrel.json`]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const out = JSON.parse(r.stdout) as SolveResult;
    expect(out.status).toBe('ok');
    expect(out.coefficients!.cl).toBeGreaterThan(0);
    expect(out.surfaces.upper.length + out.surfaces.lower.length).toBe(6);
    expect(out.theories!.linear).toHaveProperty('cl');
    expect(out.trailingEdge.slipDeg).not.toBeNull();
    expect(out.waves.length).toBeGreaterThan(0);
  });

  it('exits 0 for a limit status too (a detached nose shock is an answer)', () => {
    const r = run([`${CASES}/thick-vane-detached.json`]);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout) as SolveResult;
    expect(out.status).toBe('detached');
    expect(out.coefficients).toBeNull();
    expect(itemAt(out.limits, 0).message).toMatch(/detaches/);
  });

  it('reads the case from stdin with "-"', () => {
    const r = run(['-'], readFileSync(`${CASES}/inlet-ramp-two-step.json`, 'utf8'));
    expect(r.code).toBe(0);
    expect((JSON.parse(r.stdout) as SolveResult).status).toBe('ok');
  });

  it.each([
    [['missing-case.json'], undefined, /^solve: cannot read missing-case\.json \(ENOENT\)\n$/],
    [['-'], '{not json', /^solve: stdin is not valid JSON \(.*\)\n$/],
    [['-'], '{"section":{"points":[[0,0],[1,0],[0.5,0.1]]},"flow":{"mach":0.8,"alphaDeg":0}}', /^solve: invalid case: flow\.mach must be above 1 \(supersonic\); got 0\.8\.\n$/],
    [[], undefined, /^solve: usage: /],
    [['-'], '{"section":{"points":[[0,0],[1,0],[0.5,0.1]]},"flow":{"mach":2,"alphaDeg":0,"gama":1.3}}', /^solve: invalid case: flow has an unknown key "gama" \(it takes mach, alphaDeg, gamma\)\.\n$/],
  ])('exits 2 with a one-line message on stderr for %j', (args, stdin, message) => {
    const r = run(args, stdin);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
