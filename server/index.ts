import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { EnvError, parseEnv, type Env } from './env.ts';
import { openDatabase } from './db/client.ts';
import { createApp, type AppDeps } from './app.ts';
import { attachRealtime } from './realtime/index.ts';
import { errorForLog, redactingLog } from './log.ts';

export interface RunningServer {
  server: Server;
  url: string;
  port: number;
  /** Stops accepting connections, drains open ones, closes the database pool. */
  close(): Promise<void>;
}

/** Builds the app for `env` and listens. Used by `npm start`, `npm run dev` and tests. */
export async function startServer(
  env: Env,
  options: { log?: (line: string) => void } & Pick<AppDeps, 'limits' | 'mailer'> = {},
): Promise<RunningServer> {
  const log = redactingLog(options.log ?? ((l: string) => console.log(l)));
  const database = openDatabase(env.DATABASE_URL, { log });
  let listeningUrl = '';
  const built = createApp({ env, database, log, limits: options.limits, mailer: options.mailer, publicUrl: () => listeningUrl });
  const server = createServer(built.app);
  const io = attachRealtime(server, built.session, built.passportMiddleware, built.context, {
    adapterPool: database.listenerPool,
    trustProxy: built.app.get('trust proxy fn'),
    dieAfterCommit: env.FAULT_DIE_AFTER_COMMIT,
    joinPauseMs: env.FAULT_JOIN_PAUSE_MS,
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(env.PORT, env.HOST, () => resolve());
  });
  const { port } = server.address() as AddressInfo;
  const host = env.HOST === '0.0.0.0' || env.HOST === '::' ? '127.0.0.1' : env.HOST;
  listeningUrl = `http://${host}:${port}`;
  let closing: Promise<void> | undefined;
  return {
    server,
    port,
    url: `http://${host}:${port}`,
    close() {
      closing ??= (async () => {
        // Tell every socket to go (clients reconnect to another instance or on restart).
        io.disconnectSockets(true);
        await new Promise<void>((resolve) => io.close(() => resolve()));
        await new Promise<void>((resolve) => {
          server.close(() => resolve());
          // Idle keep-alive sockets would hold close() open; in-flight requests still finish.
          server.closeIdleConnections();
          setTimeout(() => server.closeAllConnections(), 5_000).unref();
        });
        built.close();
        await built.context.heavy.close();
        await database.close();
      })();
      return closing;
    },
  };
}

/**
 * Runs `cleanup` once on SIGINT/SIGTERM, then exits. One Ctrl-C reaches this process several
 * times (the terminal signals the whole process group, and npm and tsx relay it again), so
 * repeats within DUPLICATE_SIGNAL_MS are ignored. A later, deliberate second Ctrl-C while
 * draining runs `emergency` (synchronous: e.g. stop PostgreSQL) and exits at once.
 */
const DUPLICATE_SIGNAL_MS = 1500;
/** Longest a graceful shutdown may take before the process exits regardless. */
export const SHUTDOWN_DEADLINE_MS = 15_000;

export function exitOnSignals(cleanup: () => Promise<void>, options: { log?: (l: string) => void; emergency?: () => void } = {}): void {
  const log = options.log ?? console.log;
  let firstAt: number | null = null;
  const onSignal = (signal: NodeJS.Signals) => {
    if (firstAt !== null) {
      if (Date.now() - firstAt < DUPLICATE_SIGNAL_MS) return;
      log(`${signal} again: stopping now.`);
      options.emergency?.();
      process.exit(130);
    }
    firstAt = Date.now();
    log(`${signal}: shutting down…`);
    // A drain that hangs (a connection that never closes, a database that never answers) must
    // not keep a stopped server alive: after SHUTDOWN_DEADLINE_MS it exits anyway.
    setTimeout(() => {
      log(`Shutdown did not finish within ${SHUTDOWN_DEADLINE_MS / 1000} s: stopping now.`);
      options.emergency?.();
      process.exit(1);
    }, SHUTDOWN_DEADLINE_MS).unref();
    cleanup().then(
      () => process.exit(0),
      (err) => {
        console.error(`Shutdown failed: ${(err as Error).message}`);
        options.emergency?.();
        process.exit(1);
      },
    );
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);
}

/**
 * A promise rejected with nobody listening (a library's background task, say, while the
 * database is away) is logged, not a reason to stop serving everyone else. An uncaught
 * exception still ends the process: its state can no longer be trusted.
 */
export function keepRunningOnStrayRejections(log: (line: string) => void = (l) => console.error(l)): void {
  process.on('unhandledRejection', (reason) => log(`[server] unhandled rejection (server keeps running): ${errorForLog(reason)}`));
}

async function main(): Promise<void> {
  let env: Env;
  try {
    env = parseEnv(process.env);
  } catch (err) {
    if (err instanceof EnvError) {
      console.error(err.message);
      process.exit(1);
    }
    throw err;
  }
  keepRunningOnStrayRejections();
  const running = await startServer(env);
  console.log(`Shockwright listening on ${running.url}`);
  exitOnSignals(() => running.close());
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  main().catch((err) => {
    console.error(`Server failed to start: ${(err as Error).message}`);
    process.exit(1);
  });
}
