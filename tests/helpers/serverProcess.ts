import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';

const ROOT = path.resolve(import.meta.dirname, '../..');

export interface ServerProcess {
  url: string;
  child: ChildProcess;
  /** Everything the process wrote to stdout and stderr so far. */
  output(): string;
  /** True while the process runs. */
  alive(): boolean;
  /** SIGKILL: no drain, no goodbye to sockets — a crash. */
  kill(): Promise<void>;
  /** SIGTERM and wait for the graceful exit; SIGKILL when it has not come after STOP_GRACE_MS. */
  stop(): Promise<void>;
}

/** How long stop() waits after SIGTERM before SIGKILL (the server's own deadline is shorter). */
const STOP_GRACE_MS = 30_000;

/** Starts `server/index.ts` in its own process (for crash and multi-instance tests). */
export async function startServerProcess(databaseUrl: string, port: number, extraEnv: Record<string, string> = {}): Promise<ServerProcess> {
  // One process (node with tsx's loader), so a kill really kills the server.
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: ROOT,
    env: {
      PATH: process.env.PATH,
      NODE_ENV: 'test',
      PORT: String(port),
      DATABASE_URL: databaseUrl,
      SESSION_SECRET: 'test-secret-test-secret-test-secret-0123',
      LOG_REQUESTS: 'false',
      ...extraEnv,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  const url = `http://127.0.0.1:${port}`;
  await new Promise<void>((resolve, reject) => {
    const t = setTimeout(() => reject(new Error(`server on ${port} did not start:\n${output}`)), 20_000);
    const check = () => {
      if (output.includes('listening on')) {
        clearTimeout(t);
        resolve();
      }
    };
    child.stdout!.on('data', check);
    child.once('exit', (code) => reject(new Error(`server exited with ${code}:\n${output}`)));
  });
  const exited = () => new Promise<void>((r) => (child.exitCode !== null || child.signalCode !== null ? r() : child.once('exit', () => r())));
  return {
    url,
    child,
    output: () => output,
    alive: () => child.exitCode === null && child.signalCode === null,
    async kill() {
      child.kill('SIGKILL');
      await exited();
    },
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.kill('SIGTERM');
      // A graceful stop that outlasts the server's own shutdown deadline is a hang: kill it, so a
      // test's teardown always ends (and say so in the output the test may inspect).
      let timer: NodeJS.Timeout | undefined;
      const stopped = await Promise.race([exited().then(() => true), new Promise<false>((r) => (timer = setTimeout(() => r(false), STOP_GRACE_MS)))]);
      clearTimeout(timer);
      if (!stopped) {
        output += `\n[test] no exit ${STOP_GRACE_MS / 1000} s after SIGTERM: killed\n`;
        child.kill('SIGKILL');
        await exited();
      }
    },
  };
}
