import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { applyMigrations } from '../db/migrate.ts';
import { ensureDatabase, freePort, makeOwnedTempDir, startCluster } from './postgres.ts';
import { findPostgresBin } from './system.ts';

export const TEMPLATE_DB = 'sw_template';

export interface ThrowawayCluster {
  /** Superuser URL of the maintenance database (for CREATE DATABASE). */
  adminUrl: string;
  /** Migrated database that each test file copies (CREATE DATABASE … TEMPLATE). */
  templateDb: string;
  stop(): void;
}

/**
 * A PostgreSQL cluster for one test run: temp folder, free port, fsync off, migrated template
 * database. `stop` shuts it down and deletes the folder.
 */
export async function startThrowawayCluster(): Promise<ThrowawayCluster> {
  const pgBin = findPostgresBin();
  if (!pgBin) throw new Error('PostgreSQL server binaries not found (Debian package postgresql); `npm test` installs them when run as root.');
  const dir = mkdtempSync(path.join(tmpdir(), 'sw-test-pg-'));
  makeOwnedTempDir(dir);
  const cluster = startCluster({
    pgBin,
    dataDir: path.join(dir, 'data'),
    port: await freePort(),
    secretFile: path.join(dir, 'secret'),
    throwaway: true,
  });
  const stop = () => {
    cluster.stop();
    rmSync(dir, { recursive: true, force: true });
  };
  try {
    await ensureDatabase(cluster.url('postgres'), TEMPLATE_DB);
    await applyMigrations(cluster.url(TEMPLATE_DB));
  } catch (err) {
    stop();
    throw err;
  }
  return { adminUrl: cluster.url('postgres'), templateDb: TEMPLATE_DB, stop };
}
