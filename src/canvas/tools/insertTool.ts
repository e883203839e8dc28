import { facetAt, type Tool } from './types';

export type InsertState = { mode: 'idle' };

/** Click on a facet to put a new vertex there (exactly on the facet, so the shape is kept). */
export const insertTool: Tool<InsertState> = {
  id: 'insert',
  label: 'Insert vertex',
  shortcut: 'i',
  help: 'Click a facet to add a vertex on it.',
  initial: () => ({ mode: 'idle' }),
  down(s, ctx, p) {
    if (ctx.readOnly) return { state: s, effects: [] };
    const hit = facetAt(ctx, p.world);
    if (!hit) return { state: s, effects: [{ kind: 'hint', text: 'Click on a facet to add a vertex there.' }] };
    const index = hit.index + 1;
    return { state: s, effects: [{ kind: 'ghost', at: null }, { kind: 'commit', op: { type: 'insertVertex', index, at: hit.at }, select: [index] }] };
  },
  move(s, ctx, p) {
    const hit = facetAt(ctx, p.world);
    return { state: s, effects: [{ kind: 'ghost', at: hit ? hit.at : null }], cursor: hit ? 'copy' : 'default' };
  },
  up: (s) => ({ state: s, effects: [] }),
  key: () => null,
  cancel: (s) => ({ state: s, effects: [{ kind: 'ghost', at: null }] }),
};
