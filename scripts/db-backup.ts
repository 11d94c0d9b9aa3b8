/**
 * npm run db:backup [-- --out FILE]
 *
 * Writes a consistent snapshot of the embedded database in DATA_DIR (default ./data) to FILE (default
 * ./backups/bankwright-<UTC time>.tar.gz). Takes the data-dir lock, so it refuses while a server owns
 * DATA_DIR: stop the server first, or run the server with BACKUP_INTERVAL_MINUTES for scheduled backups.
 * With DATABASE_URL set there is nothing to do here: use pg_dump on that server.
 */
import path from 'node:path';
import { BackupError, backupDataDir, backupFileName } from '../server/db/pglite-backup';

function usage(): never {
  process.stderr.write('usage: npm run db:backup [-- --out FILE]   (DATA_DIR selects the data directory, default ./data)\n');
  process.exit(2);
}

const args = process.argv.slice(2);
let out: string | undefined;
for (let i = 0; i < args.length; i++) {
  if (args[i] === '--out' && args[i + 1]) out = args[++i];
  else if (args[i].startsWith('--out=')) out = args[i].slice(6);
  else usage();
}

if (process.env.DATABASE_URL) {
  process.stderr.write('DATABASE_URL is set: the data is in that PostgreSQL server. Back it up with pg_dump (or your provider\'s backups).\n');
  process.exit(1);
}

const dataDir = path.resolve(process.env.DATA_DIR || './data');
const file = path.resolve(out ?? path.join('backups', backupFileName(new Date())));
try {
  const info = await backupDataDir(dataDir, file);
  const rows = Object.entries(info.counts).map(([t, n]) => `${t} ${n}`).join(', ');
  process.stdout.write(`Backed up ${dataDir} to ${info.file} (${(info.bytes / 1024).toFixed(0)} KiB; ${rows}).\n`);
} catch (err) {
  process.stderr.write(`\n${err instanceof BackupError ? err.message : `Backup failed: ${(err as Error).message}`}\n\n`);
  process.exit(1);
}
