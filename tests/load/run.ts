/**
 * npm run test:load -- [--pg] [--connections N] [--seconds S] [--users N] [--users-seconds S] [--only …] [--json FILE]
 *
 * Load test against the real server on 127.0.0.1 (embedded PGlite in a temporary DATA_DIR, or with --pg
 * a PostgreSQL server: DATABASE_URL as an admin URL if set, else a throwaway one). Two models of load
 * (docs/decisions/011-save-path-and-load-models.md):
 *
 * Saturation phases, with autocannon: N connections (default 50), each its own signed-in session of the
 * demo designer and its own diagram, each sending its next request the moment the last is answered (no
 * think time), so the server runs flat out and latency ≈ connections / throughput (Little's law).
 * Each bounded by --seconds (default 15):
 *   reads   GET projects, a project's diagrams, a diagram, its revisions, one revision
 *   saves   POST /api/diagrams/:id/revisions (each save is checked by the server: the analysis runs in
 *           a worker and its summary is stored with the revision)
 *   checks  POST /api/diagrams/:id/check of the diagram's working copy (the analysis runs in the worker pool)
 *   mixed   five reads, one save and one check of unsaved content
 *   health  GET /api/health from 5 connections while a 5,000-element diagram is checked
 *           (POST /api/diagrams/:id/check) in a loop
 *
 * User model (phase users), with fetch: --users people (default 50), each their own signed-in session and
 * diagram, going through project list, diagrams, a diagram, its history, checks, saves and old revisions
 * with 0.5–2 s of think time between actions, for --users-seconds (default 30). tests/load/user-model.ts.
 *
 * Reports requests/s, latency p50/p90/p99, non-2xx and errors per phase as JSON, with the load average
 * at the start of each phase. Loopback only.
 * Goals (issue 7): p99 < 200 ms at 50 users with no errors; health p99 < 50 ms during the big check.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import autocannon from 'autocannon';
import { busbarBankTemplate, seriesParallelTemplate } from '../../shared/diagram/templates';
import { compileDiagram } from '../../shared/electrical/compile';
import { Client, createDatabase, freePort, NO_ROUTE, startPostgres, startServer, stopServer, type Postgres } from '../faults/server-process';
import { prng } from '../../shared/electrical/network/builders';
import { runUserModel } from './user-model';

const { values: args } = parseArgs({
  options: {
    pg: { type: 'boolean', default: false },
    connections: { type: 'string', default: '50' },
    seconds: { type: 'string', default: '15' },
    json: { type: 'string' },
    /** People in the user model (phase users). */
    users: { type: 'string', default: '50' },
    'users-seconds': { type: 'string', default: '30' },
    /** Run only these phases (comma-separated: reads,saves,checks,mixed,users,health). */
    only: { type: 'string' },
  },
});
const ONLY = args.only ? new Set(args.only.split(',')) : null;
const wanted = (name: string) => !ONLY || ONLY.has(name);
const CONNECTIONS = Number(args.connections);
const SECONDS = Number(args.seconds);
const USERS = Number(args.users);
const USERS_SECONDS = Number(args['users-seconds']);
/** Signed-in sessions, each with its own diagram: one per connection and one per person of the user model. */
const SESSIONS = Math.max(CONNECTIONS, wanted('users') ? USERS : 0);
const DESIGNER = { email: 'designer@demo.test', password: process.env.DEMO_PASSWORD || 'bankwright-demo' };

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-load-'));
const logFile = path.join(work, 'server.log');
const port = await freePort();
const origin = `http://127.0.0.1:${port}`;
let pgServer: Postgres | undefined;
let database: { url: string; drop(): Promise<void> } | undefined;
if (args.pg) {
  const admin = process.env.DATABASE_URL || (pgServer = await startPostgres()).adminUrl;
  database = await createDatabase(admin, 'bw_load');
}
const server = await startServer({ port, dataDir: path.join(work, 'data'), databaseUrl: database?.url, logFile });
const log = (line: string) => process.stderr.write(`[load] ${line}\n`);
log(`server pid ${server.pid} on ${origin} (${args.pg ? 'PostgreSQL' : 'PGlite'}); ${CONNECTIONS} connections, ${SECONDS} s per phase; ${USERS} people for ${USERS_SECONDS} s in the user model`);
const loadAverage = () => os.loadavg().map((x) => Math.round(x * 10) / 10);

async function done(summary: Record<string, unknown>, code: number): Promise<never> {
  await stopServer(server);
  await database?.drop().catch(() => {});
  pgServer?.stop();
  const text = JSON.stringify(summary, null, 2);
  process.stdout.write(text + '\n');
  if (args.json) fs.writeFileSync(args.json, text + '\n');
  process.exit(code);
}

// Sessions: the right password each time (the limiter counts failures only).
const sessions: Client[] = [];
for (let i = 0; i < SESSIONS; i++) {
  const c = new Client(server.base, origin);
  await c.signIn(DESIGNER.email, DESIGNER.password);
  sessions.push(c);
}
const setup = sessions[0];
const teamId = (await setup.request('GET', '/api/teams')).body.teams[0].id;
const projectId = (await setup.request('POST', '/api/projects', { teamId, name: 'Load run' })).body.project.id;
const smallDoc = busbarBankTemplate({ count: 2, name: 'Load save' });
const blocked: string[] = [];
const conn: { cookie: string; diagramId: string; base: number | null }[] = [];
for (let i = 0; i < SESSIONS; i++) {
  const d = await setup.request('POST', `/api/projects/${projectId}/diagrams`, { name: `Load ${i}`, content: smallDoc });
  if (NO_ROUTE(d)) await done({ ok: false, blocked: 'diagram create route missing' }, 2);
  const first = await setup.request('POST', `/api/diagrams/${d.body.diagram.id}/revisions`, { baseRevision: null, message: 'first', content: smallDoc });
  if (NO_ROUTE(first)) await done({ ok: false, blocked: 'revisions route missing (POST /api/diagrams/:id/revisions)' }, 2);
  conn.push({ cookie: sessions[i].cookie, diagramId: d.body.diagram.id, base: first.body.revision.number });
}

type Req = autocannon.Request;
function goal(r: { latencyMs: { p99: number }; non2xx: number; errors: number; timeouts: number }, p99: number) {
  return r.latencyMs.p99 < p99 && r.non2xx === 0 && r.errors === 0 && r.timeouts === 0;
}
const readRequests = (c: (typeof conn)[number]): Req[] => [
  { method: 'GET', path: `/api/projects?teamId=${teamId}` },
  { method: 'GET', path: `/api/projects/${projectId}/diagrams` },
  { method: 'GET', path: `/api/diagrams/${c.diagramId}` },
  { method: 'GET', path: `/api/diagrams/${c.diagramId}/revisions` },
  { method: 'GET', path: `/api/diagrams/${c.diagramId}/revisions/1` },
];
function saveRequest(c: (typeof conn)[number]): Req {
  return {
    method: 'POST',
    path: `/api/diagrams/${c.diagramId}/revisions`,
    setupRequest: (req) => ({ ...req, body: JSON.stringify({ baseRevision: c.base, message: 'load', content: smallDoc }) }),
    onResponse: (status, body) => {
      try {
        const b = JSON.parse(body);
        if (status === 201) c.base = b.revision.number;
        else if (status === 409) c.base = b.error.details.latest?.number ?? null;
      } catch {
        // not JSON: counted by autocannon as non-2xx already
      }
    },
  };
}

function checkRequest(c: (typeof conn)[number], content?: unknown): Req {
  return { method: 'POST', path: `/api/diagrams/${c.diagramId}/check`, body: JSON.stringify(content === undefined ? {} : { content }) };
}

/** CPU time (user + system, ms) the server process has used so far, all its threads (Linux /proc). */
function serverCpuMs(): number {
  try {
    const f = fs.readFileSync(`/proc/${server.pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return ((Number(f[11]) + Number(f[12])) * 1000) / 100; // utime, stime in clock ticks (USER_HZ 100)
  } catch {
    return NaN;
  }
}

function summarize(name: string, r: autocannon.Result, cpuMs = NaN, load: number[] = []) {
  return {
    phase: name,
    loadAverageAtStart: load,
    connections: r.connections,
    seconds: r.duration,
    requests: r.requests.total,
    requestsPerSecond: Math.round(r.requests.average),
    latencyMs: { p50: r.latency.p50, p90: r.latency.p90, p99: r.latency.p99, max: r.latency.max },
    non2xx: r.non2xx,
    errors: r.errors,
    timeouts: r.timeouts,
    /** Server CPU per request (all threads): a cost figure less sensitive to other load on the machine than latency. */
    serverCpuMsPerRequest: Math.round((cpuMs / Math.max(1, r.requests.total)) * 100) / 100,
  };
}

function phase(name: string, requestsFor: (i: number) => Req[], connections = CONNECTIONS, seconds = SECONDS): Promise<ReturnType<typeof summarize>> {
  let next = 0;
  const cpu0 = serverCpuMs();
  const load = loadAverage();
  return new Promise((resolve, reject) => {
    const inst = autocannon(
      {
        url: server.base,
        connections,
        duration: seconds,
        timeout: 10,
        headers: { origin, 'content-type': 'application/json' },
        requests: [{ method: 'GET', path: '/api/health' }],
        setupClient: (client: { setHeaders(h: Record<string, string>): void; setRequests(r: Req[]): void }) => {
          const i = next++ % conn.length;
          client.setHeaders({ cookie: conn[i].cookie, origin, 'content-type': 'application/json' });
          client.setRequests(requestsFor(i));
        },
      },
      (err, result) => (err ? reject(err) : resolve(summarize(name, result, serverCpuMs() - cpu0, load))),
    );
    void inst;
  });
}

/**
 * Saves cut off when a phase ends may still commit: let the server finish what it was given, then start
 * each phase from every diagram's real latest revision.
 */
async function resyncBases() {
  await new Promise((r) => setTimeout(r, 1500));
  for (const c of conn) {
    const list = (await setup.request('GET', `/api/diagrams/${c.diagramId}/revisions`)).body.revisions as { number: number }[];
    c.base = list.length ? Math.max(...list.map((r) => r.number)) : null;
  }
}

const results: ReturnType<typeof summarize>[] = [];
async function run(name: string, requestsFor: (i: number) => Req[]) {
  if (!wanted(name)) return;
  log(`phase ${name}`);
  results.push(await phase(name, requestsFor));
  await resyncBases();
}
await run('reads', (i) => readRequests(conn[i]));
await run('saves', (i) => [saveRequest(conn[i])]);
await run('checks', (i) => [checkRequest(conn[i])]);
await run('mixed', (i) => [...readRequests(conn[i]), saveRequest(conn[i]), checkRequest(conn[i], smallDoc)]);

let userModel: (Awaited<ReturnType<typeof runUserModel>> & { loadAverageAtStart: number[]; serverCpuMsPerRequest: number }) | undefined;
if (wanted('users')) {
  log(`phase users: ${USERS} people, ${USERS_SECONDS} s`);
  const load = loadAverage();
  const cpu0 = serverCpuMs();
  const r = await runUserModel({
    base: server.base,
    origin,
    teamId,
    projectId,
    people: conn.slice(0, USERS).map((c) => ({ cookie: c.cookie, diagramId: c.diagramId, base: c.base })),
    seconds: USERS_SECONDS,
    doc: smallDoc,
    random: prng(7),
  });
  const cpuMs = serverCpuMs() - cpu0;
  userModel = { loadAverageAtStart: load, ...r, serverCpuMsPerRequest: Math.round((cpuMs / Math.max(1, r.latencyMs.requests)) * 100) / 100 };
  await resyncBases();
}
const userGoal = userModel ? { users: userModel.latencyMs.p99 < 200 && userModel.non2xx === 0 && userModel.errors === 0 } : {};
if (!wanted('health'))
  await done(
    {
      database: args.pg ? 'postgresql' : 'pglite',
      loadAverage: loadAverage(),
      phases: results,
      userModel,
      goals: { p99Under200msNoErrors: { ...Object.fromEntries(results.map((r) => [r.phase, goal(r, 200)])), ...userGoal } },
      logFile,
    },
    0,
  );

// Health while a 5,000-element diagram is checked (POST …/check: the analysis runs in a worker thread).
const big = seriesParallelTemplate({ seriesCount: 40, parallelCount: 63, name: 'Big check' });
const compiled = compileDiagram(big);
const elements = compiled.ok ? compiled.network.elements.length : 0;
const bigDiagram = await setup.request('POST', `/api/projects/${projectId}/diagrams`, { name: 'Big check', content: big });
let bigSaves = 0;
const bigTimes: number[] = [];
let stopBig = false;
const bigLoop = (async () => {
  while (!stopBig) {
    const r = await setup.request('POST', `/api/diagrams/${bigDiagram.body.diagram.id}/check`, { content: big }, 120_000);
    if (r.status === 200) {
      bigSaves++;
      bigTimes.push(Math.round(r.ms));
    } else {
      blocked.push(`big check answered ${r.status}`);
      break;
    }
  }
})();
await new Promise((r) => setTimeout(r, 300));
log(`phase health during a ${elements}-element check`);
const health = await phase('health-during-5000-element-check', () => [{ method: 'GET', path: '/api/health' }], 5, SECONDS);
stopBig = true;
await bigLoop;

const summary = {
  database: args.pg ? 'postgresql' : 'pglite',
  loadAverage: loadAverage(),
  phases: results,
  userModel,
  health: { ...health, checkElements: elements, bigChecksCompleted: bigSaves, bigCheckMs: bigTimes },
  goals: {
    p99Under200msNoErrors: { ...Object.fromEntries(results.map((r) => [r.phase, goal(r, 200)])), ...userGoal },
    healthP99Under50msDuringCheck: goal(health, 50) && bigSaves + (stopBig ? 1 : 0) > 0,
  },
  blocked,
  logFile,
};
await done(summary, 0);
