import { describe, expect, it } from 'vitest';
import type { Point } from '@shared/model/sketch';
import { parseSolveInput } from '@shared/model/solveInput';
import { solveSection } from '@shared/solver';
import { FIELD_ROW_PX, renderField } from '@/canvas/renderField';
import { renderMeetings, resultDomain } from '@/canvas/renderWaves';
import { lineStyleKey } from '@/canvas/useCanvasLayers';
import { DEFAULT_LAYERS } from '@/canvas/layers';
import { toScreen, toWorld } from '@/canvas/view';
import { pressureColour } from '@/canvas/colors';
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
const size = { width: 900, height: 600 };

describe('[DR4] pressure field layer, meeting marks and the line-style key', () => {
  it('fills the regions between the waves row by row with the colour of their p/p∞; nothing when the layer is off', () => {
    const domain = resultDomain(result);
    const list = renderField(result, pts, view, size, true, domain);
    expect(list.rects!.length).toBeGreaterThan(50);
    expect(list.rectAlpha).toBeGreaterThan(0);
    // A rectangle's colour is the pressure the field gives at its middle.
    const along = pressureField(result.waves, pts);
    for (const r of list.rects!.slice(0, 40)) {
      expect(r.h).toBeLessThanOrEqual(FIELD_ROW_PX);
      const [x, y] = toWorld(view, [r.x + r.w / 2, r.y + r.h / 2]);
      const row = along(y, x - 1e-9, x + 1e-9);
      expect(pressureColour(row.p[0] as number, domain)).toBe(r.fill);
    }
    expect(renderField(result, pts, view, size, false, domain).rects ?? []).toHaveLength(0);
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
