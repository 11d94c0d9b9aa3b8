/**
 * A fresh, migrated database per test file: PGlite in a temporary data dir, or — when DATABASE_URL
 * is set (an admin URL such as postgres://postgres@127.0.0.1:55432/postgres) — a new database
 * bw_test_<random> on that server, dropped afterwards.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { openPglite, openPostgres, type Database } from '../../server/db/client';

export interface TestDatabase extends Database {
  /** Closes the connection and removes the data (temp dir or database). */
  destroy(): Promise<void>;
}

export async function createTestDatabase(): Promise<TestDatabase> {
  const adminUrl = process.env.DATABASE_URL;
  if (!adminUrl) {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-test-'));
    const database = await openPglite(dir);
    return {
      ...database,
      async destroy() {
        await database.close();
        fs.rmSync(dir, { recursive: true, force: true });
      },
    };
  }

  const name = `bw_test_${randomBytes(6).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE ${name}`);
  } finally {
    await admin.end();
  }
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  const database = await openPostgres(url.toString());
  return {
    ...database,
    async destroy() {
      await database.close();
      const c = new pg.Client({ connectionString: adminUrl });
      await c.connect();
      try {
        await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      } finally {
        await c.end();
      }
    },
  };
}
