import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema/index.ts';

export type Database = NodePgDatabase<typeof schema>;
/** A database handle or an open transaction: queries accept either. */
export type Executor = Database | Parameters<Parameters<Database['transaction']>[0]>[0];

export const DEFAULT_DATABASE_URL = 'postgres://postgres@127.0.0.1:54329/plumbline';

export type DbOptions = {
  /** Most connections this process holds (each process — API, worker — has its own pool). */
  max?: number;
};

export function createDb(
  url: string = process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL,
  options: DbOptions = {},
) {
  const pool = new pg.Pool({
    connectionString: url,
    max: options.max ?? 10,
    // While the server restarts, waiting for a connection fails after this long instead of hanging.
    connectionTimeoutMillis: 10_000,
  });
  // A connection that breaks while checked out (a restart in the middle of a query or a COPY) fails
  // that query, and pg also emits 'error' on the client, which the pool listens to only while the
  // connection is idle: without this listener that event would end the process.
  pool.on('connect', (client) => {
    client.on('error', (err: Error & { code?: string }) => {
      if (err.code !== '57P01') console.error('database: connection lost:', err.message);
    });
  });
  // An idle connection can be closed by the server (a restart, or a test dropping its database);
  // pg reports that on the pool, and an unhandled 'error' event would end the process.
  pool.on('error', (err: Error & { code?: string }) => {
    if (err.code !== '57P01') console.error('database: idle connection error:', err.message);
  });
  const db = drizzle(pool, { schema, casing: 'snake_case' });
  return { db, pool };
}

/** A Drizzle handle on one checked-out connection, for work that mixes Drizzle queries with COPY in one transaction. */
/** Error codes that mean PostgreSQL is away or restarting, not that the statement was wrong. */
const UNAVAILABLE_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'EPIPE',
  'ETIMEDOUT',
  'ENOTFOUND',
  'EHOSTUNREACH',
  '57P01', // admin_shutdown: the server is stopping
  '57P02', // crash_shutdown
  '57P03', // cannot_connect_now: starting up or shutting down
  '08000', // connection_exception
  '08003', // connection_does_not_exist
  '08006', // connection_failure
  '53300', // too_many_connections
]);
const UNAVAILABLE_MESSAGES =
  /Connection terminated|connection timeout|Client has encountered a connection error|not queryable/i;

/**
 * True when an error (or any error in its `cause` chain, as Drizzle wraps driver errors) says the
 * database cannot be reached right now: the caller should retry later rather than report a failure.
 */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e = error, depth = 0; e && depth < 5; depth++) {
    const { code, message, cause } = e as { code?: unknown; message?: unknown; cause?: unknown };
    if (typeof code === 'string' && UNAVAILABLE_CODES.has(code)) return true;
    if (typeof message === 'string' && UNAVAILABLE_MESSAGES.test(message)) return true;
    e = cause;
  }
  return false;
}

export function dbOnClient(client: pg.PoolClient): Database {
  return drizzle(client, { schema, casing: 'snake_case' }) as unknown as Database;
}
