import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema.ts';
import { errorForLog } from '../log.ts';

export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle (what `db.transaction` passes its callback). */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** Repositories that can join a caller's transaction take either. */
export type DbOrTx = Db | Tx;

export interface Database {
  pool: pg.Pool;
  db: Db;
  /**
   * The pool for long-lived clients (the realtime adapter's LISTEN connection): a client that
   * loses its connection is handed back as broken, so the pool replaces it instead of keeping a
   * dead slot, and its error never reaches the process.
   */
  listenerPool: pg.Pool;
  close(): Promise<void>;
}

/**
 * The session setting by which this version's connections tell the database that they write
 * the summary columns with every document (migration 0012: such a write without them is
 * refused; a connection without the setting — an instance of the version before — may write).
 */
export const WRITES_SUMMARY_SETTING = 'shockwright.writes_summary';

/** Connections per server process unless told otherwise. */
export const DEFAULT_POOL_MAX = 10;

/** Waiting longer than this for a connection answers 503 instead of hanging the request. */
export const CONNECT_TIMEOUT_MS = 5_000;

/**
 * A session that sits in an open transaction this long is ended by PostgreSQL, which releases
 * its locks. Our transactions do milliseconds of work between statements, so only a hung
 * process (stopped, swapping, stuck in a loop) ever reaches it: an instance frozen while it
 * holds a sketch's row lock stops blocking the other instances' editors after this long.
 */
export const IDLE_IN_TRANSACTION_TIMEOUT_MS = 5_000;

/** No single statement runs longer than this (a runaway query ends instead of holding locks). */
export const STATEMENT_TIMEOUT_MS = 60_000;

/**
 * Opens a connection pool and the Drizzle handle over it. Repositories receive `db`.
 *
 * The database may go away at any time (restart, failover, pg_terminate_backend): that is an
 * expected state, never a process exit. Every client gets an error handler the moment it
 * connects — a checked-out client (in a transaction, or the adapter's LISTEN client) has no
 * other listener, and an unheard 'error' event would kill the process. Queries on a lost
 * connection fail and their requests answer 503; the pool connects afresh for the next one.
 */
export function openDatabase(url: string, options: { max?: number; log?: (line: string) => void } = {}): Database {
  const log = options.log ?? ((l: string) => console.error(l));
  const pool = new pg.Pool({
    connectionString: url,
    max: options.max ?? DEFAULT_POOL_MAX,
    connectionTimeoutMillis: CONNECT_TIMEOUT_MS,
    // Session settings sent at connect: they bind every connection of the pool, also the one a
    // frozen instance holds. Lock waits are bounded per transaction where they matter
    // (the edit log's row lock); a global lock_timeout would also cut short the migrator's
    // advisory lock, which legitimately waits for another instance's migrations.
    idle_in_transaction_session_timeout: IDLE_IN_TRANSACTION_TIMEOUT_MS,
    statement_timeout: STATEMENT_TIMEOUT_MS,
    // This version writes each sketch's summary with its document: the database refuses a
    // write of ours without it, while an instance of the version before (which does not send
    // this) may still write during an upgrade (migration 0012).
    options: `-c ${WRITES_SUMMARY_SETTING}=on`,
  });
  pool.on('connect', (client) => {
    client.on('error', (err) => log(`[db] connection lost: ${errorForLog(err, false)}`));
  });
  // An idle client losing its connection: the pool drops it and connects again when needed.
  pool.on('error', (err) => log(`[db] idle connection lost: ${errorForLog(err, false)}`));
  const db = drizzle(pool, { schema, casing: 'snake_case' });
  return {
    pool,
    db,
    listenerPool: releasingBrokenClients(pool),
    close: () => pool.end(),
  };
}

/**
 * `pool`, except that a client taken with `connect()` is released as broken as soon as its
 * connection errors or ends. A holder that keeps its client for the life of the process (the
 * socket.io adapter's LISTEN client) never calls release itself, so without this every lost
 * connection would keep one of the pool's slots until the pool was exhausted.
 */
function releasingBrokenClients(pool: pg.Pool): pg.Pool {
  const connect = async (): Promise<pg.PoolClient> => {
    const client = await pool.connect();
    const release = client.release.bind(client);
    let released = false;
    const onError = (err: Error) => client.release(err);
    const onEnd = () => client.release(new Error('connection ended'));
    client.release = (err?: Error | boolean) => {
      if (released) return;
      released = true;
      client.removeListener('error', onError);
      client.removeListener('end', onEnd);
      release(err);
    };
    client.on('error', onError);
    client.on('end', onEnd);
    return client;
  };
  return new Proxy(pool, {
    get(target, prop, receiver) {
      if (prop === 'connect') return connect;
      const value = Reflect.get(target, prop, receiver);
      return typeof value === 'function' ? value.bind(target) : value;
    },
  });
}
