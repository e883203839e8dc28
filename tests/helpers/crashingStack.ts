/**
 * A stand-in for `npm start` that crashes: starts a PostgreSQL cluster of its own, installs the
 * same guard start.ts installs, prints `port=<n> dir=<folder>` and then throws from a timer (an
 * uncaught exception). The crash-guard test checks that the cluster did not outlive it.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { freePort, makeOwnedTempDir, startCluster } from '../../server/lifecycle/postgres.ts';
import { findPostgresBin } from '../../server/lifecycle/system.ts';
import { stopOnAnyExit } from '../../server/lifecycle/crashGuard.ts';

const dir = mkdtempSync(path.join(tmpdir(), 'sw-crash-pg-'));
makeOwnedTempDir(dir);
const port = await freePort();
const cluster = startCluster({ pgBin: findPostgresBin()!, dataDir: path.join(dir, 'data'), port, secretFile: path.join(dir, 'secret'), throwaway: true });
stopOnAnyExit(() => cluster.stop(), () => {});
console.log(`port=${port} dir=${dir}`);
setTimeout(() => {
  throw new Error('simulated crash');
}, 50);
