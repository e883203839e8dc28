import type { Express } from 'express';

interface Layer {
  rawPath?: string | string[];
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

/**
 * Every method + path the Express app answers, found by walking its router stack (Express 5 /
 * router 2 keep each layer's path in `rawPath`). The authorization matrix compares this list
 * with its table, so a route added without a table entry fails the test.
 */
export function listRoutes(app: Express): string[] {
  const out = new Set<string>();
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      const raw = Array.isArray(layer.rawPath) ? layer.rawPath[0] : layer.rawPath;
      if (layer.route) {
        const path = (prefix + (layer.route.path === '/' ? '' : layer.route.path)) || '/';
        for (const [method, on] of Object.entries(layer.route.methods)) {
          if (on && method !== '_all') out.add(`${method.toUpperCase()} ${path}`);
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, prefix + (raw && raw !== '/' ? raw : ''));
      }
    }
  };
  const router = (app as unknown as { router: { stack: Layer[] } }).router;
  walk(router.stack, '');
  return [...out].sort();
}
