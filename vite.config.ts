import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import Components from 'unplugin-vue-components/vite';
import { AntDesignVueResolver } from 'unplugin-vue-components/resolvers';
import type { Plugin } from 'vite';

/**
 * d3-scale-chromatic ships one file whose top level builds every colour scheme by calling
 * helpers (`var Blues = ramp$1(scheme$5)`). The package declares no side effects, but a bundler
 * cannot tell such calls are pure, so all schemes (~10 KB gzip) came along with the one scale we
 * use (viridis). Mark those top-level initialisers pure so that unused schemes drop out.
 */
export function pureColourSchemes(): Plugin {
  return {
    name: 'shockwright:pure-colour-schemes',
    transform(code, id) {
      if (!/[\\/]d3-scale-chromatic[\\/]dist[\\/][^\\/]+\.mjs$/.test(id)) return null;
      // Every call in a top-level `var` line (nested ones too: a pure call's arguments are still
      // evaluated, so `ramp(colors("…"))` needs both marked).
      const marked = code.replace(/^var .*$/gm, (line) => line.replace(/(?<![\w$.])(new |[\w$]+\()/g, '/*#__PURE__*/ $1'));
      return { code: marked, map: null };
    },
  };
}

/** Port of the API server that the dev server proxies to (see server/lifecycle/dev.ts). */
const apiPort = Number(process.env.API_PORT ?? 3000);

export default defineConfig({
  plugins: [
    pureColourSchemes(),
    vue(),
    // ant-design-vue v4 is CSS-in-JS: resolve <a-*> components on demand, no style imports.
    Components({
      dts: false,
      resolvers: [AntDesignVueResolver({ importStyle: false })],
    }),
  ],
  resolve: {
    alias: [
      { find: '@', replacement: fileURLToPath(new URL('./src', import.meta.url)) },
      { find: '@shared', replacement: fileURLToPath(new URL('./shared', import.meta.url)) },
      // vue-konva/core imports the bare 'konva' package (every shape and filter, ~25 KB gzip)
      // only to read a flag; point it at Konva's core. The canvas registers the shapes it uses.
      { find: /^konva$/, replacement: 'konva/lib/Core' },
    ],
  },
  build: {
    outDir: 'dist/client',
    emptyOutDir: true,
    chunkSizeWarningLimit: 900,
  },
  worker: { format: 'es' },
  optimizeDeps: { include: ['ant-design-vue/es'] },
  server: {
    proxy: {
      '/api': `http://127.0.0.1:${apiPort}`,
      '/socket.io': { target: `http://127.0.0.1:${apiPort}`, ws: true },
    },
  },
});
