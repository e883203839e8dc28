import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { createConnection } from 'node:net';
import { rmSync } from 'node:fs';
import path from 'node:path';
import { itemAt } from '../../shared/util/invariant.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');

/** Whether something accepts TCP connections on 127.0.0.1:port. */
function listening(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = createConnection({ host: '127.0.0.1', port });
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });
}

describe('a crash of the process that started PostgreSQL', () => {
  it('stops the cluster on the way out (npm start never leaves it orphaned)', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'tests/helpers/crashingStack.ts'], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    child.stdout!.on('data', (d) => (out += d));
    child.stderr!.on('data', (d) => (out += d));
    const code = await new Promise<number | null>((resolve) => child.once('exit', (c) => resolve(c)));
    const m = out.match(/port=(\d+) dir=(\S+)/);
    expect(m, out).not.toBeNull();
    try {
      expect(code).toBe(1); // it did crash
      expect(await listening(Number(m![1]))).toBe(false);
    } finally {
      rmSync(itemAt(m!, 2), { recursive: true, force: true });
    }
  }, 60_000);
});
