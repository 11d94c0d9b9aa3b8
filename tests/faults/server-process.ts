/**
 * Helpers for the fault and load harnesses: run the real server as a child process on 127.0.0.1
 * (`node --import tsx server/index.ts`, so the pid we signal is the server's own), a throwaway PostgreSQL
 * server like .ci/run starts, HTTP with a cookie jar per client, and percentiles.
 */
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import pg from 'pg';

/** The source tree to run (BW_ROOT overrides it, e.g. a snapshot copy while others edit this one). */
export const ROOT = process.env.BW_ROOT ? path.resolve(process.env.BW_ROOT) : path.resolve(import.meta.dirname, '../..');

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export interface ServerOptions {
  port: number;
  dataDir: string;
  databaseUrl?: string;
  env?: Record<string, string>;
  logFile: string;
}

export interface ServerProcess {
  child: ChildProcess;
  pid: number;
  base: string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

/** Starts the server and waits until /api/health answers (or the process exits, or timeoutMs passes). */
export async function startServer(o: ServerOptions, timeoutMs = 90_000): Promise<ServerProcess> {
  const log = fs.openSync(o.logFile, 'a');
  // BW_SERVER_NODE_ARGS: extra node flags for the server, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof" to profile a run.
  const nodeArgs = (process.env.BW_SERVER_NODE_ARGS ?? '').split(' ').filter(Boolean);
  const child = spawn(process.execPath, [...nodeArgs, '--import', 'tsx', 'server/index.ts'], {
    cwd: ROOT,
    env: {
      ...process.env,
      NODE_ENV: 'production',
      PORT: String(o.port),
      DATA_DIR: o.dataDir,
      DATABASE_URL: o.databaseUrl ?? '',
      APP_ORIGIN: `http://127.0.0.1:${o.port}`,
      DEMO: '1',
      SMTP_URL: '',
      ...o.env,
    },
    stdio: ['ignore', log, log],
  });
  fs.closeSync(log);
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.once('exit', (code, signal) => resolve({ code, signal })));
  const base = `http://127.0.0.1:${o.port}`;
  let done = false;
  exited.then(() => (done = true));
  const started = Date.now();
  while (!done) {
    try {
      const res = await fetch(`${base}/api/health`, { signal: AbortSignal.timeout(1000) });
      if (res.ok) return { child, pid: child.pid!, base, exited };
    } catch {
      // not listening yet
    }
    if (Date.now() - started > timeoutMs) {
      child.kill('SIGKILL');
      throw new Error(`server did not answer /api/health within ${timeoutMs} ms (log: ${o.logFile})`);
    }
    await sleep(100);
  }
  const { code, signal } = await exited;
  throw new Error(`server exited (code ${code}, signal ${signal}) before answering; log: ${o.logFile}\n${tail(o.logFile)}`);
}

export function tail(file: string, lines = 15): string {
  try {
    return fs.readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '';
  }
}

export async function stopServer(s: ServerProcess, signal: NodeJS.Signals = 'SIGTERM') {
  s.child.kill(signal);
  return s.exited;
}

export interface Postgres {
  /** Admin URL (database "postgres"). */
  adminUrl: string;
  stop(): void;
}

/** A throwaway PostgreSQL server on 127.0.0.1 (as root: initdb as the postgres user), like .ci/run. */
export async function startPostgres(): Promise<Postgres> {
  const bins = fs.readdirSync('/usr/lib/postgresql').sort((a, b) => Number(a) - Number(b));
  if (bins.length === 0) throw new Error('PostgreSQL is not installed (/usr/lib/postgresql)');
  const bin = `/usr/lib/postgresql/${bins[bins.length - 1]}/bin`;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-pg-'));
  const port = await freePort();
  const asPg = (cmd: string, args: string[]) => {
    const r = spawnSync('runuser', ['-u', 'postgres', '--', `${bin}/${cmd}`, ...args], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`${cmd} failed: ${r.stderr || r.stdout}`);
  };
  spawnSync('chown', ['postgres:postgres', dir]);
  asPg('initdb', ['-D', `${dir}/data`, '-A', 'trust', '-U', 'postgres']);
  asPg('pg_ctl', ['-D', `${dir}/data`, '-l', `${dir}/log`, '-o', `-c listen_addresses=127.0.0.1 -p ${port} -k ${dir} -c max_connections=200`, '-w', 'start']);
  return {
    adminUrl: `postgres://postgres@127.0.0.1:${port}/postgres`,
    stop() {
      spawnSync('runuser', ['-u', 'postgres', '--', `${bin}/pg_ctl`, '-D', `${dir}/data`, '-m', 'fast', 'stop'], { encoding: 'utf8' });
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A fresh database on a PostgreSQL server given by its admin URL; returns its URL. */
export async function createDatabase(adminUrl: string, prefix: string): Promise<{ url: string; drop(): Promise<void> }> {
  const name = `${prefix}_${randomBytes(5).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  await admin.query(`CREATE DATABASE ${name}`);
  await admin.end();
  const u = new URL(adminUrl);
  u.pathname = `/${name}`;
  return {
    url: u.toString(),
    async drop() {
      const c = new pg.Client({ connectionString: adminUrl });
      await c.connect();
      await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await c.end();
    },
  };
}

/** A minimal HTTP client with one session cookie, sending the app's Origin on mutations. */
export class Client {
  cookie = '';
  constructor(
    public base: string,
    readonly origin: string,
  ) {}

  async request(method: string, url: string, body?: unknown, timeoutMs = 15_000): Promise<{ status: number; body: any; ms: number }> {
    const t0 = performance.now();
    const res = await fetch(`${this.base}${url}`, {
      method,
      headers: {
        ...(this.cookie ? { cookie: this.cookie } : {}),
        ...(method !== 'GET' ? { origin: this.origin } : {}),
        ...(body !== undefined ? { 'content-type': 'application/json' } : {}),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: AbortSignal.timeout(timeoutMs),
    });
    const set = res.headers.getSetCookie().find((c) => c.startsWith('bw_session='));
    if (set) this.cookie = set.split(';')[0];
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      // not JSON
    }
    return { status: res.status, body: parsed, ms: performance.now() - t0 };
  }

  async signIn(email: string, password: string) {
    const r = await this.request('POST', '/api/auth/sign-in', { email, password });
    if (r.status !== 200) throw new Error(`sign-in as ${email}: ${r.status} ${JSON.stringify(r.body)}`);
  }
}

export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i];
}

/** Canonical JSON (keys sorted at every level) and its SHA-256, as the server computes contentHash. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  const keys = Object.keys(value).filter((k) => (value as Record<string, unknown>)[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`).join(',')}}`;
}
export const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');
export const contentHashOf = (doc: unknown) => sha256(canonicalJson(doc));

export const NO_ROUTE = (r: { status: number; body: any }) => r.status === 404 && r.body?.error?.message === 'No such API route.';
