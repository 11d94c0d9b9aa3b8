/**
 * Runs the server: configuration from the environment, the data-dir lock (PGlite), migrations, the
 * demo seed, mail, the app, and a clean shutdown on SIGINT/SIGTERM (server closed, database closed,
 * lock released). `npx tsx server/index.ts` runs it directly (serving dist/client when it is built);
 * server/start.ts and server/dev.ts call runServer with their own client serving.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { createApp, type ClientServing } from './app';
import { ConfigError, loadConfig, type Config } from './config';
import { openDatabase, type Database } from './db/client';
import { acquireDataDirLock, DataDirLockedError, type DataDirLock } from './db/lock';
import { DEMO_ACCOUNTS, seedDemo } from './db/demo-data';
import { createMailer } from './mail/mailer';
import { createSessions } from './auth/sessions';
import { analysisPool } from './services/analysis-pool';
import { scheduleBackups, type RunningBackups } from './db/backups';
import { createLogger, setProcessLogger } from './http/logger';

export const ROOT_DIR = fileURLToPath(new URL('..', import.meta.url));
export const CLIENT_DIST_DIR = path.join(ROOT_DIR, 'dist', 'client');

export interface RunOptions {
  /** Builds the client serving once the config is known (dev.ts starts Vite here). */
  client?: (config: Config) => Promise<ClientServing | undefined> | ClientServing | undefined;
  /** Called during shutdown, before the database closes. */
  onShutdown?: () => Promise<void>;
}

function fail(message: string): never {
  console.error(`\n${message}\n`);
  process.exit(1);
}

export async function runServer(options: RunOptions = {}) {
  let config: Config;
  try {
    config = loadConfig();
  } catch (err) {
    if (err instanceof ConfigError) fail(err.message);
    throw err;
  }

  let lock: DataDirLock | undefined;
  if (!config.databaseUrl) {
    try {
      lock = acquireDataDirLock(config.dataDir);
    } catch (err) {
      if (err instanceof DataDirLockedError) fail(err.message);
      throw err;
    }
  }

  let database: Database;
  try {
    console.log(config.databaseUrl ? 'Connecting to PostgreSQL…' : `Opening the embedded database in ${config.dataDir} …`);
    database = await openDatabase(config);
  } catch (err) {
    lock?.release();
    fail(`Could not open the database: ${(err as Error).message}`);
  }
  const { db } = database;
  // The analysis workers load the electrical core while the database seeds and the listener starts.
  const analysis = analysisPool(config.analysis);
  analysis.warm();

  const seeded = config.demo ? await seedDemo(db, config.demoPassword) : false;
  if (seeded) console.log('Seeded the demo team "Kestrel Bay Energy Works".');

  const mailer = createMailer({ db, smtpUrl: config.smtpUrl });
  const client = await options.client?.(config);
  // Structured JSON logs on stdout at LOG_LEVEL (server/http/logger.ts); the lines above and below are the start-up banner.
  const logger = createLogger(config.logLevel);
  setProcessLogger(logger);
  const app = createApp({ db, mailer, config, client, analysis, logger });

  const server = app.listen(config.port);
  await new Promise<void>((resolve) => {
    server.once('listening', resolve);
    server.once('error', async (err: NodeJS.ErrnoException) => {
      await database.close();
      lock?.release();
      fail(err.code === 'EADDRINUSE' ? `Port ${config.port} is already in use. Set PORT to another port.` : `Could not listen: ${err.message}`);
    });
  });

  // Expired sessions are removed hourly (validation already refuses them).
  const sessions = createSessions(db);
  const sweep = setInterval(() => sessions.deleteExpiredSessions().catch(() => {}), 60 * 60 * 1000);
  sweep.unref();

  // Scheduled backups of the embedded database (BACKUP_INTERVAL_MINUTES); PostgreSQL has its own tools.
  let backups: RunningBackups | undefined;
  if (config.backups && database.pglite) {
    backups = scheduleBackups(database.pglite, config.backups);
    console.log(`  backups: every ${config.backups.intervalMinutes} min into ${config.backups.dir}, keeping ${config.backups.keep}`);
  }

  let stopping = false;
  async function shutdown(signal: string) {
    if (stopping) return;
    stopping = true;
    console.log(`\n${signal}: stopping…`);
    clearInterval(sweep);
    const backupsStopped = backups?.stop();
    const forced = setTimeout(() => server.closeAllConnections(), 5000);
    forced.unref();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    try {
      await options.onShutdown?.();
      await mailer.close();
      await analysis.close();
      // A backup in progress finishes before the database closes under it.
      await backupsStopped;
      await database.close();
    } finally {
      lock?.release();
    }
    console.log('Stopped.');
    process.exit(0);
  }
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));

  const port = (server.address() as AddressInfo).port;
  console.log(`\nBankwright is running at ${config.appOrigin === `http://localhost:${config.port}` ? `http://localhost:${port}` : config.appOrigin}`);
  console.log(`  database: ${database.kind} (${database.location})`);
  console.log(`  mail: ${mailer.mode === 'smtp' ? 'SMTP' : 'local outbox (owners read it in the app)'}`);
  if (config.demo) {
    console.log(`  demo accounts (password "${config.demoPassword}"):`);
    for (const a of DEMO_ACCOUNTS) console.log(`    ${a.email.padEnd(22)} ${a.role}`);
  }
  return { server, config, database, backups };
}

const isMain = process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href;
if (isMain) {
  await runServer({
    client: () => (fs.existsSync(path.join(CLIENT_DIST_DIR, 'index.html')) ? { mode: 'static', dir: CLIENT_DIST_DIR } : undefined),
  });
}
