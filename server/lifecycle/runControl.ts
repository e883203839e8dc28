/**
 * Steps of a lifecycle script (npm test) as child process groups that an interruption stops.
 * `handleInterruptions()` turns SIGINT, SIGTERM and SIGHUP into: stop the running step's whole
 * process group (SIGTERM, then SIGKILL after 10 s or on a second, deliberate signal), make every
 * later `runStep` throw `Interrupted`, and let the script's `finally` blocks clean up.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { constants } from 'node:os';
import path from 'node:path';

/** Thrown by `runStep` once the run has been interrupted: nothing more is run or counted. */
export class Interrupted extends Error {
  constructor(readonly signal: NodeJS.Signals) {
    super(`interrupted by ${signal}`);
  }
}

/** One Ctrl-C can arrive several times (terminal, npm and tsx all pass it on): the same signal within this window counts once. */
const DUPLICATE_SIGNAL_MS = 1500;
const STEP_GRACE_MS = 10_000;

let interruptedBy: NodeJS.Signals | null = null;
let interruptedAt = 0;
let current: ChildProcess | null = null;

export function interruption(): NodeJS.Signals | null {
  return interruptedBy;
}

/** Throws `Interrupted` if a signal has arrived (call between steps that are not child processes). */
export function checkInterrupted(): void {
  if (interruptedBy) throw new Interrupted(interruptedBy);
}

/** The exit code for a run ended by `signal` (128 + its number, as a shell reports it). */
export function signalExitCode(signal: NodeJS.Signals): number {
  return 128 + (constants.signals[signal] ?? 0);
}

function signalGroup(child: ChildProcess | null, signal: NodeJS.Signals): void {
  if (!child?.pid || child.exitCode !== null || child.signalCode !== null) return;
  try {
    process.kill(-child.pid, signal);
  } catch {
    // The group has already gone.
  }
}

export function handleInterruptions(log: (line: string) => void = (l) => console.error(l)): void {
  // A closed terminal (SIGHUP) makes writes fail with EIO; cleaning up matters more than printing.
  process.stdout.on('error', () => {});
  process.stderr.on('error', () => {});
  const onSignal = (signal: NodeJS.Signals) => {
    if (interruptedBy) {
      if (Date.now() - interruptedAt >= DUPLICATE_SIGNAL_MS) signalGroup(current, 'SIGKILL');
      return;
    }
    interruptedBy = signal;
    interruptedAt = Date.now();
    log(`\n${signal}: stopping the running step, then PostgreSQL and the work folder…`);
    const step = current;
    signalGroup(step, 'SIGTERM');
    setTimeout(() => signalGroup(step, 'SIGKILL'), STEP_GRACE_MS).unref();
  };
  for (const s of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) process.on(s, onSignal);
}

/**
 * Runs one step in its own process group (stdin closed, output shown) and resolves true when it
 * exits 0. Throws `Interrupted` instead when the run was interrupted before or during it.
 */
export async function runStep(
  cmd: string,
  args: string[],
  options: { cwd: string; env?: NodeJS.ProcessEnv; onSpawn?: (pid: number) => void },
): Promise<boolean> {
  checkInterrupted();
  const code = await new Promise<number | null>((resolve) => {
    const child = spawn(cmd, args, { cwd: options.cwd, env: options.env ?? process.env, stdio: ['ignore', 'inherit', 'inherit'], detached: true });
    current = child;
    if (child.pid) options.onSpawn?.(child.pid);
    child.once('error', (err) => {
      console.error(`${path.basename(cmd)}: ${err.message}`);
      resolve(null);
    });
    child.once('exit', (c) => {
      if (current === child) current = null;
      resolve(c);
    });
  });
  checkInterrupted();
  return code === 0;
}
