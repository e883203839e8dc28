import { errorForLog } from '../log.ts';

/**
 * `npm start` and `npm run dev` start PostgreSQL as a daemon: it would outlive this process if
 * nothing stopped it. This makes sure something does, whichever way the process ends — a crash
 * (uncaught exception), a closed terminal (SIGHUP), or a plain exit — so a crash never leaves
 * the cluster orphaned. (SIGKILL cannot be caught; the next start finds and reuses the cluster.)
 * `stop` must be synchronous and idempotent (Cluster.stop is: pg_ctl through spawnSync).
 */
export function stopOnAnyExit(stop: () => void, log: (line: string) => void = (l) => console.error(l)): void {
  process.on('exit', () => stop());
  process.on('uncaughtException', (err) => {
    log(`Crashed: ${errorForLog(err)}\nStopping PostgreSQL before exiting.`);
    stop();
    process.exit(1);
  });
  process.on('SIGHUP', () => {
    stop();
    process.exit(129);
  });
}
