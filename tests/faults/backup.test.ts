/**
 * Embedded-database backup and restore (server/db/pglite-backup.ts, npm run db:backup / db:restore):
 * round trips on temporary data dirs, refusal while another process owns the data dir, refusal to
 * overwrite, and the scheduled backups the server process can run on its own live database.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { spawnSync } from 'node:child_process';
import { afterAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { PGlite } from '@electric-sql/pglite';
import { openPglite } from '../../server/db/client';
import { diagrams, projects, teams } from '../../server/db/schema';
import { seedDemo } from '../../server/db/demo-data';
import { LOCK_FILE } from '../../server/db/lock';
import {
  BackupError, backupDataDir, backupFileName, pruneBackups, restoreBackup, scheduledBackupConfig, startScheduledBackups,
} from '../../server/db/pglite-backup';

const temps: string[] = [];
function tempDir(): string {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-backup-'));
  temps.push(d);
  return d;
}
afterAll(() => {
  for (const d of temps) fs.rmSync(d, { recursive: true, force: true });
});

const DOC = { formatVersion: 1, parts: [{ id: 'b1', note: 'ünïcödé ✓' }], cables: [] };

/** A migrated, seeded data dir with one extra project holding a known diagram document (built once, then copied). */
let template: string | undefined;
async function seededDataDir(): Promise<{ dir: string; projectId: string }> {
  template ??= await buildSeededDataDir();
  const dir = tempDir();
  fs.cpSync(template, dir, { recursive: true });
  return { dir, projectId: 'backup-check-project' };
}

async function buildSeededDataDir(): Promise<string> {
  const dir = tempDir();
  const projectId = 'backup-check-project';
  const database = await openPglite(dir);
  try {
    await seedDemo(database.db, 'bankwright-demo');
    const [team] = await database.db.select().from(teams);
    await database.db.insert(projects).values({ id: projectId, teamId: team.id, name: 'Backup check' });
    await database.db.insert(diagrams).values({ id: 'backup-check-diagram', projectId, name: 'Known document', content: DOC });
  } finally {
    await database.close();
  }
  return dir;
}

describe('offline backup and restore', () => {
  it('round-trips a data dir: the restored database opens with the same rows and documents', async () => {
    const { dir, projectId } = await seededDataDir();
    const file = path.join(tempDir(), 'snap.tar.gz');
    const info = await backupDataDir(dir, file);
    expect(fs.statSync(file).size).toBe(info.bytes);
    // The demo seed (five accounts, one team, three projects, four diagrams) plus one project and diagram of this test.
    expect(info.counts).toMatchObject({ users: 5, teams: 1, projects: 4, diagrams: 5 });
    expect(fs.existsSync(path.join(dir, LOCK_FILE))).toBe(false); // the backup released its lock

    const target = tempDir();
    const restored = await restoreBackup(file, target);
    expect(restored.counts).toEqual(info.counts);
    const reopened = await openPglite(target);
    try {
      const [p] = await reopened.db.select().from(projects).where(eq(projects.id, projectId));
      expect(p.name).toBe('Backup check');
      const [d] = await reopened.db.select().from(diagrams).where(eq(diagrams.id, 'backup-check-diagram'));
      expect(d.content).toEqual(DOC);
    } finally {
      await reopened.close();
    }
  });

  it('refuses while another live process owns the data dir, naming its pid, and leaves its lock alone', async () => {
    const { dir } = await seededDataDir();
    const otherPid = process.ppid; // alive, and not us
    fs.writeFileSync(path.join(dir, LOCK_FILE), `${otherPid}\n`);
    await expect(backupDataDir(dir, path.join(tempDir(), 'x.tar.gz'))).rejects.toThrow(`a Bankwright server (pid ${otherPid}) owns`);
    expect(fs.readFileSync(path.join(dir, LOCK_FILE), 'utf8').trim()).toBe(String(otherPid));
    await expect(restoreBackup(__filename, dir)).rejects.toThrow(BackupError);
  });

  it('the CLI exits 1 with the explanation while the data dir is owned', () => {
    const dir = tempDir();
    fs.mkdirSync(path.join(dir, 'pglite'));
    fs.writeFileSync(path.join(dir, 'pglite', 'PG_VERSION'), '18\n');
    fs.writeFileSync(path.join(dir, LOCK_FILE), `${process.ppid}\n`);
    const r = spawnSync(path.resolve('node_modules/.bin/tsx'), ['scripts/db-backup.ts', '--out', path.join(dir, 'b.tar.gz')], {
      env: { ...process.env, DATA_DIR: dir, DATABASE_URL: '' },
      encoding: 'utf8',
      timeout: 30_000,
    });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`pid ${process.ppid}`);
    expect(r.stderr).toContain('BACKUP_INTERVAL_MINUTES');
    expect(fs.existsSync(path.join(dir, 'b.tar.gz'))).toBe(false);
  });

  it('refuses to restore over an existing database without --force; with it, moves the old one aside', async () => {
    const a = await seededDataDir();
    const file = path.join(tempDir(), 'a.tar.gz');
    await backupDataDir(a.dir, file);
    const b = await seededDataDir();
    await expect(restoreBackup(file, b.dir)).rejects.toThrow('already holds a database');
    const r = await restoreBackup(file, b.dir, { force: true, now: new Date('2026-01-02T03:04:05Z') });
    expect(r.movedAside).toBe(path.join(b.dir, 'pglite.before-restore-2026-01-02T03-04-05-000Z'));
    expect(fs.existsSync(path.join(r.movedAside!, 'PG_VERSION'))).toBe(true);
  });

  it('refuses a file that is not a backup, and a data dir with no database', async () => {
    const junk = path.join(tempDir(), 'junk.tar.gz');
    fs.writeFileSync(junk, 'not a tarball at all');
    await expect(restoreBackup(junk, tempDir())).rejects.toThrow('is not a Bankwright backup');
    await expect(backupDataDir(tempDir(), path.join(tempDir(), 'x.tar.gz'))).rejects.toThrow('There is no embedded database');
  });
});

describe('scheduled backups in the server process', () => {
  it('snapshots the live database the process owns; later writes are not in that snapshot', async () => {
    const { dir } = await seededDataDir();
    const live = await openPglite(dir);
    const backups = tempDir();
    try {
      const client = (live.db as unknown as { $client: PGlite }).$client;
      const lines: string[] = [];
      const sched = startScheduledBackups(client, { dir: backups, keep: 3, now: () => new Date('2026-05-06T07:08:09Z'), log: (l) => lines.push(l) });
      const info = await sched.runOnce();
      sched.stop();
      expect(path.basename(info.file)).toBe('bankwright-20260506T070809Z.tar.gz');
      expect(lines[0]).toContain('[backup] wrote');
      const [team] = await live.db.select().from(teams);
      await live.db.insert(projects).values({ id: 'after-snapshot', teamId: team.id, name: 'Written after the snapshot' });

      const target = tempDir();
      const restored = await restoreBackup(info.file, target);
      expect(restored.counts.projects).toBe(4);
      const reopened = await openPglite(target);
      try {
        expect(await reopened.db.select().from(projects).where(eq(projects.id, 'after-snapshot'))).toHaveLength(0);
        expect(await reopened.db.select().from(projects).where(eq(projects.id, 'backup-check-project'))).toHaveLength(1);
      } finally {
        await reopened.close();
      }
    } finally {
      await live.close();
    }
  });

  it('keeps only the newest N backup files, touching no other file', () => {
    const dir = tempDir();
    const names = ['2026-01-01T00:00:00Z', '2026-01-02T00:00:00Z', '2026-01-03T00:00:00Z', '2026-01-04T00:00:00Z'].map((t) => backupFileName(new Date(t)));
    for (const n of names) fs.writeFileSync(path.join(dir, n), 'x');
    fs.writeFileSync(path.join(dir, 'notes.txt'), 'keep me');
    expect(pruneBackups(dir, 2)).toEqual(names.slice(0, 2));
    expect(fs.readdirSync(dir).sort()).toEqual([...names.slice(2), 'notes.txt'].sort());
  });

  it('reads BACKUP_INTERVAL_MINUTES, BACKUP_DIR and BACKUP_KEEP, refusing bad values', () => {
    expect(scheduledBackupConfig({}, '/srv/data')).toBeNull();
    expect(scheduledBackupConfig({ BACKUP_INTERVAL_MINUTES: '0' }, '/srv/data')).toBeNull();
    expect(scheduledBackupConfig({ BACKUP_INTERVAL_MINUTES: '60' }, '/srv/data')).toEqual({ intervalMinutes: 60, dir: '/srv/data/backups', keep: 14 });
    expect(scheduledBackupConfig({ BACKUP_INTERVAL_MINUTES: '15', BACKUP_DIR: '/mnt/usb/bw', BACKUP_KEEP: '96' }, '/srv/data')).toEqual({
      intervalMinutes: 15, dir: '/mnt/usb/bw', keep: 96,
    });
    expect(() => scheduledBackupConfig({ BACKUP_INTERVAL_MINUTES: 'hourly' }, '/srv/data')).toThrow('BACKUP_INTERVAL_MINUTES');
    expect(() => scheduledBackupConfig({ BACKUP_INTERVAL_MINUTES: '60', BACKUP_KEEP: '0' }, '/srv/data')).toThrow('BACKUP_KEEP');
    expect(() => scheduledBackupConfig({ BACKUP_INTERVAL_MINUTES: '60', BACKUP_DIR: '/srv/data/pglite/b' }, '/srv/data')).toThrow('inside DATA_DIR/pglite');
  });
});
