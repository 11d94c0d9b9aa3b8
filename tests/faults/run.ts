/**
 * npm run test:faults -- [--pg] [--kills N] [--clients N] [--seconds S] [--min-gap MS] [--max-gap MS] [--json FILE]
 *
 * (Each kill comes at a random moment 0–4 s (--min-gap/--max-gap) after the restarted server has
 * acknowledged its first save, so every kill lands while saves are in flight.)
 *
 * Durability under crashes. Starts the real server (embedded PGlite in a temporary DATA_DIR, or with
 * --pg a PostgreSQL server: DATABASE_URL as an admin URL if set, else a throwaway one like .ci/run),
 * signs in N clients (the demo designer, one session each), gives each client a diagram, and has them
 * save revisions (POST /api/diagrams/:id/revisions) as fast as the server answers. Meanwhile the server
 * is killed with SIGKILL at random moments and restarted on the same data; clients retry.
 *
 * Each client records every save the server acknowledged (2xx: diagram, number, and the SHA-256 of the
 * canonical JSON of what it sent, computed here independently of the server) and every save left
 * unanswered (connection dropped by a kill). At the end the server is stopped cleanly, started again,
 * and the harness checks:
 *   - every acknowledged save is present, with the same number and a byte-identical document
 *     (hash of the returned content, and the server's contentHash, equal to the client's);
 *   - every revision the server holds was either acknowledged, or is one of the unanswered saves
 *     and is whole (its content hashes to what was sent and parses as a diagram);
 *   - revision numbers have no gaps; the database opens cleanly (a fresh start, every table readable).
 * Prints a JSON summary; exit 0 when all hold, 1 on any violation, 2 when a route it needs is missing.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { busbarBankTemplate, postToPostTemplate } from '../../shared/diagram/templates';
import { parseDiagram } from '../../shared/diagram/parse';
import {
  Client, contentHashOf, createDatabase, freePort, NO_ROUTE, percentile, sleep, startPostgres, startServer, stopServer, tail,
  type Postgres, type ServerProcess,
} from './server-process';

const { values: args } = parseArgs({
  options: {
    pg: { type: 'boolean', default: false },
    kills: { type: 'string', default: '20' },
    clients: { type: 'string', default: '20' },
    seconds: { type: 'string', default: '1800' },
    'min-gap': { type: 'string', default: '0' },
    'max-gap': { type: 'string', default: '4000' },
    json: { type: 'string' },
  },
});
const KILLS = Number(args.kills);
const CLIENTS = Number(args.clients);
const MAX_SECONDS = Number(args.seconds);
const MIN_GAP = Number(args['min-gap']);
const MAX_GAP = Number(args['max-gap']);
const DESIGNER = { email: 'designer@demo.test', password: process.env.DEMO_PASSWORD || 'bankwright-demo' };

interface Ack { client: number; diagramId: string; number: number; hash: string; serverHash?: string }
interface InDoubt { client: number; diagramId: string; hash: string; content: unknown }

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-faults-'));
const dataDir = path.join(work, 'data');
const logFile = path.join(work, 'server.log');
const port = await freePort();
const origin = `http://127.0.0.1:${port}`;

let pgServer: Postgres | undefined;
let database: { url: string; drop(): Promise<void> } | undefined;
if (args.pg) {
  const admin = process.env.DATABASE_URL || (pgServer = await startPostgres()).adminUrl;
  database = await createDatabase(admin, 'bw_faults');
}
const serverOptions = { port, dataDir, databaseUrl: database?.url, logFile };

function log(line: string) {
  process.stderr.write(`[faults] ${line}\n`);
}

async function cleanup() {
  await database?.drop().catch(() => {});
  pgServer?.stop();
}

function finish(summary: Record<string, unknown>, code: number): never {
  const text = JSON.stringify(summary, null, 2);
  process.stdout.write(text + '\n');
  if (args.json) fs.writeFileSync(args.json, text + '\n');
  process.exit(code);
}

let server: ServerProcess = await startServer(serverOptions);
log(`server pid ${server.pid} on ${origin}, ${args.pg ? 'PostgreSQL' : `PGlite in ${dataDir}`}; ${CLIENTS} clients, ${KILLS} kills`);

// Setup: one project, one diagram per client.
const setup = new Client(server.base, origin);
await setup.signIn(DESIGNER.email, DESIGNER.password);
const teamId = (await setup.request('GET', '/api/teams')).body.teams[0].id;
const projectId = (await setup.request('POST', '/api/projects', { teamId, name: 'Fault run' })).body.project.id;
const diagramIds: string[] = [];
for (let c = 0; c < CLIENTS; c++) {
  const r = await setup.request('POST', `/api/projects/${projectId}/diagrams`, { name: `Fault client ${c}` });
  if (NO_ROUTE(r)) {
    await stopServer(server);
    await cleanup();
    finish({ ok: false, blocked: 'diagram create route missing (POST /api/projects/:id/diagrams)' }, 2);
  }
  diagramIds.push(r.body.diagram.id);
}
const probe = await setup.request('GET', `/api/diagrams/${diagramIds[0]}/revisions`);
if (NO_ROUTE(probe)) {
  await stopServer(server);
  await cleanup();
  finish({ ok: false, blocked: 'revisions route missing (GET/POST /api/diagrams/:id/revisions)' }, 2);
}

const acks: Ack[] = [];
const inDoubt: InDoubt[] = [];
const stats = { attempts: 0, conflicts: 0, refusedWhileDown: 0, sessionsLost: 0, unexpectedStatus: [] as string[] };
let stop = false;
let serverUp = true;

function documentFor(client: number, k: number) {
  const name = `Client ${client} save ${k} ${'·'.repeat(k % 7)}ünïcødé`;
  return k % 2 ? busbarBankTemplate({ count: 1 + (k % 3), name }) : postToPostTemplate({ count: 1 + (k % 4), takeOff: 'diagonal', name });
}

async function latestOf(c: Client, diagramId: string): Promise<{ number: number | null; hash: string | null }> {
  const r = await c.request('GET', `/api/diagrams/${diagramId}/revisions`);
  if (r.status !== 200) throw new Error(`list: ${r.status}`);
  const list = r.body.revisions as { number: number; contentHash: string }[];
  if (list.length === 0) return { number: null, hash: null };
  const top = list.reduce((a, b) => (b.number > a.number ? b : a));
  return { number: top.number, hash: top.contentHash };
}

async function runClient(index: number) {
  const c = new Client(server.base, origin);
  const diagramId = diagramIds[index];
  let base: number | null = null;
  let k = 0;
  let needResync = false;
  let signedIn = false;
  while (!stop) {
    try {
      if (!signedIn) {
        await c.signIn(DESIGNER.email, DESIGNER.password);
        signedIn = true;
      }
      if (needResync) {
        base = (await latestOf(c, diagramId)).number;
        needResync = false;
      }
      const content = documentFor(index, ++k);
      const hash = contentHashOf(content);
      stats.attempts++;
      let r;
      try {
        r = await c.request('POST', `/api/diagrams/${diagramId}/revisions`, { baseRevision: base, message: `save ${k}`, content });
      } catch {
        // No answer: the server died with this save in flight. It may or may not have committed.
        inDoubt.push({ client: index, diagramId, hash, content });
        needResync = true;
        throw new Error('unanswered');
      }
      if (r.status === 201) {
        acks.push({ client: index, diagramId, number: r.body.revision.number, hash, serverHash: r.body.revision.contentHash });
        base = r.body.revision.number;
      } else if (r.status === 409) {
        stats.conflicts++;
        needResync = true;
      } else if (r.status === 401) {
        stats.sessionsLost++;
        signedIn = false;
      } else {
        stats.unexpectedStatus.push(`${r.status} ${JSON.stringify(r.body).slice(0, 200)}`);
        await sleep(200);
      }
    } catch {
      if (!serverUp) stats.refusedWhileDown++;
      await sleep(100 + Math.random() * 200);
    }
  }
}

const restarts: number[] = [];
const started = Date.now();
const clientsDone = Promise.all(Array.from({ length: CLIENTS }, (_, i) => runClient(i)));

let kills = 0;
while (kills < KILLS && (Date.now() - started) / 1000 < MAX_SECONDS) {
  // Kill only while saves flow: wait for a save acknowledged by this server process (a fresh process
  // is slow to answer its first saves), then a random moment within the gap.
  const acked = acks.length;
  const waitFrom = Date.now();
  while (acks.length === acked && Date.now() - waitFrom < 120_000) await sleep(50);
  await sleep(MIN_GAP + Math.random() * (MAX_GAP - MIN_GAP));
  serverUp = false;
  server.child.kill('SIGKILL');
  await server.exited;
  kills++;
  const t0 = Date.now();
  try {
    server = await startServer(serverOptions);
  } catch (err) {
    stop = true;
    await clientsDone;
    await cleanup();
    finish({ ok: false, error: `restart after kill ${kills} failed: ${(err as Error).message}`, log: tail(logFile, 30) }, 1);
  }
  restarts.push(Date.now() - t0);
  serverUp = true;
  log(`kill ${kills}/${KILLS}: restarted in ${restarts[restarts.length - 1]} ms; ${acks.length} saves acknowledged so far`);
}
// Let the clients save a little after the last restart, then stop them.
await sleep(1500);
stop = true;
await clientsDone;
const runSeconds = (Date.now() - started) / 1000;

// A clean stop, then a fresh start: the database must open.
const stopped = await stopServer(server);
let reopened: ServerProcess;
try {
  reopened = await startServer(serverOptions);
} catch (err) {
  await cleanup();
  finish({ ok: false, error: `the database did not open cleanly after the run: ${(err as Error).message}` }, 1);
}

// Verification.
const v = new Client(reopened.base, origin);
await v.signIn(DESIGNER.email, DESIGNER.password);
const lost: string[] = [];
const mismatched: string[] = [];
const unexplained: string[] = [];
const gaps: string[] = [];
let inDoubtCommitted = 0;
let revisionsChecked = 0;
for (let c = 0; c < CLIENTS; c++) {
  const diagramId = diagramIds[c];
  const list = await v.request('GET', `/api/diagrams/${diagramId}/revisions`);
  const numbers = (list.body.revisions as { number: number }[]).map((r) => r.number).sort((a, b) => a - b);
  numbers.forEach((n, i) => {
    if (n !== i + 1) gaps.push(`${diagramId}: revisions ${numbers.join(',')}`);
  });
  const mine = acks.filter((a) => a.client === c);
  const doubts = inDoubt.filter((d) => d.client === c);
  for (const n of numbers) {
    const r = await v.request('GET', `/api/diagrams/${diagramId}/revisions/${n}`);
    revisionsChecked++;
    const rev = r.body.revision;
    const got = contentHashOf(rev.content);
    const ack = mine.find((a) => a.number === n);
    if (ack) {
      if (got !== ack.hash || rev.contentHash !== ack.hash || (ack.serverHash && ack.serverHash !== ack.hash)) {
        mismatched.push(`${diagramId}#${n}: sent ${ack.hash.slice(0, 12)}, stored ${got.slice(0, 12)}, server says ${String(rev.contentHash).slice(0, 12)}`);
      }
      continue;
    }
    const doubt = doubts.find((d) => d.hash === got);
    if (doubt && parseDiagram(rev.content).ok && rev.contentHash === got) inDoubtCommitted++;
    else unexplained.push(`${diagramId}#${n}: not acknowledged and not a whole unanswered save (hash ${got.slice(0, 12)})`);
  }
  for (const a of mine) if (!numbers.includes(a.number)) lost.push(`${diagramId}#${a.number} (acknowledged, hash ${a.hash.slice(0, 12)})`);
}
// Every table readable after the run.
const readable = (await v.request('GET', `/api/projects?teamId=${teamId}`)).status === 200 && (await v.request('GET', `/api/projects/${projectId}/diagrams`)).status === 200;
await stopServer(reopened);
await cleanup();

const restartSorted = [...restarts].sort((a, b) => a - b);
const ok = lost.length === 0 && mismatched.length === 0 && unexplained.length === 0 && gaps.length === 0 && readable && kills >= KILLS;
finish(
  {
    ok,
    database: args.pg ? 'postgresql' : 'pglite',
    clients: CLIENTS,
    kills,
    killsPlanned: KILLS,
    runSeconds: Math.round(runSeconds),
    saveAttempts: stats.attempts,
    savesAcknowledged: acks.length,
    savesUnanswered: inDoubt.length,
    unansweredThatCommitted: inDoubtCommitted,
    revisionsChecked,
    conflicts409: stats.conflicts,
    sessionsLost: stats.sessionsLost,
    unexpectedStatus: stats.unexpectedStatus.slice(0, 10),
    unexpectedStatusCount: stats.unexpectedStatus.length,
    lostAcknowledged: lost,
    mismatched,
    unexplained,
    gaps,
    reopenedCleanly: readable,
    finalStop: stopped,
    restartMs: { p50: percentile(restartSorted, 50), max: restartSorted[restartSorted.length - 1] ?? null },
    workDir: work,
  },
  ok ? 0 : 1,
);
