import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { chmodSync, chownSync, cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, symlinkSync, utimesSync, writeFileSync } from 'node:fs';
import { constants, tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { guardCluster, markOwned, processStartTicks, reapLeftovers } from '../../server/lifecycle/leftovers.ts';
import { clusterOwner, fallbackDataDir, freePort, makeOwnedTempDir, startCluster } from '../../server/lifecycle/postgres.ts';
import { findPostgresBin, isRoot } from '../../server/lifecycle/system.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');

/** True while `pid` is the process it was when `ticks` was read. */
const alive = (pid: number, ticks: number | null) => ticks !== null && processStartTicks(pid) === ticks;

/** Every running process whose command line mentions `text`. */
function processesMentioning(text: string): string[] {
  const hits: string[] = [];
  for (const pid of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
    try {
      const cmd = readFileSync(`/proc/${pid}/cmdline`, 'utf8').replaceAll('\0', ' ');
      if (cmd.includes(text)) hits.push(`${pid}: ${cmd}`);
    } catch {
      // gone meanwhile
    }
  }
  return hits;
}

function collect(child: ChildProcess): { text: () => string } {
  let out = '';
  child.stdout?.on('data', (d) => (out += d));
  child.stderr?.on('data', (d) => (out += d));
  return { text: () => out };
}

const exited = (child: ChildProcess) =>
  new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) resolve({ code: child.exitCode, signal: child.signalCode });
    else child.once('exit', (code, signal) => resolve({ code, signal }));
  });

describe('a test run cleans up on every exit path', () => {
  interface Started {
    child: ChildProcess;
    info: { work: string; clusterDir: string; postmasterPid: number; stepPid: number };
    ticks: { postmaster: number | null; step: number | null };
  }

  /** The miniature run (tests/tooling/fixtures/interruptedRun.ts), once its cluster and step are up. */
  async function startRun(): Promise<Started> {
    const child = spawn(process.execPath, ['--import', 'tsx', 'tests/tooling/fixtures/interruptedRun.ts'], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    const out = collect(child);
    await expect.poll(() => out.text(), { timeout: 120_000 }).toMatch(/"stepPid":\d+/);
    const info = JSON.parse(out.text().split('\n').find((l) => l.includes('"stepPid"'))!) as Started['info'];
    const ticks = { postmaster: processStartTicks(info.postmasterPid), step: processStartTicks(info.stepPid) };
    expect(alive(info.postmasterPid, ticks.postmaster)).toBe(true);
    return { child, info, ticks };
  }

  it.each(['SIGTERM', 'SIGINT', 'SIGHUP'] as const)('stopped by %s (sent to the run alone): its step, PostgreSQL and folders are gone', async (signal) => {
    const { child, info, ticks } = await startRun();

    process.kill(child.pid!, signal);
    const end = await exited(child);

    expect(end.code).toBe(128 + constants.signals[signal]);
    // pg_ctl -w returns once the pid file is gone; the process itself ends a moment later.
    await expect.poll(() => alive(info.postmasterPid, ticks.postmaster)).toBe(false);
    await expect.poll(() => alive(info.stepPid, ticks.step)).toBe(false);
    expect(existsSync(info.clusterDir)).toBe(false);
    expect(existsSync(info.work)).toBe(false);
  });

  it('killed outright (SIGKILL): the guardian stops PostgreSQL and the next run reaps the work folder', async () => {
    const { child, info, ticks } = await startRun();

    process.kill(child.pid!, 'SIGKILL');
    await exited(child);

    await expect.poll(() => alive(info.postmasterPid, ticks.postmaster), { timeout: 60_000 }).toBe(false);
    await expect.poll(() => existsSync(info.clusterDir), { timeout: 60_000 }).toBe(false);
    // The work folder has no guardian: the next run's reaper removes it (its owner is dead).
    expect(existsSync(info.work)).toBe(true);
    const reaped = await reapLeftovers({ base: path.dirname(info.work) });
    expect(reaped.map((r) => r.dir)).toContain(info.work);
    expect(existsSync(info.work)).toBe(false);
    // The orphaned step is not a database; the test tidies it up itself.
    if (alive(info.stepPid, ticks.step)) process.kill(-info.stepPid, 'SIGKILL');
  });
});

describe('reaping leftovers of earlier runs', () => {
  const pgBin = findPostgresBin();
  let base: string;

  beforeAll(() => {
    base = mkdtempSync(path.join(tmpdir(), 'sw-reap-'));
    chmodSync(base, 0o711); // the cluster owner must reach clusters below it
  });
  afterAll(() => rmSync(base, { recursive: true, force: true }));

  it('removes (and stops) only marked folders whose owner process is gone', async () => {
    // A dead owner: a process that has already exited.
    const dead = spawnSync('true').pid!;
    const deadCluster = path.join(base, 'sw-test-pg-dead');
    mkdirSync(deadCluster);
    makeOwnedTempDir(deadCluster);
    markOwned(deadCluster, dead);
    const cluster = startCluster({ pgBin: pgBin!, dataDir: path.join(deadCluster, 'data'), port: await freePort(), secretFile: path.join(deadCluster, 'secret'), throwaway: true });
    const postmasterPid = Number(readFileSync(path.join(deadCluster, 'data', 'postmaster.pid'), 'utf8').split('\n')[0]);
    const postmasterTicks = processStartTicks(postmasterPid);
    // A pid now used by another process than the one that wrote the marker (same pid, other start).
    const reused = path.join(base, 'sw-test-run-reused');
    mkdirSync(reused);
    markOwned(reused);
    const marker = JSON.parse(readFileSync(path.join(reused, 'owner.json'), 'utf8'));
    writeFileSync(path.join(reused, 'owner.json'), JSON.stringify({ ...marker, startTicks: marker.startTicks - 1 }));
    // Kept: a live owner (this process), no marker (older code or half made), another prefix.
    const live = path.join(base, 'sw-test-pg-live');
    mkdirSync(live);
    markOwned(live);
    const unmarked = path.join(base, 'sw-test-pg-unmarked');
    mkdirSync(unmarked);
    const otherPrefix = path.join(base, 'sw-something-else');
    mkdirSync(otherPrefix);
    markOwned(otherPrefix, dead);
    // Kept: a marker another user wrote (their runs are theirs to clean).
    const otherUser = path.join(base, 'sw-test-run-other-user');
    if (isRoot()) {
      mkdirSync(otherUser);
      markOwned(otherUser, dead);
      chownSync(path.join(otherUser, 'owner.json'), 65534, 65534);
    }

    try {
      const reaped = await reapLeftovers({ base });

      expect(reaped.map((r) => path.basename(r.dir)).sort()).toEqual(['sw-test-pg-dead', 'sw-test-run-reused']);
      expect(reaped.find((r) => r.dir === deadCluster)?.stoppedPostmaster).toBe(true);
      expect(alive(postmasterPid, postmasterTicks)).toBe(false);
      expect(existsSync(deadCluster)).toBe(false);
      expect(existsSync(reused)).toBe(false);
      for (const kept of [live, unmarked, otherPrefix, ...(isRoot() ? [otherUser] : [])]) expect(existsSync(kept), kept).toBe(true);
    } finally {
      if (existsSync(deadCluster)) cluster.stop();
    }
  });
});

describe('npm start from a fresh clone in a private (0700) folder', () => {
  let home: string;
  let clone: string;
  let fallbackRoot: string | null = null;

  beforeAll(() => {
    // A clone of the working tree as it is (tracked and new files, nothing ignored: no .data,
    // no dist), in a folder only its owner may enter, like root's home or `mktemp -d`.
    home = mkdtempSync(path.join(tmpdir(), 'sw-clone-'));
    expect(statSync(home).mode & 0o777).toBe(0o700);
    clone = path.join(home, 'app');
    const files = spawnSync('git', ['ls-files', '-z', '--cached', '--others', '--exclude-standard'], { cwd: ROOT, encoding: 'utf8' }).stdout.split('\0').filter(Boolean);
    for (const f of files) {
      // Deleted but not yet committed; or a node_modules link (ignored only as a folder).
      if (!existsSync(path.join(ROOT, f)) || f === 'node_modules') continue;
      mkdirSync(path.dirname(path.join(clone, f)), { recursive: true });
      cpSync(path.join(ROOT, f), path.join(clone, f));
    }
    // Installing takes half a minute and 400 MB: borrow this checkout's node_modules, and date
    // the lock file before it so the install step (which never runs through a link) is skipped.
    symlinkSync(path.join(ROOT, 'node_modules'), path.join(clone, 'node_modules'));
    utimesSync(path.join(clone, 'package-lock.json'), new Date('2000-01-01'), new Date('2000-01-01'));
    if (isRoot() && clusterOwner()) {
      fallbackRoot = path.dirname(fallbackDataDir(path.join(clone, '.data', 'postgres')));
      // Should this test die half-way, the guardian stops that cluster and removes its folder.
      guardCluster(fallbackRoot, path.join(fallbackRoot, 'postgres'));
    }
  });
  afterAll(() => {
    rmSync(home, { recursive: true, force: true });
    if (fallbackRoot) rmSync(fallbackRoot, { recursive: true, force: true });
  });

  it('starts (cluster, migrations, seed, build, health ok), and Ctrl-C leaves nothing running', async () => {
    const child = spawn('npm', ['start'], {
      cwd: clone,
      detached: true, // its own process group, which a terminal's Ctrl-C signals as a whole
      stdio: ['ignore', 'pipe', 'pipe'],
      env: { PATH: process.env.PATH, HOME: home, LANG: 'C.UTF-8', TMPDIR: tmpdir(), PORT: '0', PG_PORT: String(await freePort()) },
    });
    const out = collect(child);
    try {
      await expect.poll(() => out.text(), { timeout: 150_000, interval: 200 }).toMatch(/Shockwright is running at (http:\/\/\S+)/);
      const url = out.text().match(/Shockwright is running at (http:\/\/\S+)/)![1];
      expect(out.text()).toMatch(/ready in \d+\.\d s: install and launch \d+\.\d s, database/);

      const health = await fetch(`${url}/api/health`);
      expect(health.status).toBe(200);
      expect(((await health.json()) as { status: string }).status).toBe('ok');
      const signIn = await fetch(`${url}/sign-in`);
      expect(signIn.status).toBe(200);
      expect(await signIn.text()).toContain('<div id="app">');

      const dataDir = fallbackRoot ? path.join(fallbackRoot, 'postgres') : path.join(clone, '.data', 'postgres');
      if (fallbackRoot) expect(out.text()).toContain(`the cluster lives in ${dataDir}`);
      const postmasterPid = Number(readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n')[0]);
      const postmasterTicks = processStartTicks(postmasterPid);

      process.kill(-child.pid!, 'SIGINT');
      const end = await exited(child);

      // npm passes the signal on and ends with it; what it ran finishes its shutdown after.
      expect(end.code === 0 || end.signal === 'SIGINT', out.text()).toBe(true);
      await expect.poll(() => processesMentioning(clone), { timeout: 60_000 }).toEqual([]);
      await expect.poll(() => alive(postmasterPid, postmasterTicks)).toBe(false);
      expect(processesMentioning(dataDir)).toEqual([]);
      expect(out.text()).toContain('SIGINT: shutting down');
      expect(out.text()).not.toMatch(/Shutdown failed|Crashed/);
    } finally {
      if (child.exitCode === null && child.signalCode === null) {
        process.kill(-child.pid!, 'SIGKILL');
        await exited(child);
      }
    }
  });
});
