import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import { EnvError, parseEnv, type Env } from '../env.ts';
import { applyMigrations } from '../db/migrate.ts';
import { ensureDatabase, resolveDataDir, startCluster, clusterOwner, type Cluster } from './postgres.ts';
import { ensureSystemPackages } from './system.ts';
import { REPO_ROOT } from '../app.ts';

export const DATA_DIR = path.join(REPO_ROOT, '.data');

/**
 * Checks the environment before anything is started, so a bad PORT is refused in one line
 * without first booting PostgreSQL. Values the lifecycle fills in later get placeholders.
 */
export function precheckEnv(): void {
  try {
    parseEnv({ SESSION_SECRET: 'x'.repeat(32), DATABASE_URL: 'postgres://placeholder/x', ...process.env });
  } catch (err) {
    if (err instanceof EnvError) {
      console.error(err.message);
      process.exit(1);
    }
    throw err;
  }
}

function persistentSecret(file: string): string {
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  const secret = randomBytes(32).toString('base64url');
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  return secret;
}

export interface LocalStack {
  env: Env;
  cluster: Cluster | null;
  stop(): void;
}

/**
 * The database part of `npm start` / `npm run dev`: use DATABASE_URL when set, else install (if
 * needed) and start the local cluster in .data/postgres, create the database and migrate.
 */
export async function bringUpDatabase(options: { onClusterStarted?: (cluster: Cluster) => void } = {}): Promise<LocalStack> {
  let cluster: Cluster | null = null;
  let databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) {
    const { pgBin } = ensureSystemPackages({ chromium: false });
    const dataDir = resolveDataDir(path.join(DATA_DIR, 'postgres'), clusterOwner());
    cluster = startCluster({
      pgBin,
      dataDir,
      port: Number(process.env.PG_PORT ?? 54329),
      secretFile: path.join(DATA_DIR, 'postgres.secret'),
    });
    options.onClusterStarted?.(cluster);
    try {
      await ensureDatabase(cluster.url('postgres'), 'shockwright');
    } catch (err) {
      cluster.stop();
      throw err;
    }
    databaseUrl = cluster.url('shockwright');
  }
  const env = parseEnv({
    ...process.env,
    DATABASE_URL: databaseUrl,
    SESSION_SECRET: process.env.SESSION_SECRET ?? persistentSecret(path.join(DATA_DIR, 'session.secret')),
  });
  try {
    await applyMigrations(env.DATABASE_URL);
  } catch (err) {
    cluster?.stop();
    throw err;
  }
  return { env, cluster, stop: () => cluster?.stop() };
}
