import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '../../../server/config';

describe('config from env', () => {
  it('has the documented defaults', () => {
    const c = loadConfig({});
    expect(c).toEqual({
      nodeEnv: 'development',
      port: 3000,
      dataDir: path.resolve('./data'),
      databaseUrl: undefined,
      smtpUrl: undefined,
      appOrigin: 'http://localhost:3000',
      demo: true,
      demoPassword: 'bankwright-demo',
      // X-Forwarded-For is not believed unless TRUST_PROXY names the proxies in front (README).
      trustProxy: 0,
      // Uploads: 20 MB per file on local disk under DATA_DIR unless S3_BUCKET is set (README).
      uploadMaxBytes: 20 * 1024 * 1024,
      // Each team 2 GB of attached files; each person 30 uploads per 10 minutes (README).
      uploadQuota: { teamBytes: 2 * 1024 ** 3, ratePerUser: 30, rateWindowSeconds: 600 },
      // Structured logs at info outside tests (docs/decisions/014).
      logLevel: 'info',
      storage: { kind: 'local' },
      // Scheduled backups off unless BACKUP_INTERVAL_MINUTES is set (docs/decisions/006).
      backups: null,
      // Analysis workers: one per core (at most 4) when unset, 100 jobs may wait, 60 s per job.
      analysis: { workers: undefined, maxQueued: 100, timeoutMs: 60_000 },
    });
  });

  it('reads the backup schedule: BACKUP_DIR defaults to DATA_DIR/backups, BACKUP_KEEP to 14; 0 is off', () => {
    expect(loadConfig({ DATA_DIR: '/srv/bw', BACKUP_INTERVAL_MINUTES: '60' }).backups).toEqual({ intervalMinutes: 60, dir: '/srv/bw/backups', keep: 14 });
    expect(loadConfig({ BACKUP_INTERVAL_MINUTES: '15', BACKUP_DIR: '/mnt/usb/bw', BACKUP_KEEP: '3' }).backups).toEqual({ intervalMinutes: 15, dir: '/mnt/usb/bw', keep: 3 });
    expect(loadConfig({ BACKUP_INTERVAL_MINUTES: '0', BACKUP_DIR: '/mnt/usb/bw' }).backups).toBeNull();
  });

  it('refuses bad backup and analysis settings, naming each variable', () => {
    let err: unknown;
    try {
      loadConfig({ DATA_DIR: '/srv/bw', BACKUP_INTERVAL_MINUTES: '1.5', BACKUP_KEEP: '0', BACKUP_DIR: '/srv/bw/pglite/b', ANALYSIS_WORKERS: '0', ANALYSIS_QUEUE: '-1', ANALYSIS_TIMEOUT_SECONDS: 'soon' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ConfigError);
    const msg = (err as Error).message;
    for (const name of ['BACKUP_INTERVAL_MINUTES', 'BACKUP_KEEP', 'ANALYSIS_WORKERS', 'ANALYSIS_QUEUE', 'ANALYSIS_TIMEOUT_SECONDS']) expect(msg).toContain(`  ${name}:`);
    expect(() => loadConfig({ DATA_DIR: '/srv/bw', BACKUP_DIR: '/srv/bw/pglite' })).toThrow(/BACKUP_DIR: BACKUP_DIR must not be inside DATA_DIR\/pglite/);
    expect(() => loadConfig({ BACKUP_INTERVAL_MINUTES: '20000' })).toThrow(/BACKUP_INTERVAL_MINUTES/);
  });

  it('reads the analysis pool settings', () => {
    expect(loadConfig({ ANALYSIS_WORKERS: '2', ANALYSIS_QUEUE: '8', ANALYSIS_TIMEOUT_SECONDS: '12.5' }).analysis).toEqual({ workers: 2, maxQueued: 8, timeoutMs: 12_500 });
  });

  it('derives APP_ORIGIN from PORT and reads DEMO=0', () => {
    const c = loadConfig({ PORT: '3100', DEMO: '0', APP_ORIGIN: '' });
    expect(c.appOrigin).toBe('http://localhost:3100');
    expect(c.demo).toBe(false);
  });

  it('normalises APP_ORIGIN to an origin', () => {
    expect(loadConfig({ APP_ORIGIN: 'https://bankwright.example.com/app/' }).appOrigin).toBe('https://bankwright.example.com');
  });

  it('names every bad variable in one message', () => {
    let err: unknown;
    try {
      loadConfig({ PORT: 'eighty', DATABASE_URL: 'mysql://x', DEMO: 'yes', SMTP_URL: 'http://mail', APP_ORIGIN: 'ftp://x' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ConfigError);
    const msg = (err as Error).message;
    for (const name of ['PORT', 'DATABASE_URL', 'DEMO', 'SMTP_URL', 'APP_ORIGIN']) expect(msg).toContain(`  ${name}:`);
  });
});
