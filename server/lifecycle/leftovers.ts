/**
 * Throwaway folders (test clusters, test-run work folders) carry an owner marker, so a run that
 * was killed before it could clean up is recognised and removed by the next one, and never a
 * run that is still alive, another user's, or the `npm start` cluster.
 *
 * - `markOwned(dir)` writes `<dir>/owner.json`: the owner's pid, its start time in clock ticks
 *   since boot (/proc/<pid>/stat), the boot id and our uid. A pid alone is not enough: pids are
 *   reused, but not with the same start time in the same boot.
 * - `guardCluster(dir, dataDir)` starts a tiny detached shell that waits for the owner to exit
 *   and then stops the cluster and deletes the folder: it covers SIGKILL and crashes, where the
 *   owner's own handlers never run.
 * - `reapLeftovers()` (called before every new throwaway cluster) removes marked folders whose
 *   owner is gone: it stops a postmaster still running there (SIGQUIT, PostgreSQL's immediate
 *   shutdown, only if that process really is a postgres serving that folder), then deletes.
 */
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

/** Folder names that mark throwaway folders: the run's cluster, a test's own cluster, a run's work folder. */
export const THROWAWAY_PREFIXES = ['sw-test-pg-', 'sw-own-pg-', 'sw-test-run-'] as const;
const MARKER = 'owner.json';

interface OwnerMarker {
  pid: number;
  startTicks: number;
  bootId: string;
  uid: number;
  createdAt: string;
}

const uid = () => (typeof process.getuid === 'function' ? process.getuid() : -1);

function readBootId(): string {
  try {
    return readFileSync('/proc/sys/kernel/random/boot_id', 'utf8').trim();
  } catch {
    return '';
  }
}

/** Start time of `pid` in clock ticks since boot, or null when there is no such process. */
export function processStartTicks(pid: number): number | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Field 2 (comm) is in parentheses and may contain spaces: count fields after the last ')'.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    const ticks = Number(fields[19]); // field 22 overall
    return Number.isFinite(ticks) ? ticks : null;
  } catch {
    return null;
  }
}

/** True while the process that wrote `marker` runs (same pid, same start, same boot). */
function ownerAlive(marker: OwnerMarker): boolean {
  if (marker.bootId && marker.bootId !== readBootId()) return false;
  const ticks = processStartTicks(marker.pid);
  if (ticks === null) {
    // No /proc (not Linux): fall back to "a process with that pid exists".
    if (existsSync('/proc/self/stat')) return false;
    try {
      process.kill(marker.pid, 0);
      return true;
    } catch (err) {
      return (err as NodeJS.ErrnoException).code === 'EPERM';
    }
  }
  return ticks === marker.startTicks;
}

/** Marks `dir` as owned by this process (atomically: a reader never sees half a file). */
export function markOwned(dir: string, pid = process.pid): void {
  const marker: OwnerMarker = { pid, startTicks: processStartTicks(pid) ?? -1, bootId: readBootId(), uid: uid(), createdAt: new Date().toISOString() };
  const tmp = path.join(dir, `.${MARKER}.${process.pid}`);
  writeFileSync(tmp, `${JSON.stringify(marker)}\n`, { mode: 0o644 });
  renameSync(tmp, path.join(dir, MARKER));
}

function readMarker(dir: string): OwnerMarker | null {
  const file = path.join(dir, MARKER);
  try {
    // Only markers that we wrote: another user's runs are theirs to clean.
    if (statSync(file).uid !== uid()) return null;
    const m = JSON.parse(readFileSync(file, 'utf8')) as OwnerMarker;
    return Number.isInteger(m.pid) && m.uid === uid() ? m : null;
  } catch {
    return null;
  }
}

/** The postmaster serving `dataDir`, if one runs (checked against its command line). */
function runningPostmaster(dataDir: string): number | null {
  try {
    const pid = Number(readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n')[0]);
    if (!Number.isInteger(pid) || pid <= 0) return null;
    const cmdline = readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0');
    const isPostgres = path.basename(cmdline[0] ?? '') === 'postgres' || cmdline[0]?.endsWith('/postgres');
    const dIndex = cmdline.indexOf('-D');
    const servesDir = dIndex >= 0 && path.resolve(cmdline[dIndex + 1] ?? '') === path.resolve(dataDir);
    return isPostgres && servesDir ? pid : null;
  } catch {
    return null;
  }
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Immediate shutdown of the postmaster serving `dataDir` (if any); waits until it has gone. */
export async function stopPostmaster(dataDir: string, timeoutMs = 30_000): Promise<boolean> {
  const pid = runningPostmaster(dataDir);
  if (pid === null) return false;
  const started = processStartTicks(pid);
  const gone = () => processStartTicks(pid) !== started;
  const signal = (s: NodeJS.Signals) => {
    try {
      process.kill(pid, s);
    } catch {
      // Already gone (another run reaped it first).
    }
  };
  signal('SIGQUIT');
  const deadline = Date.now() + timeoutMs;
  while (!gone() && Date.now() < deadline) await sleep(100);
  if (!gone()) signal('SIGKILL');
  return true;
}

export interface Reaped {
  dir: string;
  ownerPid: number;
  stoppedPostmaster: boolean;
}

/**
 * Removes throwaway folders under `base` whose owner process is gone. Folders without a marker
 * (older code, another user, half-created) are left alone.
 */
export async function reapLeftovers(options: { base?: string; log?: (line: string) => void } = {}): Promise<Reaped[]> {
  const base = options.base ?? tmpdir();
  const reaped: Reaped[] = [];
  let entries: string[];
  try {
    entries = readdirSync(base);
  } catch {
    return reaped;
  }
  for (const name of entries) {
    if (!THROWAWAY_PREFIXES.some((p) => name.startsWith(p))) continue;
    const dir = path.join(base, name);
    const marker = readMarker(dir);
    if (!marker || ownerAlive(marker)) continue;
    const stoppedPostmaster = await stopPostmaster(path.join(dir, 'data'));
    rmSync(dir, { recursive: true, force: true });
    reaped.push({ dir, ownerPid: marker.pid, stoppedPostmaster });
    options.log?.(`Removed ${dir} left by an earlier run (process ${marker.pid} is gone)${stoppedPostmaster ? '; stopped its PostgreSQL' : ''}.`);
  }
  return reaped;
}

/**
 * The guardian: a detached `sh` (its own session, so a Ctrl-C to our process group or the death
 * of our group leaves it running) that polls once a second. When the owner has exited and
 * `dir` is still there, it stops the postmaster of `dataDir` (SIGQUIT) and deletes `dir`. When
 * `dir` disappears (the owner cleaned up), it just exits.
 */
const GUARDIAN = `
owner=$1 dir=$2 data=$3
while kill -0 "$owner" 2>/dev/null && [ -d "$dir" ]; do sleep 1; done
[ -d "$dir" ] || exit 0
pid=$(head -n 1 "$data/postmaster.pid" 2>/dev/null)
case "$pid" in ''|*[!0-9]*) pid= ;; esac
if [ -n "$pid" ] && tr '\\0' ' ' < "/proc/$pid/cmdline" 2>/dev/null | grep -qF -- "-D $data"; then
  kill -QUIT "$pid" 2>/dev/null
  i=0
  while kill -0 "$pid" 2>/dev/null && [ $i -lt 300 ]; do sleep 0.1; i=$((i + 1)); done
  kill -KILL "$pid" 2>/dev/null
fi
rm -rf "$dir"
`;

export function guardCluster(dir: string, dataDir: string, ownerPid = process.pid): void {
  const child = spawn('sh', ['-c', GUARDIAN, 'shockwright-cluster-guardian', String(ownerPid), dir, dataDir], { detached: true, stdio: 'ignore' });
  child.unref();
}
