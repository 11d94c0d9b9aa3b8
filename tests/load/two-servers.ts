/**
 * npx tsx tests/load/two-servers.ts [--users N] [--users-seconds S] [--reads-seconds S] [--json FILE]
 *
 * Two app servers on one PostgreSQL database (the documented way to run several; docs/decisions/013):
 * DATABASE_URL as an admin URL if set (CI passes its server), else a throwaway server like .ci/run's.
 * Shows, and fails (exit 1) unless:
 *   1. sessions   a session signed out on server A answers 401 on server B at once, although B validated
 *                 it a moment before (no per-process session cache on a shared database);
 *   2. limiter    five wrong passwords on A lock that account for that address on B (429 with the right
 *                 password); a device cookie issued by A is honoured by B, so the owner's browser still
 *                 signs in there;
 *   3. users      the user model (tests/load/user-model.ts): --users people (default 50) spread over both
 *                 servers for --users-seconds (default 30): p99 < 200 ms, no errors, no non-2xx;
 * and reports (no goal) the cost of validating every request's session in the database: a 10-connection
 * read burst (GET /api/projects) against A for --reads-seconds (default 10), with server CPU per request.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import autocannon from 'autocannon';
import { busbarBankTemplate } from '../../shared/diagram/templates';
import { prng } from '../../shared/electrical/network/builders';
import { Client, createDatabase, freePort, startPostgres, startServer, stopServer, type Postgres, type ServerProcess } from '../faults/server-process';
import { runUserModel } from './user-model';

const { values: args } = parseArgs({
  options: {
    users: { type: 'string', default: '50' },
    'users-seconds': { type: 'string', default: '30' },
    'reads-seconds': { type: 'string', default: '10' },
    json: { type: 'string' },
  },
});
const USERS = Number(args.users);
const USERS_SECONDS = Number(args['users-seconds']);
const READS_SECONDS = Number(args['reads-seconds']);
const PASSWORD = process.env.DEMO_PASSWORD || 'bankwright-demo';

const log = (line: string) => process.stderr.write(`[two-servers] ${line}\n`);
const work = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-two-'));
let pgServer: Postgres | undefined;
const admin = process.env.DATABASE_URL || (pgServer = await startPostgres()).adminUrl;
const database = await createDatabase(admin, 'bw_two');
const servers: ServerProcess[] = [];

async function finish(summary: Record<string, unknown>, ok: boolean): Promise<never> {
  for (const s of servers) await stopServer(s);
  await database.drop().catch(() => {});
  pgServer?.stop();
  const text = JSON.stringify({ ok, ...summary }, null, 2);
  process.stdout.write(text + '\n');
  if (args.json) fs.writeFileSync(args.json, text + '\n');
  process.exit(ok ? 0 : 1);
}

// A first (it migrates and seeds the empty database), then B on the same database.
for (const name of ['a', 'b']) {
  const port = await freePort();
  // Both servers share this machine's cores in the check (in production each has its own): one analysis worker each.
  servers.push(await startServer({ port, dataDir: path.join(work, name), databaseUrl: database.url, logFile: path.join(work, `${name}.log`), env: { ANALYSIS_WORKERS: process.env.ANALYSIS_WORKERS || '1' } }));
  log(`server ${name.toUpperCase()} pid ${servers.at(-1)!.pid} on ${servers.at(-1)!.base}`);
}
const [A, B] = servers;

/** One request with explicit cookies; returns the status, the JSON body and the cookies set. */
async function call(base: string, method: string, url: string, cookies: Record<string, string>, body?: unknown) {
  const res = await fetch(`${base}${url}`, {
    method,
    headers: {
      cookie: Object.entries(cookies).map(([k, v]) => `${k}=${v}`).join('; '),
      ...(method !== 'GET' ? { origin: base } : {}),
      ...(body !== undefined ? { 'content-type': 'application/json' } : {}),
    },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const set: Record<string, string> = {};
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    const i = pair.indexOf('=');
    set[pair.slice(0, i)] = pair.slice(i + 1);
  }
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : null, set };
}

// 1. Sign-out on A ends the session on B at once.
const sessionCheck = await (async () => {
  const jar: Record<string, string> = {};
  const signIn = await call(A.base, 'POST', '/api/auth/sign-in', jar, { email: 'viewer@demo.test', password: PASSWORD });
  Object.assign(jar, signIn.set);
  const onBBefore = (await call(B.base, 'GET', '/api/auth/me', jar)).status;
  const signOut = (await call(A.base, 'POST', '/api/auth/sign-out', jar)).status;
  const t0 = performance.now();
  const onBAfter = (await call(B.base, 'GET', '/api/auth/me', jar)).status;
  const afterMs = Math.round(performance.now() - t0);
  return { signInOnA: signIn.status, meOnBBefore: onBBefore, signOutOnA: signOut, meOnBRightAfter: onBAfter, msBetweenSignOutAndRequest: afterMs, ok: signIn.status === 200 && onBBefore === 200 && signOut === 204 && onBAfter === 401 };
})();
log(`sessions: ${JSON.stringify(sessionCheck)}`);

// 2. Failures on A count on B; a device cookie from A works on B.
const limiterCheck = await (async () => {
  const owner: Record<string, string> = {};
  const first = await call(A.base, 'POST', '/api/auth/sign-in', owner, { email: 'trainer@demo.test', password: PASSWORD });
  if (first.set.bw_device) owner.bw_device = first.set.bw_device;
  const guesses: number[] = [];
  for (let i = 0; i < 5; i++) guesses.push((await call(A.base, 'POST', '/api/auth/sign-in', {}, { email: 'trainer@demo.test', password: `wrong guess ${i}` })).status);
  const strangerOnB = (await call(B.base, 'POST', '/api/auth/sign-in', {}, { email: 'trainer@demo.test', password: PASSWORD })).status;
  const ownerOnB = (await call(B.base, 'POST', '/api/auth/sign-in', { bw_device: owner.bw_device ?? '' }, { email: 'trainer@demo.test', password: PASSWORD })).status;
  return {
    ownerFirstSignInOnA: first.status,
    deviceCookieIssued: Boolean(owner.bw_device),
    wrongGuessesOnA: guesses,
    rightPasswordWithoutDeviceOnB: strangerOnB,
    rightPasswordWithDeviceCookieOnB: ownerOnB,
    ok: first.status === 200 && guesses.every((s) => s === 401) && strangerOnB === 429 && ownerOnB === 200,
  };
})();
log(`limiter: ${JSON.stringify(limiterCheck)}`);

// 3. The user model spread over both servers.
const people: { server: ServerProcess; cookie: string; diagramId: string; base: number | null }[] = [];
const setup = new Client(A.base, A.base);
await setup.signIn('designer@demo.test', PASSWORD);
const teamId = (await setup.request('GET', '/api/teams')).body.teams[0].id;
const projectId = (await setup.request('POST', '/api/projects', { teamId, name: 'Two servers' })).body.project.id;
const doc = busbarBankTemplate({ count: 2, name: 'Two servers' });
for (let i = 0; i < USERS; i++) {
  const server = i % 2 === 0 ? A : B;
  const c = new Client(server.base, server.base);
  await c.signIn('designer@demo.test', PASSWORD);
  const d = await setup.request('POST', `/api/projects/${projectId}/diagrams`, { name: `Two servers ${i}`, content: doc });
  const first = await setup.request('POST', `/api/diagrams/${d.body.diagram.id}/revisions`, { baseRevision: null, message: 'first', content: doc });
  people.push({ server, cookie: c.cookie, diagramId: d.body.diagram.id, base: first.body.revision?.number ?? null });
}

/** CPU time (user + system, ms) a server process has used so far (Linux /proc; USER_HZ 100). */
function cpuMs(s: ServerProcess): number {
  try {
    const f = fs.readFileSync(`/proc/${s.pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return ((Number(f[11]) + Number(f[12])) * 1000) / 100;
  } catch {
    return NaN;
  }
}

log(`users: ${USERS} people over A and B for ${USERS_SECONDS} s`);
const cpu0 = servers.map(cpuMs);
const random = prng(13);
const byServer = await Promise.all(
  servers.map((server) =>
    runUserModel({ base: server.base, origin: server.base, teamId, projectId, people: people.filter((p) => p.server === server), seconds: USERS_SECONDS, doc, random }),
  ),
);
const cpuUsers = servers.map((s, i) => cpuMs(s) - cpu0[i]);
const requests = byServer.reduce((n, r) => n + r.latencyMs.requests, 0);
const users = {
  people: USERS,
  seconds: USERS_SECONDS,
  requests,
  // The p99 of both servers' requests together is at most the larger of the two.
  p99AtMostMs: Math.max(...byServer.map((r) => r.latencyMs.p99)),
  errors: byServer.reduce((n, r) => n + r.errors, 0),
  non2xx: byServer.reduce((n, r) => n + r.non2xx, 0),
  serverCpuMsPerRequest: Math.round((cpuUsers.reduce((a, b) => a + b, 0) / Math.max(1, requests)) * 100) / 100,
  servers: byServer.map((r, i) => ({ server: i === 0 ? 'A' : 'B', people: r.people, requestsPerSecond: r.requestsPerSecond, latencyMs: r.latencyMs, errors: r.errors, non2xx: r.non2xx, non2xxStatuses: r.non2xxStatuses, errorMessages: r.errorMessages })),
};
const usersOk = users.p99AtMostMs < 200 && users.errors === 0 && users.non2xx === 0;
log(`users: p99 ≤ ${users.p99AtMostMs} ms, ${users.errors} errors, ${users.non2xx} non-2xx`);

// The cost figure: a read burst against A, every request's session validated in the database.
log(`reads: 10 connections, GET /api/projects on A for ${READS_SECONDS} s`);
const cpuR0 = cpuMs(A);
const reads = await new Promise<autocannon.Result>((resolve, reject) =>
  autocannon(
    { url: A.base, connections: 10, duration: READS_SECONDS, headers: { cookie: people[0].cookie }, requests: [{ method: 'GET', path: `/api/projects?teamId=${teamId}` }] },
    (err, r) => (err ? reject(err) : resolve(r)),
  ),
);
const readCost = {
  connections: 10,
  seconds: READS_SECONDS,
  requestsPerSecond: Math.round(reads.requests.average),
  latencyMs: { p50: reads.latency.p50, p99: reads.latency.p99 },
  non2xx: reads.non2xx,
  serverCpuMsPerRequest: Math.round(((cpuMs(A) - cpuR0) / Math.max(1, reads.requests.total)) * 100) / 100,
};
log(`reads: ${JSON.stringify(readCost)}`);

await finish(
  {
    database: 'postgresql, one database, two app servers',
    loadAverage: os.loadavg().map((x) => Math.round(x * 10) / 10),
    sessions: sessionCheck,
    limiter: limiterCheck,
    users: { ...users, ok: usersOk },
    reads: readCost,
    logs: work,
  },
  sessionCheck.ok && limiterCheck.ok && usersOk,
);
