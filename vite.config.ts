import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import Components from 'unplugin-vue-components/vite';
import { AntDesignVueResolver } from 'unplugin-vue-components/resolvers';

/** Port of the API server that the dev server proxies to (see server/lifecycle/dev.ts). */
const apiPort = Number(process.env.API_PORT ?? 3000);

export default defineConfig({
  plugins: [
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
