/**
 * Scheduled backups inside the server process (server/db/backups.ts, wired in server/index.ts when on
 * PGlite): backups are written on the schedule, the newest BACKUP_KEEP are kept, and stop() waits for a
 * backup in progress so the database never closes under it. Each backup is restored and its content read.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { PGlite } from '@electric-sql/pglite';
import { restoreBackup } from '../../../server/db/pglite-backup';
import { scheduleBackups } from '../../../server/db/backups';

const dirs: string[] = [];
const tmp = (prefix: string) => {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), prefix));
  dirs.push(d);
  return d;
};
afterEach(() => {
  for (const d of dirs.splice(0)) fs.rmSync(d, { recursive: true, force: true });
});

const backupFiles = (dir: string) => (fs.existsSync(dir) ? fs.readdirSync(dir).filter((f) => f.endsWith('.tar.gz')).sort() : []);

describe('scheduled backups', () => {
  it('writes backups on the schedule, stops on stop(), and a backup restores to the data it saw', async () => {
    const dataDir = tmp('bw-sched-');
    const backupDir = path.join(dataDir, 'backups');
    const pg = await PGlite.create({ dataDir: path.join(dataDir, 'pglite') });
    await pg.exec(`create table users (id text primary key); insert into users values ('u1'), ('u2');`);
    const logs: string[] = [];
    const backups = scheduleBackups(pg, { intervalMinutes: 1, dir: backupDir, keep: 2 }, { intervalMs: 50, log: (l) => logs.push(l) });
    const started = Date.now();
    while (backupFiles(backupDir).length < 1 && Date.now() - started < 60_000) await new Promise((r) => setTimeout(r, 20));
    await backups.stop();
    const files = backupFiles(backupDir);
    expect(files.length).toBeGreaterThanOrEqual(1);
    expect(files.length).toBeLessThanOrEqual(2);
    expect(logs.some((l) => l.startsWith('[backup] wrote '))).toBe(true);
    // After stop() no further backup starts, and the database can close.
    const count = backupFiles(backupDir).length;
    await new Promise((r) => setTimeout(r, 200));
    expect(backupFiles(backupDir).length).toBe(count);
    await pg.close();

    const restoredDir = path.join(tmp('bw-restored-'), 'data');
    await restoreBackup(path.join(backupDir, files[files.length - 1]), restoredDir);
    const back = await PGlite.create({ dataDir: path.join(restoredDir, 'pglite') });
    expect((await back.query<{ id: string }>('select id from users order by id')).rows.map((r) => r.id)).toEqual(['u1', 'u2']);
    await back.close();
  });

  it('stop() waits for a backup in progress before the database is closed', async () => {
    const dataDir = tmp('bw-sched-');
    const backupDir = path.join(dataDir, 'backups');
    const pg = await PGlite.create({ dataDir: path.join(dataDir, 'pglite') });
    await pg.exec(`create table users (id text primary key); insert into users values ('u1');`);
    const backups = scheduleBackups(pg, { intervalMinutes: 60, dir: backupDir, keep: 5 }, { log: () => {} });
    const running = backups.runOnce();
    let finished = false;
    void running.then(() => (finished = true));
    await backups.stop();
    // The backup had finished when stop() returned: its file is whole and in place.
    expect(finished).toBe(true);
    expect(backupFiles(backupDir)).toHaveLength(1);
    const info = await running;
    expect(backupFiles(backupDir)).toEqual([path.basename(info.file)]);
    await pg.close();
  });
});
