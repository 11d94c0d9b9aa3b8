/**
 * npm run db:restore -- FILE [--force]
 *
 * Restores a backup written by `npm run db:backup` (or by the server's scheduled backups) into DATA_DIR
 * (default ./data). DATA_DIR must be empty or new; with --force an existing database is moved aside to
 * DATA_DIR/pglite.before-restore-<time> (kept, not deleted). The restored database is opened and its
 * rows counted before the command reports success. Refuses while a server owns DATA_DIR.
 */
import path from 'node:path';
import { BackupError, restoreBackup } from '../server/db/pglite-backup';

function usage(): never {
  process.stderr.write('usage: npm run db:restore -- FILE [--force]   (DATA_DIR selects the target, default ./data)\n');
  process.exit(2);
}

const args = process.argv.slice(2);
const force = args.includes('--force');
const files = args.filter((a) => a !== '--force');
if (files.length !== 1 || files[0].startsWith('--')) usage();

if (process.env.DATABASE_URL) {
  process.stderr.write('DATABASE_URL is set: restore a PostgreSQL server with pg_restore/psql, not with this command.\n');
  process.exit(1);
}

const dataDir = path.resolve(process.env.DATA_DIR || './data');
try {
  const info = await restoreBackup(path.resolve(files[0]), dataDir, { force });
  const rows = Object.entries(info.counts).map(([t, n]) => `${t} ${n}`).join(', ');
  if (info.movedAside) process.stdout.write(`Moved the previous database aside to ${info.movedAside}.\n`);
  process.stdout.write(`Restored ${files[0]} into ${dataDir}; the database opens (${rows}).\n`);
} catch (err) {
  process.stderr.write(`\n${err instanceof BackupError ? err.message : `Restore failed: ${(err as Error).message}`}\n\n`);
  process.exit(1);
}
