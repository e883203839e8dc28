import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { EnvError, parseEnv } from '../../server/env.ts';

const good = { DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/db', SESSION_SECRET: 's'.repeat(40) };

describe('parseEnv', () => {
  it('applies defaults to a minimal environment', () => {
    const env = parseEnv(good);
    expect(env.PORT).toBe(3000);
    expect(env.HOST).toBe('127.0.0.1');
    expect(env.NODE_ENV).toBe('development');
  });

  it.each([
    [{ PORT: 'abc' }, 'Refusing to start: PORT must be a whole number from 0 to 65535 (got "abc").'],
    [{ PORT: '70000' }, 'Refusing to start: PORT must be a whole number from 0 to 65535 (got "70000").'],
    [{ DATABASE_URL: 'mysql://x' }, 'Refusing to start: DATABASE_URL must be a postgres:// or postgresql:// URL (value hidden).'],
    [{ SESSION_SECRET: 'short' }, 'Refusing to start: SESSION_SECRET must be at least 32 characters (value hidden).'],
    [{ SMTP_URL: 'http://mail' }, 'Refusing to start: SMTP_URL must be an smtp:// or smtps:// URL (got "http://mail").'],
  ])('refuses %o with one line', (bad, message) => {
    expect(() => parseEnv({ ...good, ...bad })).toThrow(new EnvError(message));
  });

  it('refuses the test-only faults outside NODE_ENV=test, naming them', () => {
    expect(() => parseEnv({ ...good, FAULT_STUDY_PAUSE_MS: '2000' })).toThrow(/^Refusing to start: FAULT_STUDY_PAUSE_MS is for tests only \(NODE_ENV=test\)/);
    expect(() => parseEnv({ ...good, FAULT_STUDY_SLICE_POINTS: '50' })).toThrow(/^Refusing to start: FAULT_STUDY_SLICE_POINTS is for tests only \(NODE_ENV=test\)/);
    expect(() => parseEnv({ ...good, FAULT_JOIN_PAUSE_MS: '500' })).toThrow(/^Refusing to start: FAULT_JOIN_PAUSE_MS is for tests only \(NODE_ENV=test\)/);
    expect(() => parseEnv({ ...good, FAULT_DIE_AFTER_COMMIT: 'die-' })).toThrow(/^Refusing to start: FAULT_DIE_AFTER_COMMIT is for tests only \(NODE_ENV=test\)/);
    expect(parseEnv({ ...good, NODE_ENV: 'test', FAULT_STUDY_PAUSE_MS: '2000' }).FAULT_STUDY_PAUSE_MS).toBe(2000);
  });

  it('refuses a missing DATABASE_URL', () => {
    expect(() => parseEnv({ SESSION_SECRET: good.SESSION_SECRET })).toThrow(/^Refusing to start: DATABASE_URL is required/);
  });
});

describe('server/index.ts with a bad environment', () => {
  it('exits 1 and prints one line naming the variable', () => {
    const root = path.resolve(import.meta.dirname, '../..');
    const result = spawnSync(path.join(root, 'node_modules/.bin/tsx'), ['server/index.ts'], {
      cwd: root,
      env: { PATH: process.env.PATH, ...good, PORT: 'abc' },
      encoding: 'utf8',
    });
    expect(result.status).toBe(1);
    expect(result.stderr.trim()).toBe('Refusing to start: PORT must be a whole number from 0 to 65535 (got "abc").');
  });
});
