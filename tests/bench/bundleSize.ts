import { readFileSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';

/** One chunk of a Vite build manifest (build.manifest: true). */
interface ManifestChunk {
  file: string;
  src?: string;
  isEntry?: boolean;
  imports?: string[];
  dynamicImports?: string[];
}

export interface RouteSize {
  files: { file: string; bytes: number; gzip: number }[];
  bytes: number;
  gzip: number;
  /** JS the route loads later (its dynamic imports and what they import), not counted above. */
  later: { file: string; bytes: number; gzip: number }[];
  /** Web Worker scripts of the build (fetched when a page starts them; run off the main thread). */
  workers: { file: string; bytes: number; gzip: number }[];
}

/**
 * The JavaScript a browser must load before a lazily imported route renders: the entry chunk,
 * the route's own chunk, and everything either imports statically (dynamic imports — the
 * chart, dialogs, the worker — are not counted). Sizes from the built files, gzip level 9.
 */
export function routeInitialJs(outDir: string, routeSource: string): RouteSize {
  const manifest = JSON.parse(readFileSync(path.join(outDir, '.vite/manifest.json'), 'utf8')) as Record<string, ManifestChunk>;
  const entry = Object.entries(manifest).find(([, c]) => c.isEntry)?.[0];
  if (!entry) throw new Error('The build manifest has no entry chunk.');
  const chunk = (key: string): ManifestChunk => {
    const c = manifest[key];
    if (!c) throw new Error(`The build manifest has no chunk for ${key}.`);
    return c;
  };
  chunk(routeSource);
  const seen = new Set<string>();
  const visit = (key: string) => {
    if (seen.has(key)) return;
    seen.add(key);
    for (const imp of chunk(key).imports ?? []) visit(imp);
  };
  visit(entry);
  visit(routeSource);
  const initial = new Set(seen);
  const lazy = new Set<string>();
  const visitLazy = (key: string) => {
    if (lazy.has(key) || initial.has(key)) return;
    lazy.add(key);
    for (const imp of [...(chunk(key).imports ?? []), ...(chunk(key).dynamicImports ?? [])]) visitLazy(imp);
  };
  for (const dyn of chunk(routeSource).dynamicImports ?? []) visitLazy(dyn);
  const sizes = (keys: Iterable<string>) =>
    [...keys]
      .map((key) => chunk(key).file)
      .filter((f) => f.endsWith('.js'))
      .map((file) => {
        const buf = readFileSync(path.join(outDir, file));
        return { file, bytes: buf.length, gzip: gzipSync(buf, { level: 9 }).length };
      })
      .sort((a, b) => b.gzip - a.gzip);
  const files = sizes(initial);
  const workers = sizes(Object.keys(manifest).filter((k) => k.startsWith('_worker_assets/') || /\.worker\.[jt]s$/.test(k)));
  return { files, bytes: files.reduce((s, f) => s + f.bytes, 0), gzip: files.reduce((s, f) => s + f.gzip, 0), later: sizes(lazy), workers };
}
