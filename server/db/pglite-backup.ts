/**
 * Backups of the embedded database (PGlite in DATA_DIR/pglite).
 *
 * A backup is PGlite's own data-dir tarball (`dumpDataDir('gzip')`), taken after a CHECKPOINT by the
 * one process that owns the data dir (docs/decisions/004-pglite-ownership.md). It is written to a
 * temporary name, flushed to disk and renamed, so a backup file is either whole or absent.
 *
 * - `backupDataDir` / `restoreBackup`: offline, for `npm run db:backup` / `npm run db:restore`; they take
 *   the data-dir lock and refuse while a server owns it.
 * - `writeSnapshot` / `startScheduledBackups`: online, for the server process itself (which already owns
 *   the lock): `BACKUP_INTERVAL_MINUTES` and `BACKUP_DIR`, keeping the newest `BACKUP_KEEP` files.
 *
 * With DATABASE_URL the data lives in a PostgreSQL server: back it up with that server's own tools
 * (pg_dump, or base backups with WAL archiving); nothing here applies.
 */
import fs from 'node:fs';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { acquireDataDirLock, DataDirLockedError } from './lock';

/** The PGlite directory inside DATA_DIR (server/db/client.ts `openPglite`). */
export const pgliteDir = (dataDir: string) => path.join(dataDir, 'pglite');

/** Tables whose row counts a backup reports and a restore checks (the app's schema, server/db/schema.ts). */
export const COUNTED_TABLES = ['users', 'teams', 'memberships', 'projects', 'diagrams', 'sessions'] as const;

export type RowCounts = Partial<Record<(typeof COUNTED_TABLES)[number], number>>;

export class BackupError extends Error {}

/** The part of a PGlite instance this module uses (a real PGlite, or the `$client` of a drizzle db). */
export interface PgliteLike {
  query<T>(sql: string): Promise<{ rows: T[] }>;
  exec(sql: string): Promise<unknown>;
  dumpDataDir(compression?: 'none' | 'gzip' | 'auto'): Promise<File | Blob>;
}

export async function rowCounts(pg: PgliteLike): Promise<RowCounts> {
  const present = await pg.query<{ name: string }>(`select table_name as name from information_schema.tables where table_schema = 'public'`);
  const names = new Set(present.rows.map((r) => r.name));
  const counts: RowCounts = {};
  for (const t of COUNTED_TABLES) {
    if (!names.has(t)) continue;
    const r = await pg.query<{ n: number }>(`select count(*)::int as n from ${t}`);
    counts[t] = r.rows[0].n;
  }
  return counts;
}

/** Write `data` to `file` whole or not at all: temp file, fsync, rename, fsync the directory. */
export function writeFileAtomic(file: string, data: Uint8Array): void {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const tmp = `${file}.${process.pid}.partial`;
  const fd = fs.openSync(tmp, 'w', 0o600);
  try {
    fs.writeSync(fd, data);
    fs.fsyncSync(fd);
  } finally {
    fs.closeSync(fd);
  }
  fs.renameSync(tmp, file);
  try {
    const dfd = fs.openSync(path.dirname(file), 'r');
    try {
      fs.fsyncSync(dfd);
    } finally {
      fs.closeSync(dfd);
    }
  } catch {
    // Some file systems refuse fsync on a directory; the rename is still atomic.
  }
}

export interface SnapshotInfo {
  file: string;
  bytes: number;
  counts: RowCounts;
}

/**
 * A consistent snapshot of a live PGlite instance owned by this process. CHECKPOINT first, so the
 * data files are current and a restore needs little WAL replay; dumpDataDir runs between queries
 * (PGlite's query lock), and the image is at worst what a crash at that instant would leave, which
 * PostgreSQL recovers from its WAL on open.
 */
export async function writeSnapshot(pg: PgliteLike, file: string): Promise<SnapshotInfo> {
  await pg.exec('CHECKPOINT');
  const counts = await rowCounts(pg);
  const blob = await pg.dumpDataDir('gzip');
  const data = new Uint8Array(await blob.arrayBuffer());
  writeFileAtomic(file, data);
  return { file, bytes: data.byteLength, counts };
}

function lockOrExplain(dataDir: string, action: string) {
  try {
    return acquireDataDirLock(dataDir);
  } catch (err) {
    if (err instanceof DataDirLockedError) {
      throw new BackupError(
        `Cannot ${action}: a Bankwright server (pid ${err.ownerPid}) owns ${dataDir}.\n` +
          `  Only one process may open an embedded database at a time (two would corrupt it).\n` +
          `  Stop the server first (Ctrl-C or SIGTERM, it closes the database cleanly), or let the server\n` +
          `  take backups itself: start it with BACKUP_INTERVAL_MINUTES=60 BACKUP_DIR=/path/to/backups.`,
      );
    }
    throw err;
  }
}

function isNonEmptyDir(dir: string): boolean {
  try {
    return fs.readdirSync(dir).length > 0;
  } catch {
    return false;
  }
}

/** Offline backup of DATA_DIR's embedded database into `outFile` (npm run db:backup). */
export async function backupDataDir(dataDir: string, outFile: string): Promise<SnapshotInfo> {
  const dir = pgliteDir(dataDir);
  if (!fs.existsSync(path.join(dir, 'PG_VERSION'))) {
    throw new BackupError(`There is no embedded database in ${dataDir} (no ${path.join(dir, 'PG_VERSION')}). Check DATA_DIR.`);
  }
  const lock = lockOrExplain(dataDir, 'back up the embedded database');
  try {
    const pg = await PGlite.create({ dataDir: dir });
    try {
      return await writeSnapshot(pg, outFile);
    } finally {
      await pg.close();
    }
  } finally {
    lock.release();
  }
}

export interface RestoreInfo {
  dataDir: string;
  counts: RowCounts;
  /** Where the previous database was moved with --force, if there was one. */
  movedAside?: string;
}

/**
 * Restore a backup file into DATA_DIR (npm run db:restore). Refuses a DATA_DIR that already holds a
 * database unless `force`; with `force` the old database is moved aside (never deleted). The restored
 * database is opened and its tables counted before this returns.
 */
export async function restoreBackup(file: string, dataDir: string, opts: { force?: boolean; now?: Date } = {}): Promise<RestoreInfo> {
  if (!fs.existsSync(file)) throw new BackupError(`No backup file at ${file}.`);
  const bytes = fs.readFileSync(file);
  // gzip magic 1f 8b, or a plain tar ("ustar" at offset 257)
  const isGzip = bytes[0] === 0x1f && bytes[1] === 0x8b;
  const isTar = bytes.length > 262 && bytes.subarray(257, 262).toString('latin1') === 'ustar';
  if (!isGzip && !isTar) throw new BackupError(`${file} is not a Bankwright backup (expected a .tar.gz written by npm run db:backup).`);

  const lock = lockOrExplain(dataDir, 'restore into this data directory');
  try {
    const dir = pgliteDir(dataDir);
    let movedAside: string | undefined;
    if (isNonEmptyDir(dir)) {
      if (!opts.force) {
        throw new BackupError(
          `${dir} already holds a database. Restore into an empty or new DATA_DIR, or pass --force to move\n` +
            `  the current database aside (it is kept, renamed, not deleted).`,
        );
      }
      const stamp = (opts.now ?? new Date()).toISOString().replace(/[:.]/g, '-');
      movedAside = `${dir}.before-restore-${stamp}`;
      fs.renameSync(dir, movedAside);
    }
    fs.mkdirSync(dir, { recursive: true });
    let pg: PGlite;
    try {
      pg = await PGlite.create({ dataDir: dir, loadDataDir: new Blob([bytes]) });
    } catch (err) {
      fs.rmSync(dir, { recursive: true, force: true });
      if (movedAside) fs.renameSync(movedAside, dir);
      throw new BackupError(`The backup could not be opened as a database: ${(err as Error).message}`);
    }
    try {
      const counts = await rowCounts(pg);
      if (counts.users === undefined) throw new BackupError('The restored database has no users table: this is not a Bankwright database.');
      return { dataDir, counts, ...(movedAside ? { movedAside } : {}) };
    } finally {
      await pg.close();
    }
  } finally {
    lock.release();
  }
}

export interface ScheduledBackupOptions {
  /** Minutes between backups (BACKUP_INTERVAL_MINUTES); 0 or undefined turns scheduled backups off. */
  intervalMinutes?: number;
  /** Where backups go (BACKUP_DIR). */
  dir: string;
  /** How many backup files to keep (BACKUP_KEEP, default 14); older ones are deleted. */
  keep?: number;
  now?: () => Date;
  log?: (line: string) => void;
}

const BACKUP_NAME = /^bankwright-\d{8}T\d{6}Z\.tar\.gz$/;

export function backupFileName(at: Date): string {
  const s = at.toISOString().replace(/[-:]/g, '').replace(/\.\d{3}Z$/, 'Z');
  return `bankwright-${s}.tar.gz`;
}

/** Delete all but the newest `keep` backup files in `dir` (only files this module names). */
export function pruneBackups(dir: string, keep: number): string[] {
  const files = fs.readdirSync(dir).filter((f) => BACKUP_NAME.test(f)).sort();
  const drop = files.slice(0, Math.max(0, files.length - keep));
  for (const f of drop) fs.rmSync(path.join(dir, f), { force: true });
  return drop;
}

export interface ScheduledBackups {
  /** Take one backup now (also what the timer calls). */
  runOnce(): Promise<SnapshotInfo>;
  stop(): void;
}

/**
 * Scheduled backups inside the server process, which owns the data dir. `pg` is the live PGlite
 * instance (for the app's `Database` with kind 'pglite': `(database.db as any).$client`).
 * Backups never overlap; a failed one is logged and the schedule continues.
 */
export function startScheduledBackups(pg: PgliteLike, o: ScheduledBackupOptions): ScheduledBackups {
  const keep = o.keep ?? 14;
  const now = o.now ?? (() => new Date());
  const log = o.log ?? ((line: string) => console.log(line));
  let running: Promise<SnapshotInfo> | null = null;

  async function runOnce(): Promise<SnapshotInfo> {
    if (running) return running;
    running = (async () => {
      fs.mkdirSync(o.dir, { recursive: true });
      const info = await writeSnapshot(pg, path.join(o.dir, backupFileName(now())));
      pruneBackups(o.dir, keep);
      log(`[backup] wrote ${info.file} (${(info.bytes / 1024).toFixed(0)} KiB)`);
      return info;
    })();
    try {
      return await running;
    } finally {
      running = null;
    }
  }

  let timer: NodeJS.Timeout | undefined;
  if (o.intervalMinutes && o.intervalMinutes > 0) {
    timer = setInterval(() => {
      runOnce().catch((err) => log(`[backup] FAILED: ${(err as Error).message}`));
    }, o.intervalMinutes * 60_000);
    timer.unref();
  }
  return {
    runOnce,
    stop() {
      if (timer) clearInterval(timer);
    },
  };
}

/** Reads BACKUP_INTERVAL_MINUTES, BACKUP_DIR and BACKUP_KEEP; null when scheduled backups are off. */
export function scheduledBackupConfig(env: NodeJS.ProcessEnv, dataDir: string): ScheduledBackupOptions | null {
  const raw = env.BACKUP_INTERVAL_MINUTES;
  if (raw === undefined || raw === '' || raw === '0') return null;
  const minutes = Number(raw);
  if (!Number.isFinite(minutes) || minutes < 1 || minutes > 7 * 24 * 60) {
    throw new BackupError('BACKUP_INTERVAL_MINUTES must be a number of minutes from 1 to 10080 (or 0 for off).');
  }
  const keepRaw = env.BACKUP_KEEP;
  const keep = keepRaw === undefined || keepRaw === '' ? 14 : Number(keepRaw);
  if (!Number.isInteger(keep) || keep < 1) throw new BackupError('BACKUP_KEEP must be a whole number of at least 1.');
  const dir = env.BACKUP_DIR ? path.resolve(env.BACKUP_DIR) : path.join(dataDir, 'backups');
  if (path.resolve(dir) === path.resolve(pgliteDir(dataDir)) || path.resolve(dir).startsWith(path.resolve(pgliteDir(dataDir)) + path.sep)) {
    throw new BackupError('BACKUP_DIR must not be inside DATA_DIR/pglite.');
  }
  return { intervalMinutes: minutes, dir, keep };
}
