import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { applyMigrations } from '../db/migrate.ts';
import { guardCluster, markOwned, reapLeftovers, THROWAWAY_PREFIXES } from './leftovers.ts';
import { ensureDatabase, freePort, makeOwnedTempDir, startCluster } from './postgres.ts';
import { findPostgresBin } from './system.ts';

export const TEMPLATE_DB = 'sw_template';

export interface ThrowawayCluster {
  /** Superuser URL of the maintenance database (for CREATE DATABASE). */
  adminUrl: string;
  /** Migrated database that each test file copies (CREATE DATABASE … TEMPLATE). */
  templateDb: string;
  /** The cluster's folder (its data directory is `<dir>/data`). */
  dir: string;
  /** Stops the server and deletes the folder; safe to call more than once. */
  stop(): void;
}

/**
 * A PostgreSQL cluster for one test run: temp folder, free port, fsync off, migrated template
 * database. `stop` shuts it down and deletes the folder. The folder carries an owner marker and
 * a guardian process, so the cluster never outlives this process however it ends; leftovers of
 * earlier runs killed before this existed are reaped first (server/lifecycle/leftovers.ts).
 */
/**
 * A folder for a throwaway cluster (its data directory is `<dir>/data`): made under the temp
 * folder with `prefix`, marked as ours, owned by the cluster owner, and guarded, so the cluster
 * stops and the folder goes when this process ends, however it ends. Leftovers of dead runs are
 * reaped first.
 */
export async function makeThrowawayClusterDir(prefix: (typeof THROWAWAY_PREFIXES)[number]): Promise<string> {
  await reapLeftovers({ log: (line) => console.log(line) });
  const dir = mkdtempSync(path.join(tmpdir(), prefix));
  markOwned(dir);
  makeOwnedTempDir(dir);
  guardCluster(dir, path.join(dir, 'data'));
  return dir;
}

export async function startThrowawayCluster(options: { migrate?: boolean } = {}): Promise<ThrowawayCluster> {
  const pgBin = findPostgresBin();
  if (!pgBin) throw new Error('PostgreSQL server binaries not found (Debian package postgresql); `npm test` installs them when run as root.');
  const dir = await makeThrowawayClusterDir('sw-test-pg-');
  let cluster: ReturnType<typeof startCluster> | null = null;
  let stopped = false;
  const stop = () => {
    if (stopped) return;
    stopped = true;
    cluster?.stop();
    rmSync(dir, { recursive: true, force: true });
  };
  try {
    cluster = startCluster({
      pgBin,
      dataDir: path.join(dir, 'data'),
      port: await freePort(),
      secretFile: path.join(dir, 'secret'),
      throwaway: true,
    });
    if (options.migrate ?? true) {
      await ensureDatabase(cluster.url('postgres'), TEMPLATE_DB);
      await applyMigrations(cluster.url(TEMPLATE_DB));
    }
  } catch (err) {
    stop();
    throw err;
  }
  return { adminUrl: cluster.url('postgres'), templateDb: TEMPLATE_DB, dir, stop };
}
