import { describe, expect, it, vi } from 'vitest';
import type { Point } from '@shared/model/sketch';
import { parseSolveInput } from '@shared/model/solveInput';
import { solveSection } from '@shared/solver';
import { FIELD_ROW_PX, renderField } from '@/canvas/renderField';
import { renderMeetings, resultDomain } from '@/canvas/renderWaves';
import { lineStyleKey } from '@/canvas/useCanvasLayers';
import { DEFAULT_LAYERS } from '@/canvas/layers';
import { toScreen, toWorld } from '@/canvas/view';
import { pressureColour } from '@/canvas/colors';
import { drawList } from '@/canvas/drawPaths';
import { pressureField } from '@shared/solver/pressureField';

function biconvex(m: number, t: number): Point[] {
  const upper: Point[] = [];
  const lower: Point[] = [];
  for (let i = 0; i <= m; i++) {
    const x = i / m;
    const y = 2 * t * x * (1 - x);
    upper.push([x, y]);
    lower.push([x, -y]);
  }
  return [...upper, ...lower.slice(1, -1).reverse()];
}

const pts = biconvex(20, 0.1);
const parsed = parseSolveInput({ section: { points: pts }, flow: { mach: 2, alphaDeg: 2 } });
if (!parsed.ok) throw new Error('bad input');
const result = solveSection(parsed.value);
const view = { scale: 400, originX: 150, originY: 300 };
const rgbHex = (rgba: number[]) => `#${rgba.slice(0, 3).map((v) => v.toString(16).padStart(2, '0')).join('')}`;
const size = { width: 900, height: 600 };

describe('[DR4] pressure field layer, meeting marks and the line-style key', () => {
  it('fills the regions between the waves row by row with the colour of their p/p∞; nothing when the layer is off', () => {
    const domain = resultDomain(result);
    const image = renderField(result, pts, view, size, true, domain).image!;
    expect(image.rows).toBe(Math.ceil(image.height / FIELD_ROW_PX));
    expect(image.rowHeight).toBe(FIELD_ROW_PX);
    expect(image.alpha).toBeGreaterThan(0);
    expect(image.pixels).toHaveLength(image.width * image.rows * 4);
    // Every pixel, filled or not, is what the field gives at its centre: the colour of p/p∞
    // there, or nothing in the free stream and inside the section.
    const along = pressureField(result.waves, pts);
    let filled = 0;
    let empty = 0;
    for (let row = 0; row < image.rows; row += 7) {
      const sy = image.y + row * FIELD_ROW_PX + Math.min(FIELD_ROW_PX, image.y + image.height - (image.y + row * FIELD_ROW_PX)) / 2;
      for (let col = 0; col < image.width; col += 5) {
        const [x, y] = toWorld(view, [image.x + col + 0.5, sy]);
        const p = along(y, x - 1e-9, x + 1e-9).p[0];
        const o = 4 * (row * image.width + col);
        const rgba = [...image.pixels.slice(o, o + 4)];
        if (p === null || p === 1) {
          expect(rgba).toEqual([0, 0, 0, 0]);
          empty++;
        } else {
          expect(rgbHex(rgba)).toBe(pressureColour(p as number, domain));
          filled++;
        }
      }
    }
    expect(filled).toBeGreaterThan(500);
    expect(empty).toBeGreaterThan(100);
    expect(renderField(result, pts, view, size, false, domain).image).toBeUndefined();
  });

  it('a field built after another of the same size is written into its pixel buffer from scratch: nothing of the earlier one stays', () => {
    const parsedOther = parseSolveInput({ section: { points: pts }, flow: { mach: 3, alphaDeg: -3 } });
    if (!parsedOther.ok) throw new Error('bad input');
    const other = solveSection(parsedOther.value);
    const domain = resultDomain(result);
    // A canvas size of its own: the first picture gets a buffer of its own, a reference.
    const size2 = { width: 880, height: 560 };
    const first = renderField(other, pts, view, size2, true, domain).image!;
    const firstPixels = first.pixels.slice();
    const between = renderField(result, pts, view, size2, true, domain).image!;
    // The same buffer (no new one per move of a drag), now holding the other field.
    expect(between.pixels).toBe(first.pixels);
    const differing = (a: Uint8ClampedArray, b: Uint8ClampedArray) => a.reduce((n, v, i) => n + (v === b[i] ? 0 : 1), 0);
    expect(differing(between.pixels, firstPixels)).toBeGreaterThan(1000);
    const again = renderField(other, pts, view, size2, true, domain).image!;
    expect(again.pixels).toHaveLength(firstPixels.length);
    expect(differing(again.pixels, firstPixels)).toBe(0);
  });

  it('the row picture is drawn in one stretched, unsmoothed image draw inside the field box', () => {
    const image = renderField(result, pts, view, size, true, resultDomain(result)).image!;
    const calls: string[] = [];
    const ctx = new Proxy({} as Record<string | symbol, unknown>, {
      get: (target, key) => (key in target ? target[key] : (...args: unknown[]) => calls.push(`${String(key)}(${args.filter((a) => typeof a === 'number').join(',')})`)),
      set: (target, key, value) => {
        target[key] = value;
        return true;
      },
    });
    // The scratch canvas the rows are put on (a worker's OffscreenCanvas) and ImageData, stubbed.
    const putPixels: Uint8ClampedArray[] = [];
    vi.stubGlobal('ImageData', class {
      constructor(readonly data: Uint8ClampedArray, readonly width: number, readonly height: number) {}
    });
    vi.stubGlobal('OffscreenCanvas', class {
      constructor(public width: number, public height: number) {}
      getContext() {
        return { putImageData: (d: ImageData) => putPixels.push(d.data) };
      }
    });
    drawList(ctx as unknown as CanvasRenderingContext2D, { image, paths: [], dots: [] });
    vi.unstubAllGlobals();
    expect(putPixels).toHaveLength(1);
    expect(putPixels[0]).toBe(image.pixels);
    expect(calls).toContain(`rect(${image.x},${image.y},${image.width},${image.height})`);
    expect(calls).toContain(`drawImage(0,0,${image.width},${image.rows},${image.x},${image.y},${image.width},${image.rows * FIELD_ROW_PX})`);
    expect(ctx.imageSmoothingEnabled).toBe(false);
  });

  it('marks every meeting on screen; the key lists only the layers shown', () => {
    const dots = renderMeetings(result, view, size, true).dots;
    const onScreen = result.intersections.filter((m) => {
      const [x, y] = toScreen(view, m.at);
      return x >= -4 && y >= -4 && x <= size.width + 4 && y <= size.height + 4;
    });
    expect(dots).toHaveLength(onScreen.length);
    expect(renderMeetings(result, view, size, false).dots).toHaveLength(0);
    expect(lineStyleKey(DEFAULT_LAYERS).map((k) => k.label)).toContain('region filled by its p/p∞');
    expect(lineStyleKey({ ...DEFAULT_LAYERS, pressureField: false, meetings: false }).some((k) => k.dot || k.swatch)).toBe(false);
  });
});
