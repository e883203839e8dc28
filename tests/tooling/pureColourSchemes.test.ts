import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { pureColourSchemes } from '../../vite.config.ts';

/**
 * The build marks d3-scale-chromatic's top-level initialisers pure (vite.config.ts) so that the
 * schemes we do not use drop out of the bundle. A comment cannot change what the code computes;
 * this checks that the rewritten module still loads and gives every scheme's colours exactly as
 * the published package does, and that the marks reach the nested calls the size saving needs.
 */
const require = createRequire(import.meta.url);
const original = require.resolve('d3-scale-chromatic').replace(/\.js$/, '.mjs');

function transformed(): string {
  const plugin = pureColourSchemes();
  const transform = plugin.transform as (code: string, id: string) => { code: string } | null;
  const out = transform.call({}, readFileSync(original, 'utf8'), original);
  if (!out) throw new Error('the plugin left d3-scale-chromatic untouched');
  return out.code;
}

describe('pure colour schemes (build step)', () => {
  it('marks the scheme initialisers, nested calls included', () => {
    const code = transformed();
    // viridis is `ramp(colors("…"))`: both calls must be marked (from the package's source).
    expect(code).toMatch(/var viridis = \/\*#__PURE__\*\/ ramp\(\/\*#__PURE__\*\/ colors\(/);
    expect(code).toMatch(/var Blues = \/\*#__PURE__\*\/ ramp\$1\(/);
    // Function bodies are not touched.
    expect(code).toMatch(/^function colors\(specifier\) \{$/m);
  });

  it('leaves other modules alone', () => {
    const transform = pureColourSchemes().transform as (code: string, id: string) => unknown;
    expect(transform.call({}, 'var x = f();', '/app/src/canvas/colors.ts')).toBeNull();
  });

  it('computes every exported scheme exactly as the published module does', async () => {
    // Written beside the original so that its imports (d3-color, d3-interpolate) resolve.
    const copy = path.join(path.dirname(original), `.pure-check-${process.pid}.mjs`);
    writeFileSync(copy, transformed());
    try {
      const before = (await import(pathToFileURL(original).href)) as Record<string, unknown>;
      const after = (await import(pathToFileURL(copy).href)) as Record<string, unknown>;
      expect(Object.keys(after).sort()).toEqual(Object.keys(before).sort());
      let compared = 0;
      for (const [name, value] of Object.entries(before)) {
        const other = after[name];
        if (typeof value === 'function') {
          for (let i = 0; i <= 20; i++) {
            expect((other as (t: number) => string)(i / 20), `${name}(${i / 20})`).toBe((value as (t: number) => string)(i / 20));
            compared++;
          }
        } else {
          expect(other, name).toEqual(value);
          compared++;
        }
      }
      expect(compared).toBeGreaterThan(500);
      // viridis end points, matplotlib's published colour map (#440154 … #fde725; from memory).
      expect((after.interpolateViridis as (t: number) => string)(0)).toBe('#440154');
      expect((after.interpolateViridis as (t: number) => string)(1)).toBe('#fde725');
    } finally {
      rmSync(copy, { force: true });
    }
  });
});
