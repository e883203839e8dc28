import { defineConfig, mergeConfig } from 'vitest/config';
import viteConfig from './vite.config.ts';

/**
 * One vitest run covers every suite; `npm test` (server/lifecycle/test.ts) provides the
 * throwaway PostgreSQL (TEST_DATABASE_URL), the built client and Chromium before it starts.
 */
export default mergeConfig(
  viteConfig,
  defineConfig({
    test: {
      // Generous on purpose: the suite must pass on a loaded 2-core machine, so nothing waits on
      // a short clock. A test that hangs still fails, just later. expect.poll waits on state for
      // up to 20 s unless a call says otherwise (vitest's default is 1 s).
      testTimeout: 60_000,
      hookTimeout: 60_000,
      expect: { poll: { timeout: 20_000, interval: 50 } },
      projects: [
        {
          extends: true,
          test: { name: 'unit', include: ['tests/shared/**/*.test.ts'], environment: 'node' },
        },
        {
          extends: true,
          test: {
            // The house itself: lint rules, the npm start/test lifecycle.
            name: 'tooling',
            include: ['tests/tooling/**/*.test.ts'],
            environment: 'node',
            testTimeout: 180_000,
            hookTimeout: 180_000,
          },
        },
        {
          extends: true,
          test: {
            name: 'client',
            include: ['tests/client/**/*.test.ts'],
            environment: 'happy-dom',
            setupFiles: ['tests/client/setup.ts'],
            deps: { optimizer: { client: { enabled: true, include: ['ant-design-vue/es'] } } },
          },
        },
        {
          extends: true,
          test: {
            name: 'api',
            globalSetup: ['tests/setup/globalSetup.ts'],
            include: ['tests/server/**/*.test.ts'],
            environment: 'node',
          },
        },
        {
          extends: true,
          test: {
            name: 'realtime',
            globalSetup: ['tests/setup/globalSetup.ts'],
            include: ['tests/realtime/**/*.test.ts'],
            environment: 'node',
            testTimeout: 120_000,
            hookTimeout: 120_000,
          },
        },
        {
          extends: true,
          test: {
            name: 'browser',
            globalSetup: ['tests/setup/globalSetup.ts'],
            include: ['tests/e2e/**/*.test.ts'],
            environment: 'node',
            testTimeout: 180_000,
            hookTimeout: 180_000,
            fileParallelism: false,
          },
        },
      ],
    },
  }),
);
