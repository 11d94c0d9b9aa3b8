/**
 * Scheduled backups inside the server process (PGlite only): every `intervalMinutes` a snapshot through
 * server/db/pglite-backup.ts (CHECKPOINT, PGlite's data-dir tarball, temp file + fsync + rename, the
 * newest `keep` files kept). The timer lives here so the server can stop it on shutdown and wait for a
 * backup in progress to finish before the database closes under it.
 */
import { startScheduledBackups, type PgliteLike, type SnapshotInfo } from './pglite-backup';

export interface BackupSchedule {
  intervalMinutes: number;
  dir: string;
  keep: number;
}

export interface RunningBackups {
  /** Take a backup now (joins one already in progress). */
  runOnce(): Promise<SnapshotInfo>;
  /** Stops the timer and waits for a backup in progress. */
  stop(): Promise<void>;
}

export function scheduleBackups(
  pg: PgliteLike,
  schedule: BackupSchedule,
  options: { intervalMs?: number; log?: (line: string) => void } = {},
): RunningBackups {
  const log = options.log ?? ((line: string) => console.log(line));
  // The library's own timer is left off (intervalMinutes 0): this module owns the schedule.
  const backups = startScheduledBackups(pg, { dir: schedule.dir, keep: schedule.keep, intervalMinutes: 0, log });
  let inFlight: Promise<unknown> | null = null;
  let stopped = false;
  const runOnce = () => {
    const p = backups.runOnce();
    const settled = p.then(
      () => {},
      () => {},
    );
    inFlight = settled;
    void settled.then(() => {
      if (inFlight === settled) inFlight = null;
    });
    return p;
  };
  const timer = setInterval(() => {
    if (stopped) return;
    runOnce().catch((err) => log(`[backup] FAILED: ${(err as Error).message}`));
  }, options.intervalMs ?? schedule.intervalMinutes * 60_000);
  timer.unref();
  return {
    runOnce,
    async stop() {
      stopped = true;
      clearInterval(timer);
      await inFlight;
    },
  };
}
