import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { afterEach, describe, expect, it } from 'vitest';
import { acquireDataDirLock, DataDirLockedError, LOCK_FILE } from '../../../server/db/lock';

const dirs: string[] = [];
const children: ChildProcess[] = [];
function tempDir(): string {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-lock-'));
  dirs.push(d);
  return d;
}
afterEach(() => {
  for (const c of children.splice(0)) c.kill('SIGKILL');
  for (const d of dirs.splice(0)) fs.rmSync(d, { recursive: true, force: true });
});

/** A live process that is not this one: a sleeping node child. */
function liveOtherProcess(): number {
  const child = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 60000)'], { stdio: 'ignore' });
  children.push(child);
  return child.pid!;
}

/** The pid of a process that has already exited. */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(r.stdout);
}

describe('data dir lock', () => {
  it('writes the owner pid into DATA_DIR/bankwright.lock and removes it on release', () => {
    const dir = tempDir();
    const lock = acquireDataDirLock(dir);
    expect(lock.path).toBe(path.join(dir, LOCK_FILE));
    expect(fs.readFileSync(lock.path, 'utf8').trim()).toBe(String(process.pid));
    lock.release();
    expect(fs.existsSync(lock.path)).toBe(false);
  });

  it('refuses a second owner while the first is alive, naming its pid', () => {
    const dir = tempDir();
    const other = liveOtherProcess();
    acquireDataDirLock(dir, other);
    let error: unknown;
    try {
      acquireDataDirLock(dir);
    } catch (err) {
      error = err;
    }
    expect(error).toBeInstanceOf(DataDirLockedError);
    expect((error as DataDirLockedError).ownerPid).toBe(other);
    expect((error as Error).message).toContain(`pid ${other}`);
    expect(fs.readFileSync(path.join(dir, LOCK_FILE), 'utf8').trim()).toBe(String(other));
  });

  it('takes over a stale lock whose pid is no longer running', () => {
    const dir = tempDir();
    const dead = deadPid();
    fs.writeFileSync(path.join(dir, LOCK_FILE), `${dead}\n`);
    const lock = acquireDataDirLock(dir);
    expect(fs.readFileSync(lock.path, 'utf8').trim()).toBe(String(process.pid));
    lock.release();
  });

  it('takes over a lock file with garbage in it', () => {
    const dir = tempDir();
    fs.writeFileSync(path.join(dir, LOCK_FILE), 'not a pid');
    const lock = acquireDataDirLock(dir);
    expect(fs.readFileSync(lock.path, 'utf8').trim()).toBe(String(process.pid));
  });

  it('does not delete a lock that another process has taken since', () => {
    const dir = tempDir();
    const lock = acquireDataDirLock(dir);
    const other = liveOtherProcess();
    fs.writeFileSync(lock.path, `${other}\n`);
    lock.release();
    expect(fs.readFileSync(lock.path, 'utf8').trim()).toBe(String(other));
  });

  it('makes a second server process on the same DATA_DIR exit non-zero with a clear message', () => {
    const dir = tempDir();
    const lock = acquireDataDirLock(dir);
    try {
      const tsx = path.resolve('node_modules/.bin/tsx');
      const r = spawnSync(tsx, ['server/index.ts'], {
        env: { ...process.env, DATA_DIR: dir, PORT: '3999', DATABASE_URL: '' },
        encoding: 'utf8',
        timeout: 30_000,
      });
      expect(r.status).toBe(1);
      expect(r.stderr).toContain('in use by another Bankwright process');
      expect(r.stderr).toContain(`pid ${process.pid}`);
    } finally {
      lock.release();
    }
  });
});
