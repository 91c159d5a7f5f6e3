import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema/index.ts';

export type Database = NodePgDatabase<typeof schema>;
/** A database handle or an open transaction: queries accept either. */
export type Executor = Database | Parameters<Parameters<Database['transaction']>[0]>[0];

export const DEFAULT_DATABASE_URL = 'postgres://postgres@127.0.0.1:54329/plumbline';

export function createDb(url: string = process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL) {
  const pool = new pg.Pool({ connectionString: url, max: 10 });
  // An idle connection can be closed by the server (a restart, or a test dropping its database);
  // pg reports that on the pool, and an unhandled 'error' event would end the process.
  pool.on('error', (err: Error & { code?: string }) => {
    if (err.code !== '57P01') console.error('database: idle connection error:', err.message);
  });
  const db = drizzle(pool, { schema, casing: 'snake_case' });
  return { db, pool };
}

/** A Drizzle handle on one checked-out connection, for work that mixes Drizzle queries with COPY in one transaction. */
export function dbOnClient(client: pg.PoolClient): Database {
  return drizzle(client, { schema, casing: 'snake_case' }) as unknown as Database;
}
