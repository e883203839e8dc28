import { deleteTool } from './deleteTool';
import { drawTool } from './drawTool';
import { insertTool } from './insertTool';
import { moveSectionTool } from './moveSectionTool';
import { selectTool } from './selectTool';
import type { Tool, ToolId } from './types';

export * from './types';

/** Every tool by id (states are opaque to the canvas). */
export const TOOLS: Record<ToolId, Tool<unknown>> = {
  select: selectTool as Tool<unknown>,
  draw: drawTool as Tool<unknown>,
  insert: insertTool as Tool<unknown>,
  delete: deleteTool as Tool<unknown>,
  moveSection: moveSectionTool as Tool<unknown>,
};
