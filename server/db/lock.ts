/**
 * One process owns a PGlite data dir. PGlite takes no lock of its own and two processes on one
 * data dir corrupt it, so we take DATA_DIR/bankwright.lock (created with the `wx` flag, holding the
 * owner's pid). A lock whose pid is no longer running is stale and is taken over.
 */
import fs from 'node:fs';
import path from 'node:path';

export const LOCK_FILE = 'bankwright.lock';

export class DataDirLockedError extends Error {
  constructor(
    readonly lockPath: string,
    readonly ownerPid: number,
  ) {
    super(
      `The data directory is in use by another Bankwright process (pid ${ownerPid}).\n` +
        `  lock file: ${lockPath}\n` +
        `Stop that process first, or start this one with a different DATA_DIR.`,
    );
  }
}

function isRunning(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    // EPERM: the process exists but belongs to someone else.
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

export interface DataDirLock {
  path: string;
  release(): void;
}

export function acquireDataDirLock(dataDir: string, pid: number = process.pid): DataDirLock {
  fs.mkdirSync(dataDir, { recursive: true });
  const lockPath = path.join(dataDir, LOCK_FILE);
  for (let attempt = 0; attempt < 3; attempt++) {
    try {
      fs.writeFileSync(lockPath, `${pid}\n`, { flag: 'wx' });
      let released = false;
      return {
        path: lockPath,
        release() {
          if (released) return;
          released = true;
          try {
            if (fs.readFileSync(lockPath, 'utf8').trim() === String(pid)) fs.unlinkSync(lockPath);
          } catch {
            // already gone
          }
        },
      };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    }
    let ownerPid = NaN;
    try {
      ownerPid = Number.parseInt(fs.readFileSync(lockPath, 'utf8').trim(), 10);
    } catch {
      continue; // removed in between: try again
    }
    if (ownerPid !== pid && isRunning(ownerPid)) throw new DataDirLockedError(lockPath, ownerPid);
    // Stale (owner is dead, or the file is unreadable garbage): take it over.
    try {
      fs.unlinkSync(lockPath);
    } catch {
      // someone else removed it first
    }
  }
  throw new Error(`Could not take the data directory lock ${lockPath}`);
}
