/**
 * Opens the database and applies the migrations in drizzle/: embedded PGlite in DATA_DIR/pglite by
 * default, or a PostgreSQL server through node-postgres when DATABASE_URL is set. Both give the same
 * Drizzle API (`Db`); nothing above this module knows which one it runs on.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { PGlite } from '@electric-sql/pglite';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import pg from 'pg';
import * as schema from './schema';
import { errorSummary, log } from '../http/logger';

export type Schema = typeof schema;
export type Db = PgDatabase<PgQueryResultHKT, Schema>;
/** The handle passed to a `db.transaction()` callback. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
/** Either the database or a transaction: service functions accept both. */
export type DbOrTx = Db | Tx;

export const MIGRATIONS_DIR = fileURLToPath(new URL('../../drizzle', import.meta.url));

export interface Database {
  db: Db;
  kind: 'pglite' | 'postgres';
  /** Where the data lives, for log lines (a directory, or the URL without its password). */
  location: string;
  /** The embedded instance (kind 'pglite'), for backups taken by the owning process. */
  pglite?: PGlite;
  close(): Promise<void>;
}

export async function openPglite(dataDir: string): Promise<Database> {
  const dir = path.join(dataDir, 'pglite');
  const client = await PGlite.create({ dataDir: dir });
  const db = drizzlePglite({ client, schema });
  try {
    await migratePglite(db, { migrationsFolder: MIGRATIONS_DIR });
  } catch (err) {
    await client.close();
    throw err;
  }
  let closed = false;
  return {
    db: db as unknown as Db,
    kind: 'pglite',
    location: dir,
    pglite: client,
    async close() {
      if (closed) return;
      closed = true;
      await client.close();
    },
  };
}

export function redactUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return 'postgres://…';
  }
}

export async function openPostgres(databaseUrl: string): Promise<Database> {
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 10 });
  // An idle client losing its connection must not crash the process.
  pool.on('error', (err) => log().error({ event: 'db.idle_client_error', err: errorSummary(err) }, 'idle PostgreSQL client error'));
  const db = drizzlePg({ client: pool, schema });
  try {
    await migratePg(db, { migrationsFolder: MIGRATIONS_DIR });
  } catch (err) {
    await pool.end();
    throw err;
  }
  let closed = false;
  return {
    db: db as unknown as Db,
    kind: 'postgres',
    location: redactUrl(databaseUrl),
    async close() {
      if (closed) return;
      closed = true;
      await pool.end();
    },
  };
}

export function openDatabase(opts: { dataDir: string; databaseUrl?: string }): Promise<Database> {
  return opts.databaseUrl ? openPostgres(opts.databaseUrl) : openPglite(opts.dataDir);
}
