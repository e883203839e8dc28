import { rmSync } from 'node:fs';
import path from 'node:path';
import { freePort, startCluster, type Cluster } from '../../server/lifecycle/postgres.ts';
import { makeThrowawayClusterDir } from '../../server/lifecycle/throwawayCluster.ts';
import { findPostgresBin } from '../../server/lifecycle/system.ts';

export interface OwnCluster {
  port: number;
  /** Superuser URL of database `db`. */
  url(db: string): string;
  /** pg_ctl stop -m fast: every connection is cut, new ones are refused. */
  stop(): void;
  /** Starts it again on the same port with the same data. */
  start(): void;
  /** Stops it and deletes its folder. */
  destroy(): void;
}

/**
 * A PostgreSQL cluster of a test's own, for tests that stop and restart the database (the run's
 * shared cluster must stay up for every other file).
 */
export async function startOwnCluster(): Promise<OwnCluster> {
  const pgBin = findPostgresBin();
  if (!pgBin) throw new Error('PostgreSQL server binaries not found');
  // Marked and guarded like the run's cluster: it never outlives the test process.
  const dir = await makeThrowawayClusterDir('sw-own-pg-');
  const options = { pgBin, dataDir: path.join(dir, 'data'), port: await freePort(), secretFile: path.join(dir, 'secret'), throwaway: true };
  let cluster: Cluster = startCluster(options);
  return {
    port: options.port,
    url: (db) => cluster.url(db),
    stop: () => cluster.stop(),
    start: () => {
      cluster = startCluster(options);
    },
    destroy: () => {
      cluster.stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
