import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { EnvError, parseEnv, type Env } from './env.ts';
import { openDatabase } from './db/client.ts';
import { createApp, type AppDeps } from './app.ts';
import { attachRealtime } from './realtime/index.ts';

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
  const log = options.log ?? ((l: string) => console.log(l));
  const database = openDatabase(env.DATABASE_URL);
  let listeningUrl = '';
  const built = createApp({ env, database, log, limits: options.limits, mailer: options.mailer, publicUrl: () => listeningUrl });
  const server = createServer(built.app);
  const io = attachRealtime(server, built.session, built.passportMiddleware, built.context, { adapterPool: database.pool });
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
        await database.close();
      })();
      return closing;
    },
  };
}

/**
 * Runs `cleanup` once on SIGINT/SIGTERM, then exits. A second signal while draining exits at
 * once (an impatient Ctrl-C must still end the process).
 */
export function exitOnSignals(cleanup: () => Promise<void>, log: (l: string) => void = console.log): void {
  let stopping = false;
  const onSignal = (signal: NodeJS.Signals) => {
    if (stopping) {
      log(`${signal} again: exiting now.`);
      process.exit(130);
    }
    stopping = true;
    log(`${signal}: shutting down…`);
    cleanup().then(
      () => process.exit(0),
      (err) => {
        console.error(`Shutdown failed: ${(err as Error).message}`);
        process.exit(1);
      },
    );
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);
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
