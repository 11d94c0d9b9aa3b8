/**
 * Limits on attached files beyond the size of one file (docs/api.md "Uploads", docs/decisions/014):
 *
 * - **Per-team storage quota** (`UPLOAD_TEAM_QUOTA_MB`, default 2 GB): the bytes of every file attached
 *   to the team's projects. Checked before the body is read (a team already at its quota is refused at
 *   once) and again inside the transaction that records the file, with the team's row locked, so two
 *   uploads at the same moment cannot both squeeze under the quota. Refused: 413 `quota_exceeded`.
 * - **Per-user upload rate** (`UPLOAD_RATE_MAX` uploads per `UPLOAD_RATE_MINUTES`, default 30 per 10
 *   minutes): every upload a person starts counts, accepted or not, since reading and checking the bytes
 *   is the cost. Refused: 429 `too_many_uploads` with Retry-After. rate-limiter-flexible keeps the
 *   counts — in memory for one PGlite process, in PostgreSQL (schema `bw_limits`) when several app
 *   servers share a database, so the limit is the same whichever server answers.
 *
 * OWASP ASVS 5.0 2.4.1 (anti-automation: limits on the rate of a business function), OWASP File Upload
 * Cheat Sheet (limit the size and number of uploaded files).
 */
import { eq, sql } from 'drizzle-orm';
import pg from 'pg';
import { RateLimiterMemory, RateLimiterPostgres, RateLimiterRes, type RateLimiterAbstract } from 'rate-limiter-flexible';
import type { Config } from '../config';
import type { Db, DbOrTx } from '../db/client';
import { projects, teams, uploads } from '../db/schema';
import { DomainError, tooLarge } from './errors';

export const LIMITS_SCHEMA = 'bw_limits';
export const UPLOAD_RATE_TABLE = 'upload_rate';

export type UploadQuotaConfig = Config['uploadQuota'];

/** "1.5 GB", "200 MB", "512 KB": sizes in the binary units the quota is configured in. */
export function formatBytes(bytes: number): string {
  const units = [
    ['GB', 1024 ** 3],
    ['MB', 1024 ** 2],
    ['KB', 1024],
  ] as const;
  for (const [unit, size] of units) {
    if (bytes >= size) {
      const v = bytes / size;
      return `${v >= 100 ? Math.round(v) : Math.round(v * 10) / 10} ${unit}`;
    }
  }
  return `${bytes} bytes`;
}

function minutes(seconds: number): string {
  const m = Math.max(1, Math.ceil(seconds / 60));
  return m === 1 ? '1 minute' : `${m} minutes`;
}

/** Bytes of every file attached to the team's projects. */
export async function teamUploadBytes(db: DbOrTx, teamId: string): Promise<number> {
  const [row] = await db
    .select({ bytes: sql<string>`coalesce(sum(${uploads.size}), 0)` })
    .from(uploads)
    .innerJoin(projects, eq(projects.id, uploads.projectId))
    .where(eq(projects.teamId, teamId));
  return Number(row?.bytes ?? 0);
}

export function quotaExceeded(quota: UploadQuotaConfig, usedBytes: number, fileBytes: number | null): DomainError {
  const limit = formatBytes(quota.teamBytes);
  const used = formatBytes(usedBytes);
  const message =
    fileBytes === null
      ? `Your team's attached files use ${used} of its ${limit} storage quota, so nothing more can be attached. Delete files the team no longer needs, or ask the server's administrator to raise UPLOAD_TEAM_QUOTA_MB.`
      : `This ${formatBytes(fileBytes)} file does not fit in your team's ${limit} storage quota (${used} already used). Delete files the team no longer needs, or ask the server's administrator to raise UPLOAD_TEAM_QUOTA_MB.`;
  return tooLarge('quota_exceeded', message, { quotaBytes: quota.teamBytes, usedBytes, ...(fileBytes === null ? {} : { fileBytes }) });
}

/** 413 before the body is read when the team has no room left at all. */
export async function checkQuotaRoom(db: Db, quota: UploadQuotaConfig, teamId: string): Promise<void> {
  const used = await teamUploadBytes(db, teamId);
  if (used >= quota.teamBytes) throw quotaExceeded(quota, used, null);
}

/**
 * Inside the transaction that records a file: lock the team's row (concurrent uploads to one team take
 * turns here), then refuse when the file would take the team over its quota.
 */
export async function reserveQuota(tx: DbOrTx, quota: UploadQuotaConfig, teamId: string, fileBytes: number): Promise<void> {
  await tx.select({ id: teams.id }).from(teams).where(eq(teams.id, teamId)).for('update');
  const used = await teamUploadBytes(tx, teamId);
  if (used + fileBytes > quota.teamBytes) throw quotaExceeded(quota, used, fileBytes);
}

export interface UploadRateLimiter {
  /** Counts one upload by `userId`; throws 429 too_many_uploads when the person has none left. */
  consume(userId: string): Promise<void>;
}

function pgPoolOf(db: Db): pg.Pool | undefined {
  const client = (db as unknown as { $client?: unknown }).$client;
  return client instanceof pg.Pool ? client : undefined;
}

/**
 * The per-user upload rate: rate-limiter-flexible's memory store on PGlite (one process owns the data,
 * decision 004), its PostgreSQL store on a PostgreSQL server (DATABASE_URL), whose table is created on
 * first use.
 */
export function createUploadRateLimiter(db: Db, quota: UploadQuotaConfig): UploadRateLimiter {
  const options = { keyPrefix: 'upload', points: quota.ratePerUser, duration: quota.rateWindowSeconds };
  const pool = pgPoolOf(db);
  let ready: Promise<RateLimiterAbstract> | undefined;
  const limiter = (): Promise<RateLimiterAbstract> =>
    (ready ??= (async () => {
      if (!pool) return new RateLimiterMemory(options);
      // Several servers may start at once: create the schema and table under an advisory lock.
      await db.transaction(async (tx) => {
        await tx.execute(sql`select pg_advisory_xact_lock(7301402)`);
        await tx.execute(sql.raw(`create schema if not exists ${LIMITS_SCHEMA}`));
        await tx.execute(sql.raw(`create table if not exists ${LIMITS_SCHEMA}.${UPLOAD_RATE_TABLE} (key varchar(255) primary key, points integer not null default 0, expire bigint)`));
      });
      return new RateLimiterPostgres({ ...options, storeClient: pool, storeType: 'pool', schemaName: LIMITS_SCHEMA, tableName: UPLOAD_RATE_TABLE, tableCreated: true });
    })().catch((err) => {
      ready = undefined; // try again on the next upload
      throw err;
    }));

  return {
    async consume(userId) {
      const rl = await limiter();
      try {
        await rl.consume(userId, 1);
      } catch (res) {
        if (!(res instanceof RateLimiterRes)) throw res; // a store failure: a server fault, not the user's
        const retryAfter = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
        throw new DomainError(
          'rate_limited',
          'too_many_uploads',
          `You have started ${quota.ratePerUser} uploads in the last ${minutes(quota.rateWindowSeconds)}, the most allowed. Wait ${minutes(retryAfter)} and try again; an administrator can raise UPLOAD_RATE_MAX.`,
          { limit: quota.ratePerUser, windowSeconds: quota.rateWindowSeconds, retryAfterSeconds: retryAfter },
          retryAfter,
        );
      }
    },
  };
}
