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
      // Uploads: 20 MB per file on local disk under DATA_DIR unless S3_BUCKET is set (README).
      uploadMaxBytes: 20 * 1024 * 1024,
      storage: { kind: 'local' },
    });
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
