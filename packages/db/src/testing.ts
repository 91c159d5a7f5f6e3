import pg from 'pg';
import { randomBytes } from 'node:crypto';
import { createDb, DEFAULT_DATABASE_URL, type Database } from './client.ts';
import { runMigrations } from './migrate.ts';

/**
 * Test support: a fresh, migrated database on the PostgreSQL server that DATABASE_URL points at.
 * The first call migrates a template database; later calls copy it (CREATE DATABASE … TEMPLATE), which is fast.
 */
export type ScratchDatabase = { url: string; db: Database; pool: pg.Pool; drop: () => Promise<void> };

const baseUrl = () => process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL;

function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

async function admin<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: withDatabase(baseUrl(), 'postgres') });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

let templateReady: Promise<string> | null = null;

async function ensureTemplate(): Promise<string> {
  const template = `${new URL(baseUrl()).pathname.slice(1) || 'plumbline'}_test_template`;
  // One process may build the template while another waits: an advisory lock serialises them.
  await admin(async (client) => {
    await client.query('select pg_advisory_lock(4242)');
    try {
      const exists = await client.query('select 1 from pg_database where datname = $1', [template]);
      if (exists.rowCount === 0) {
        await client.query(`create database "${template}"`);
        await runMigrations(withDatabase(baseUrl(), template));
      } else {
        await runMigrations(withDatabase(baseUrl(), template));
      }
    } finally {
      await client.query('select pg_advisory_unlock(4242)');
    }
  });
  return template;
}

export async function createScratchDatabase(label = 'test'): Promise<ScratchDatabase> {
  templateReady ??= ensureTemplate();
  const template = await templateReady;
  const name = `pl_${label
    .replace(/[^a-z0-9]/gi, '')
    .toLowerCase()
    .slice(0, 20)}_${randomBytes(4).toString('hex')}`;
  await admin(async (client) => {
    await client.query('select pg_advisory_lock(4242)');
    try {
      await client.query(`create database "${name}" template "${template}"`);
    } finally {
      await client.query('select pg_advisory_unlock(4242)');
    }
  });
  const url = withDatabase(baseUrl(), name);
  const { db, pool } = createDb(url);
  return {
    url,
    db,
    pool,
    drop: async () => {
      await pool.end();
      await admin((client) => client.query(`drop database if exists "${name}" with (force)`));
    },
  };
}
export * from './qc-fixtures.ts';
