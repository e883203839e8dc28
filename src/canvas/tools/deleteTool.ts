import { vertexAt, type Tool } from './types';

export type DeleteState = { mode: 'idle' };

/** Click a vertex to delete it (a section keeps at least 3). */
export const deleteTool: Tool<DeleteState> = {
  id: 'delete',
  label: 'Delete vertex',
  shortcut: 'x',
  help: 'Click a vertex to delete it.',
  initial: () => ({ mode: 'idle' }),
  down(s, ctx, p) {
    if (ctx.readOnly) return { state: s, effects: [] };
    const vertex = vertexAt(ctx, p.world);
    if (vertex === null) return { state: s, effects: [] };
    return { state: s, effects: [{ kind: 'commit', op: { type: 'deleteVertex', index: vertex }, select: [] }] };
  },
  move(s, ctx, p) {
    const vertex = vertexAt(ctx, p.world);
    return { state: s, effects: [], cursor: vertex !== null ? 'pointer' : 'default' };
  },
  up: (s) => ({ state: s, effects: [] }),
  key: () => null,
  cancel: (s) => ({ state: s, effects: [] }),
};
