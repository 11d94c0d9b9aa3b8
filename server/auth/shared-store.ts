/**
 * Where the sign-in protection keeps its state (docs/decisions/013-sign-in-throttling.md).
 *
 * - On a PostgreSQL server (DATABASE_URL) several app servers share one database, so the limiter's
 *   counters live in it: schema `bw_auth`, table `rate_limits` (the layout rate-limiter-flexible's
 *   PostgreSQL store expects). On embedded PGlite one process owns the data (decision 004), so the
 *   counters stay in that process's memory.
 * - Either way the key that signs device cookies lives in `bw_auth.secrets`, so every app server checks
 *   the same signature and a restart does not make every browser a stranger.
 *
 * The `bw_auth` schema is created here, outside the drizzle migrations: it holds no application data,
 * only counters that expire and one generated key.
 */
import { randomBytes } from 'node:crypto';
import { sql } from 'drizzle-orm';
import pg from 'pg';
import type { Db } from '../db/client';

export const AUTH_SCHEMA = 'bw_auth';
export const RATE_LIMIT_TABLE = 'rate_limits';

/** The node-postgres pool behind `db` when it is a PostgreSQL server; undefined on PGlite. */
export function sharedPool(db: Db): pg.Pool | undefined {
  const client = (db as unknown as { $client?: unknown }).$client;
  return client instanceof pg.Pool ? client : undefined;
}

/** True when other app servers may be using the same database (PostgreSQL through DATABASE_URL). */
export function isSharedDatabase(db: Db): boolean {
  return sharedPool(db) !== undefined;
}

/**
 * Creates the schema and tables (idempotent; several servers starting at once take turns through a
 * transaction-scoped advisory lock) and returns the device-cookie signing key, generating it on first use.
 */
export async function prepareAuthStore(db: Db, withRateLimitTable: boolean): Promise<Buffer> {
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(7301301)`);
    await tx.execute(sql.raw(`create schema if not exists ${AUTH_SCHEMA}`));
    await tx.execute(sql.raw(`create table if not exists ${AUTH_SCHEMA}.secrets (name text primary key, value text not null, created_at timestamptz not null default now())`));
    if (withRateLimitTable) {
      // The statement rate-limiter-flexible's PostgreSQL store would run itself (RateLimiterPostgres).
      await tx.execute(sql.raw(`create table if not exists ${AUTH_SCHEMA}.${RATE_LIMIT_TABLE} (key varchar(255) primary key, points integer not null default 0, expire bigint)`));
    }
    const fresh = randomBytes(32).toString('base64url');
    await tx.execute(sql`insert into bw_auth.secrets (name, value) values ('device-cookie', ${fresh}) on conflict (name) do nothing`);
    const res = (await tx.execute(sql`select value from bw_auth.secrets where name = 'device-cookie'`)) as unknown as { rows: { value: string }[] };
    return Buffer.from(res.rows[0].value, 'base64url');
  });
}
