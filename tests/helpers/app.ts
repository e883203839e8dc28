import { parseEnv, type Env } from '../../server/env.ts';

/** Env for an in-process test server on a random port. */
export function testEnv(databaseUrl: string, overrides: Record<string, string> = {}): Env {
  return parseEnv({
    NODE_ENV: 'test',
    PORT: '0',
    DATABASE_URL: databaseUrl,
    SESSION_SECRET: 'test-secret-test-secret-test-secret-0123',
    CLIENT_DIST: process.env.TEST_CLIENT_DIST ?? 'dist/client',
    LOG_REQUESTS: 'false',
    ...overrides,
  });
}
