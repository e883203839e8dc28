import type { Point } from '@shared/model/sketch';
import type { SolveResult } from '@shared/solver/types';
import type { Highlight } from '@shared/protocol/messages';
import { cyclicItem } from '@shared/util/invariant';
import type { DrawList, StrokePath, TextItem } from './drawPaths';
import { toScreen, type View } from './view';

/** Someone else in the sketch: their cursor (section coordinates) and selected vertices. */
export interface PresenceMark {
  key: string;
  name: string;
  colour: string;
  cursor: Point | null;
  selection: readonly number[];
}

const HIGHLIGHT = '#ffffff';

/**
 * Other people's cursors (an arrow with their name) and selections (a ring in their colour), and
 * the walkthrough lead's highlighted facet or wave. Pure: screen pixels out.
 */
export function renderPresence(marks: readonly PresenceMark[], points: readonly Point[], view: View, highlight: Highlight | null, result: SolveResult | null): DrawList {
  const paths: StrokePath[] = [];
  const dots: DrawList['dots'] = [];
  const texts: TextItem[] = [];

  if (highlight) {
    const vertex = highlight.kind === 'vertex' && typeof highlight.id === 'number' ? points[highlight.id] : undefined;
    if (highlight.kind === 'facet' && typeof highlight.id === 'number' && points.length > 1) {
      const a = toScreen(view, cyclicItem(points, highlight.id));
      const b = toScreen(view, cyclicItem(points, highlight.id + 1));
      paths.push({ points: [...a, ...b], colour: HIGHLIGHT, width: 7, alpha: 0.35 });
    } else if (vertex) {
      const [x, y] = toScreen(view, vertex);
      dots.push({ x, y, radius: 9, fill: 'rgba(255,255,255,0.25)', stroke: HIGHLIGHT, strokeWidth: 2 });
    } else if (highlight.kind === 'wave' && result) {
      const wave = result.waves.find((w) => w.id === highlight.id);
      if (wave) {
        const ends = wave.rays && wave.rays.length ? wave.rays.map((r) => r.end) : [wave.end];
        for (const end of ends) paths.push({ points: [...toScreen(view, wave.origin), ...toScreen(view, end)], colour: HIGHLIGHT, width: 6, alpha: 0.35 });
      }
    }
  }

  for (const m of marks) {
    for (const i of m.selection) {
      const p = points[i];
      if (!p) continue;
      const [x, y] = toScreen(view, p);
      dots.push({ x, y, radius: 7, fill: 'rgba(0,0,0,0)', stroke: m.colour, strokeWidth: 2 });
    }
    if (!m.cursor) continue;
    const [x, y] = toScreen(view, m.cursor);
    // An arrow pointing up-left with its tip on the cursor.
    paths.push({ points: [x, y, x + 4, y + 14, x + 7, y + 9, x + 13, y + 8], colour: '#0b141a', width: 1, closed: true, fill: m.colour });
    const label = m.name.length > 24 ? `${m.name.slice(0, 23)}…` : m.name;
    const w = 8 + label.length * 6.2;
    paths.push({ points: [x + 12, y + 14, x + 12 + w, y + 14, x + 12 + w, y + 30, x + 12, y + 30], colour: m.colour, width: 0, closed: true, fill: m.colour, alpha: 0.92 });
    texts.push({ x: x + 16, y: y + 22, text: label, colour: '#0b141a', font: "600 11px 'Work Sans', system-ui, sans-serif", baseline: 'middle' });
  }
  return { paths, dots, texts };
}
