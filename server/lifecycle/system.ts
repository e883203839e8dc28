import { spawnSync, type SpawnSyncOptions } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';

/** Runs a command, streaming its output; throws with `what` when it fails. */
export function run(cmd: string, args: string[], what: string, options: SpawnSyncOptions = {}): void {
  const result = spawnSync(cmd, args, { stdio: 'inherit', ...options });
  if (result.error) throw new Error(`${what}: ${result.error.message}`);
  if (result.status !== 0) throw new Error(`${what} failed (exit ${result.status}).`);
}

/** Runs a command and returns its stdout; throws with stderr when it fails. */
export function capture(cmd: string, args: string[], options: SpawnSyncOptions = {}): string {
  const result = spawnSync(cmd, args, { encoding: 'utf8', ...options });
  if (result.error) throw result.error;
  if (result.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed: ${String(result.stderr).trim()}`);
  return String(result.stdout);
}

export const isRoot = (): boolean => typeof process.getuid === 'function' && process.getuid() === 0;

let aptUpdated = false;

/**
 * Installs Debian packages with apt-get when running as root; otherwise throws a message naming
 * the exact command an administrator must run.
 */
export function aptInstall(packages: string[], why: string): void {
  if (packages.length === 0) return;
  const command = `apt-get install -y ${packages.join(' ')}`;
  if (!isRoot()) {
    throw new Error(`${why} Install it first (as root): ${command}`);
  }
  if (!existsSync('/usr/bin/apt-get')) throw new Error(`${why} This is not a Debian-like system; install ${packages.join(', ')} yourself.`);
  console.log(`${why} Installing from Debian's packages: ${packages.join(' ')} (takes a minute)…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (!aptUpdated) {
    run('apt-get', ['update', '-qq'], 'apt-get update', { env });
    aptUpdated = true;
  }
  run('apt-get', ['install', '-y', '-qq', ...packages], command, { env });
}

/** The newest Debian PostgreSQL server bin folder (/usr/lib/postgresql/<major>/bin), or null. */
export function findPostgresBin(): string | null {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return null;
  const majors = readdirSync(base)
    .filter((d) => /^\d+$/.test(d) && existsSync(`${base}/${d}/bin/pg_ctl`) && existsSync(`${base}/${d}/bin/initdb`))
    .sort((a, b) => Number(b) - Number(a));
  return majors.length ? `${base}/${majors[0]}/bin` : null;
}

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
/** poppler-utils: the report tests read PDFs with pdftotext, pdffonts and pdftoppm. */
export const PDFTOPPM_PATH = '/usr/bin/pdftoppm';

const PACKAGE_WORDS: Record<string, string> = {
  postgresql: 'the PostgreSQL server',
  chromium: 'Chromium (for browser tests)',
  'poppler-utils': 'poppler-utils (to check PDF reports in tests)',
};

/** Makes sure the PostgreSQL server binaries (and, for tests, Chromium and poppler-utils) are present. */
export function ensureSystemPackages(options: { chromium: boolean }): { pgBin: string } {
  const missing: string[] = [];
  if (!findPostgresBin()) missing.push('postgresql');
  if (options.chromium && !existsSync(CHROMIUM_PATH)) missing.push('chromium');
  if (options.chromium && !existsSync(PDFTOPPM_PATH)) missing.push('poppler-utils');
  if (missing.length) {
    aptInstall(missing, `Missing ${missing.map((m) => PACKAGE_WORDS[m]).join(' and ')}.`);
  }
  const pgBin = findPostgresBin();
  if (!pgBin) throw new Error('PostgreSQL server binaries not found under /usr/lib/postgresql/*/bin even after installing; install the Debian package postgresql.');
  return { pgBin };
}

/** Clock ticks per second of /proc/<pid>/stat times (USER_HZ: 100 on every Linux ABI). */
const USER_HZ = 100;

function procStat(pid: number): { ppid: number; startTicks: number } | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return { ppid: Number(fields[1]), startTicks: Number(fields[19]) };
  } catch {
    return null;
  }
}

/**
 * When the command the person typed started, in ms since the epoch: the `npm` process that runs
 * us (so npm's own start, the prestart install and tsx's start count), else this process. The
 * start-up time printed is measured from here: the real wait.
 */
export function commandStartedAt(): number {
  const ownStart = Date.now() - process.uptime() * 1000;
  const self = procStat(process.pid);
  if (!self) return ownStart;
  let pid = self.ppid;
  for (let depth = 0; depth < 8 && pid > 1; depth++) {
    const stat = procStat(pid);
    if (!stat) break;
    let cmdline: string;
    try {
      // npm renames its process ("npm start"), so the name may hold spaces.
      cmdline = readFileSync(`/proc/${pid}/cmdline`, 'utf8').replaceAll('\0', ' ');
    } catch {
      break;
    }
    if (/^(\S*\/)?npm( |$)|\/npm-cli\.js( |$)/.test(cmdline)) {
      return ownStart - ((self.startTicks - stat.startTicks) / USER_HZ) * 1000;
    }
    pid = stat.ppid;
  }
  return ownStart;
}
