/**
 * Fuzzing every mutating API route with generated and mutated bodies against one real app (supertest,
 * a fresh database). Bodies start from the route's zod schema (tests/fuzz/from-zod.ts, with a valid
 * example for what a schema cannot generate: ids that exist, patterns), then get damaged: structural
 * mutations, lone surrogates and NULs in values and keys, deep nesting, numbers too large for JSON,
 * wrong types, damaged JSON text and other content types. Uploads get damaged files and file names.
 *
 * For every request: never a 5xx; every rejection is a 4xx with {"error":{"code","message"}} and no stack
 * trace; and a rejected request stores nothing. "Nothing stored" is checked through PostgreSQL's
 * transaction ids: a request that commits no writing transaction leaves the snapshot's xmax where it
 * was; when it moved, no row of any application table may carry a transaction id from the request
 * (inserted or updated), and the row counts must not change (deleted).
 *
 * Seeded through tests/helpers/fast-check-config.ts: `npm test` runs a fixed seed, FC_SEED=random
 * explores, FUZZ_SCALE multiplies the counts (tests/fuzz/mutate.ts).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import type { z } from 'zod';
import { busbarBankTemplate, postToPostTemplate } from '../../shared/diagram/templates';
import { annotationsBodySchema } from '../../shared/diagram/annotations';
import { changeEmailSchema, changePasswordSchema, signInSchema, signUpSchema, updateAccountSchema } from '../../shared/schemas/auth';
import {
  checkOptionsSchema,
  copyDiagramSchema,
  createDiagramSchema,
  duplicateDiagramSchema,
  moveDiagramSchema,
  restoreRevisionSchema,
  saveRevisionSchema,
  updateDiagramSchema,
  workingCopySchema,
} from '../../shared/schemas/diagrams';
import { createLibraryItemSchema, importLibrarySchema, updateLibraryItemSchema } from '../../shared/schemas/library';
import { markNotificationsReadSchema, preferencesSchema } from '../../shared/schemas/notifications';
import { createProjectSchema, updateProjectSchema } from '../../shared/schemas/projects';
import { commentSchema, decisionSchema, resolveCommentSchema, reviewRequestSchema } from '../../shared/schemas/reviews';
import { acceptInviteSchema, changeRoleSchema, createTeamSchema, inviteSchema, updateTeamSchema } from '../../shared/schemas/teams';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { jpeg, multipart, pdf, png } from '../integration/upload-fixtures';
import { fromZod } from './from-zod';
import { applyOps, hostileValue, mutatedText, mutatedValue, scaled, type MutationOp } from './mutate';

/** Requests per route group; 10,000 in all at FUZZ_SCALE=1 (the npm test share). Recorded in docs/reliability.md. */
export const API_RUNS = scaled({ light: 8200, documents: 1400, passwords: 400 });
/** Each group's time limit; the light group takes about 33 s on PGlite and 40 s on PostgreSQL at FUZZ_SCALE=1 (2 cores), twice that on a busy machine. */
const RUN_TIMEOUT_MS = Math.max(60_000, 300_000 * Math.min(10, Number(process.env.FUZZ_SCALE) || 1));

let t: TestApp;
let owner: Agent;
let designer: Agent;
let reviewer: Agent;
let pwUser: Agent;
let dataDir: string;
const ids = {
  team: '',
  fuzzTeam: '',
  project: '',
  otherProject: '',
  diagram: '',
  libraryItem: '',
  comment: '',
  reviewer: '',
  designer: '',
};
let tables: string[] = [];

// ---------------------------------------------------------------------------------------------------
// "A rejected request stores nothing"

const rows = async <T,>(q: string) => ((await t.db.execute(sql.raw(q))) as unknown as { rows: T[] }).rows;

/** The next transaction id to be assigned (snapshot xmax): unchanged when nothing wrote. */
async function nextXid(): Promise<bigint> {
  const [r] = await rows<{ x: string }>('select pg_snapshot_xmax(pg_current_snapshot())::text as x');
  return BigInt(r!.x);
}

/** Per application table: rows written (inserted or updated) by transactions from `x0` on, and the row count. */
async function writesSince(x0: bigint): Promise<Record<string, { written: number; count: number }>> {
  const low = x0 % 2n ** 32n;
  const q = tables
    .map((name) => `select '${name}' as t, count(*) filter (where xmin::text::bigint >= ${low})::int as w, count(*)::int as c from "${name}"`)
    .join(' union all ');
  return Object.fromEntries((await rows<{ t: string; w: number; c: number }>(q)).map((r) => [r.t, { written: r.w, count: r.c }]));
}

let counts: { at: bigint; byTable: Record<string, number> } | null = null;
/** The xmax read after the last rejected request (nothing can have written since): the next request's starting point. */
let lastXid: bigint | null = null;

async function storedFiles(): Promise<number> {
  const dir = path.join(dataDir, 'uploads');
  return fs.existsSync(dir) ? (fs.readdirSync(dir, { recursive: true }) as string[]).length : 0;
}

// ---------------------------------------------------------------------------------------------------
// Bodies

type Body = { kind: 'value'; value: unknown } | { kind: 'text'; text: string; type: string } | { kind: 'file'; name: string; bytes: Buffer; type: string };

/** Text and keys that the input rules refuse: lone surrogates (either half), NULs. */
const UNSTORABLE = ['\ud83d', 'Bank \udd0b', '\udc00\ud800', 'x\u0000y', '\u0000'];
const unstorableOp: fc.Arbitrary<MutationOp> = fc.record({
  at: fc.nat(),
  kind: fc.constantFrom(0, 5),
  value: fc.constantFrom<unknown>(...UNSTORABLE),
  key: fc.constantFrom(...UNSTORABLE, 'ok'),
});

const DEEP_MARK = '"__fuzz_deep__"';
const depth = fc.constantFrom(2, 50, 98, 99, 100, 101, 1_000, 50_000);

/** The JSON text of a body with one value replaced by `depth` levels of arrays or objects. */
function deepBody(base: fc.Arbitrary<unknown>): fc.Arbitrary<string> {
  return fc.tuple(base, fc.nat(), depth, fc.boolean()).map(([b, at, d, arrays]) => {
    const marked = applyOps(b, [{ at, kind: 0, value: '__fuzz_deep__', key: '' }]);
    const inner = arrays ? `${'['.repeat(d)}${']'.repeat(d)}` : `${'{"a":'.repeat(d)}1${'}'.repeat(d)}`;
    const text = JSON.stringify(marked) ?? 'null';
    return text.includes(DEEP_MARK) ? text.replace(DEEP_MARK, inner) : inner;
  });
}

/** The JSON text with one number replaced by one JSON can write but no double holds (or an integer past 2^53). */
function hugeNumberBody(base: fc.Arbitrary<unknown>): fc.Arbitrary<string> {
  return fc.tuple(base, fc.nat(), fc.constantFrom('1e400', '-1e999', '123456789012345678901234567890', '4.9e-400', '1' + '0'.repeat(400))).map(([b, at, big]) => {
    const text = JSON.stringify(b) ?? 'null';
    const numbers = [...text.matchAll(/(?<=[:,[])-?\d+(\.\d+)?([eE][-+]?\d+)?/g)];
    if (numbers.length === 0) return text.replace(/^\{/, `{"n":${big},`);
    const m = numbers[at % numbers.length]!;
    return text.slice(0, m.index) + big + text.slice(m.index! + m[0].length);
  });
}

/** Every field of the body given the wrong type. */
function wrongTypes(base: fc.Arbitrary<unknown>): fc.Arbitrary<unknown> {
  return fc.tuple(base, fc.constantFrom<unknown>(0, 1.5, -1, true, false, null, 'text', [], {}, ['a'], { nested: {} })).map(([b, v]) =>
    b && typeof b === 'object' && !Array.isArray(b) ? Object.fromEntries(Object.keys(b).map((k) => [k, v])) : v,
  );
}

/** The body's top-level fields as a form post (values that are not text go as their JSON). */
function urlEncoded(v: unknown): string {
  if (!v || typeof v !== 'object') return String(JSON.stringify(v));
  const form = new URLSearchParams();
  for (const [k, x] of Object.entries(v)) form.append(k, typeof x === 'string' ? x : String(JSON.stringify(x)));
  return form.toString();
}

function bodies(base: fc.Arbitrary<unknown>): fc.Arbitrary<Body> {
  return fc.oneof(
    { weight: 3, arbitrary: base.map((value): Body => ({ kind: 'value', value })) },
    { weight: 5, arbitrary: mutatedValue(base).map((value): Body => ({ kind: 'value', value })) },
    { weight: 2, arbitrary: fc.tuple(base, fc.array(unstorableOp, { minLength: 1, maxLength: 2 })).map(([b, ops]): Body => ({ kind: 'value', value: applyOps(b, ops) })) },
    { weight: 1, arbitrary: deepBody(base).map((text): Body => ({ kind: 'text', text, type: 'application/json' })) },
    { weight: 1, arbitrary: hugeNumberBody(base).map((text): Body => ({ kind: 'text', text, type: 'application/json' })) },
    { weight: 1, arbitrary: wrongTypes(base).map((value): Body => ({ kind: 'value', value })) },
    { weight: 2, arbitrary: mutatedText(base).map((text): Body => ({ kind: 'text', text, type: 'application/json' })) },
    { weight: 1, arbitrary: hostileValue.map((v): Body => ({ kind: 'text', text: JSON.stringify(v) ?? 'undefined', type: 'application/json' })) },
    {
      weight: 1,
      arbitrary: fc.tuple(base, fc.constantFrom('text/plain', 'application/x-www-form-urlencoded', 'multipart/form-data; boundary=x', 'application/json; charset=utf-7')).map(
        ([v, type]): Body => ({ kind: 'text', text: type.startsWith('application/x-www') ? urlEncoded(v) : (JSON.stringify(v) ?? ''), type }),
      ),
    },
  );
}

/** Files for the upload route: whole, cut or flipped PDFs and images, random bytes; awkward names. */
const files: fc.Arbitrary<Body> = fc
  .tuple(
    fc.oneof(
      fc.constantFrom(pdf('Fuzzed data sheet'), png(4, 3), jpeg(3, 2)),
      fc.uint8Array({ maxLength: 600 }).map((b) => Buffer.from(b)),
      fc.tuple(fc.constantFrom(pdf('cut'), png(4, 3)), fc.nat(), fc.nat({ max: 255 })).map(([b, at, v]) => {
        const copy = Buffer.from(b);
        copy[at % copy.length] = v;
        return at % 3 === 0 ? copy.subarray(0, at % copy.length) : copy;
      }),
    ),
    fc.oneof(fc.constantFrom('datasheet.pdf', 'photo.jpg', '../../etc/passwd', 'con.pdf', 'a\u0000b.pdf', 'x\ud83d.png', '.hidden', '', 'report.pdf.exe'), fc.string({ unit: 'grapheme', maxLength: 40 })),
    fc.constantFrom('application/pdf', 'image/png', 'application/octet-stream', 'text/html'),
  )
  .map(([bytes, name, type]): Body => ({ kind: 'file', name, bytes, type }));

// ---------------------------------------------------------------------------------------------------
// Routes

interface Case {
  route: string;
  agent: () => Agent;
  method: 'post' | 'patch' | 'put' | 'delete';
  url: () => string;
  body: fc.Arbitrary<Body>;
  /** Fill in what a body needs at send time (the current version of a working copy). */
  prepare?: (value: Record<string, unknown>) => Promise<void>;
}

const json = (schema: z.ZodType, example: unknown) => bodies(fromZod(schema, example));
const stats = { requests: 0, accepted: 0, rejected: 0, byStatus: {} as Record<number, number>, byRoute: {} as Record<string, number>, writesChecked: 0 };

async function send(c: Case, body: Body) {
  if (body.kind === 'value' && c.prepare && body.value && typeof body.value === 'object' && !Array.isArray(body.value)) await c.prepare(body.value as Record<string, unknown>);
  const x0 = lastXid ?? (await nextXid());
  lastXid = null;
  const files0 = body.kind === 'file' ? await storedFiles() : 0;
  const req = c.agent()[c.method](c.url());
  let res;
  if (body.kind === 'file') {
    const { body: data, type } = multipart(body.name, body.bytes, body.type);
    res = await req.set('Content-Type', type).send(data);
  } else if (body.kind === 'value') {
    // supertest sends objects and arrays as JSON; any other top-level value goes as its JSON text.
    res = body.value !== null && typeof body.value === 'object' ? await req.send(body.value as object) : await req.set('Content-Type', 'application/json').send(JSON.stringify(body.value) ?? '');
  } else {
    res = await req.set('Content-Type', body.type).send(body.text);
  }
  stats.requests++;
  stats.byStatus[res.status] = (stats.byStatus[res.status] ?? 0) + 1;
  stats.byRoute[c.route] = (stats.byRoute[c.route] ?? 0) + 1;
  const where = `${c.route} -> ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`;
  expect(res.status, where).toBeLessThan(500);
  if (res.status < 400) {
    stats.accepted++;
    counts = null;
    return;
  }
  stats.rejected++;
  expect(res.body?.error?.code, where).toMatch(/^[a-z_]+$/);
  expect(typeof res.body.error.message, where).toBe('string');
  expect(res.body.error.message.length, where).toBeGreaterThan(0);
  expect(res.text, where).not.toMatch(STACK);
  if (body.kind === 'file') expect(await storedFiles(), `${where}: a refused upload left its bytes in storage`).toBe(files0);
  const x1 = await nextXid();
  lastXid = x1;
  if (x1 !== x0) {
    // Something wrote (a limiter's counters on a shared PostgreSQL do): no application row may come from it.
    stats.writesChecked++;
    const after = await writesSince(x0);
    for (const [table, { written, count }] of Object.entries(after)) {
      expect(written, `${where}: a rejected request wrote to ${table}`).toBe(0);
      if (counts && counts.at === x0) expect(count, `${where}: a rejected request removed rows of ${table}`).toBe(counts.byTable[table]);
    }
    counts = { at: x1, byTable: Object.fromEntries(Object.entries(after).map(([k, v]) => [k, v.count])) };
  } else if (counts && counts.at !== x0) {
    counts = null; // something else wrote since the counts were taken
  }
}

const STACK = /\bat .+\.(js|ts|mjs):\d+|node_modules|\n\s+at /;

async function run(cases: Case[], numRuns: number) {
  await fc.assert(
    fc.asyncProperty(fc.integer({ min: 0, max: cases.length - 1 }).chain((i) => fc.tuple(fc.constant(cases[i]!), cases[i]!.body)), async ([c, body]) => {
      await send(c, body);
    }),
    { numRuns, endOnFailure: true },
  );
}

let seq = 0;
const uniq = (p: string) => `${p}${++seq}`;
const LIBRARY_FUSE = { kind: 'fuse', name: 'Class T 400 A', manufacturer: 'Breakwater Protection', partNumber: 'BW-T400', props: { fuseClass: 'class_t', rating_A: 400, voltage_rating_V: 160, interrupting_A: 20000 } };
const LIBRARY_CSV = 'kind,name,chemistry,nominal_V,capacity_Ah,r_internal_ohm,conductor,fuseClass,rating_A,voltage_rating_V,interrupting_A\nbattery,Import LFP 280 Ah,lfp,12.8,280,0.002,,,,,';
const DOCS = fc.oneof(
  fc.integer({ min: 1, max: 3 }).map((count) => busbarBankTemplate({ count })),
  fc.integer({ min: 1, max: 3 }).map((count) => postToPostTemplate({ count, takeOff: 'diagonal' })),
);
const MISSING = 'no-such-id-0000000000';

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-fuzz-'));
  // The limiters are tested on their own (auth and upload tests); here they must not turn every request into 429.
  t = await makeTestApp({
    config: { dataDir, uploadQuota: { teamBytes: 1024 ** 3, ratePerUser: 1_000_000, rateWindowSeconds: 60 } },
    limiter: { accountMaxFailures: 1e9, ipMaxFailures: 1e9, accountAllClientsMaxFailures: 1e9, deviceMaxFailures: 1e9, signUpMax: 1e9 },
  });
  owner = await t.agentFor('owner');
  designer = await t.agentFor('designer');
  reviewer = await t.agentFor('reviewer');
  ids.team = (await owner.get('/api/teams')).body.teams[0].id;
  ids.fuzzTeam = (await owner.post('/api/teams').send({ name: 'Fuzz team' })).body.team.id;
  ids.project = (await designer.post('/api/projects').send({ teamId: ids.team, name: 'Fuzz project' })).body.project.id;
  ids.otherProject = (await designer.post('/api/projects').send({ teamId: ids.team, name: 'Fuzz project two' })).body.project.id;
  for (const m of (await designer.get(`/api/teams/${ids.team}/members`)).body.members) if (m.email.startsWith('reviewer@')) ids.reviewer = m.userId;
  else if (m.email.startsWith('designer@')) ids.designer = m.userId;
  pwUser = t.agent();
  expect((await pwUser.post('/api/auth/sign-up').send({ email: 'pw-fuzz@example.test', password: 'pw fuzz password', name: 'Pw Fuzz' })).status).toBe(201);
  ids.diagram = (await designer.post(`/api/projects/${ids.project}/diagrams`).send({ name: 'Fuzz diagram', content: busbarBankTemplate({ count: 2 }) })).body.diagram.id;
  expect((await designer.post(`/api/diagrams/${ids.diagram}/revisions`).send({ baseRevision: null, message: 'first', content: busbarBankTemplate({ count: 2 }) })).status).toBe(201);
  ids.comment = (await designer.post(`/api/diagrams/${ids.diagram}/revisions/1/comments`).send({ body: 'Check the lug torque' })).body.comment.id;
  expect((await designer.post(`/api/diagrams/${ids.diagram}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer] })).status).toBe(200);
  ids.libraryItem = (await designer.post(`/api/teams/${ids.team}/library`).send(LIBRARY_FUSE)).body.item.id;
  tables = (await rows<{ t: string }>(`select table_name as t from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`)).map((r) => r.t);
});
afterAll(async () => {
  await t?.close();
  if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
});

const rev = () => `/api/diagrams/${ids.diagram}/revisions/1`;

function lightCases(): Case[] {
  return [
    { route: 'POST /api/teams', agent: () => owner, method: 'post', url: () => '/api/teams', body: json(createTeamSchema, { name: 'Tern Point Marine', unitSystem: 'us' }) },
    { route: 'PATCH /api/teams/:teamId', agent: () => owner, method: 'patch', url: () => `/api/teams/${ids.fuzzTeam}`, body: json(updateTeamSchema, { name: 'Renamed fuzz team', unitSystem: 'metric' }) },
    { route: 'DELETE /api/teams/:teamId', agent: () => owner, method: 'delete', url: () => `/api/teams/${MISSING}`, body: json(createTeamSchema, { name: 'x' }) },
    { route: 'PATCH /api/teams/:teamId/members/:userId', agent: () => owner, method: 'patch', url: () => `/api/teams/${ids.fuzzTeam}/members/${MISSING}`, body: json(changeRoleSchema, { role: 'viewer' }) },
    { route: 'DELETE /api/teams/:teamId/members/:userId', agent: () => owner, method: 'delete', url: () => `/api/teams/${ids.fuzzTeam}/members/${MISSING}`, body: json(changeRoleSchema, { role: 'viewer' }) },
    {
      route: 'POST /api/teams/:teamId/invites', agent: () => owner, method: 'post', url: () => `/api/teams/${ids.fuzzTeam}/invites`,
      body: bodies(fc.constantFrom('viewer', 'designer', 'owner').chain((role) => fromZod(inviteSchema, { email: `${uniq('invitee')}@example.test`, role }))),
    },
    { route: 'DELETE /api/teams/:teamId/invites/:inviteId', agent: () => owner, method: 'delete', url: () => `/api/teams/${ids.fuzzTeam}/invites/${MISSING}`, body: json(changeRoleSchema, { role: 'viewer' }) },
    { route: 'POST /api/invites/accept', agent: () => designer, method: 'post', url: () => '/api/invites/accept', body: json(acceptInviteSchema, { token: 'a'.repeat(43) }) },
    { route: 'POST /api/projects', agent: () => designer, method: 'post', url: () => '/api/projects', body: json(createProjectSchema, { teamId: ids.team, name: 'Skua Rock weather station', site: 'Skua Rock', description: '24 V, two strings' }) },
    { route: 'PATCH /api/projects/:id', agent: () => designer, method: 'patch', url: () => `/api/projects/${ids.project}`, body: json(updateProjectSchema, { name: 'Fuzz project', site: 'Dock 4', description: 'd' }) },
    { route: 'DELETE /api/projects/:id', agent: () => designer, method: 'delete', url: () => `/api/projects/${MISSING}`, body: json(updateProjectSchema, { name: 'x' }) },
    { route: 'PATCH /api/account', agent: () => designer, method: 'patch', url: () => '/api/account', body: json(updateAccountSchema, { name: 'Tomas Reyes' }) },
    { route: 'DELETE /api/account/sessions/:id', agent: () => designer, method: 'delete', url: () => `/api/account/sessions/${MISSING}`, body: json(updateAccountSchema, { name: 'x' }) },
    { route: 'PATCH /api/account/preferences', agent: () => designer, method: 'patch', url: () => '/api/account/preferences', body: json(preferencesSchema, { unitSystem: 'us' }) },
    { route: 'POST /api/notifications/read', agent: () => designer, method: 'post', url: () => '/api/notifications/read', body: json(markNotificationsReadSchema, { all: true }) },
    { route: 'POST /api/auth/sign-out', agent: () => t.agent(), method: 'post', url: () => '/api/auth/sign-out', body: json(updateAccountSchema, {}) },
    { route: 'POST /api/teams/:teamId/library', agent: () => designer, method: 'post', url: () => `/api/teams/${ids.team}/library`, body: json(createLibraryItemSchema, LIBRARY_FUSE) },
    { route: 'POST /api/teams/:teamId/library/import', agent: () => designer, method: 'post', url: () => `/api/teams/${ids.team}/library/import`, body: json(importLibrarySchema, { csv: LIBRARY_CSV, mode: 'valid_rows' }) },
    { route: 'PATCH /api/teams/:teamId/library/:itemId', agent: () => designer, method: 'patch', url: () => `/api/teams/${ids.team}/library/${ids.libraryItem}`, body: json(updateLibraryItemSchema, { name: 'Class T 400 A (spare)', props: LIBRARY_FUSE.props }) },
    { route: 'DELETE /api/teams/:teamId/library/:itemId', agent: () => designer, method: 'delete', url: () => `/api/teams/${ids.team}/library/${MISSING}`, body: json(updateLibraryItemSchema, { name: 'x' }) },
    { route: 'PATCH /api/diagrams/:id', agent: () => designer, method: 'patch', url: () => `/api/diagrams/${ids.diagram}`, body: json(updateDiagramSchema, { name: 'Fuzz diagram', description: 'House bank' }) },
    { route: 'DELETE /api/diagrams/:id', agent: () => designer, method: 'delete', url: () => `/api/diagrams/${MISSING}`, body: json(updateDiagramSchema, { name: 'x' }) },
    { route: 'POST /api/diagrams/:id/duplicate', agent: () => designer, method: 'post', url: () => `/api/diagrams/${ids.diagram}/duplicate`, body: json(duplicateDiagramSchema, { name: 'Fuzz duplicate', description: '', revision: 1 }) },
    { route: 'POST /api/diagrams/:id/move', agent: () => designer, method: 'post', url: () => `/api/diagrams/${ids.diagram}/move`, body: bodies(fc.constantFrom(ids.project, ids.otherProject).chain((projectId) => fromZod(moveDiagramSchema, { projectId }))) },
    { route: 'POST /api/diagrams/:id/copy', agent: () => designer, method: 'post', url: () => `/api/diagrams/${ids.diagram}/copy`, body: json(copyDiagramSchema, { projectId: ids.otherProject, name: 'Fuzz copy' }) },
    { route: 'POST /api/diagrams/:id/revisions/:n/restore', agent: () => designer, method: 'post', url: () => `${rev()}/restore`, body: json(restoreRevisionSchema, { message: 'Back to the first' }) },
    { route: 'POST /api/diagrams/:id/revisions/:n/review-requests', agent: () => designer, method: 'post', url: () => `${rev()}/review-requests`, body: json(reviewRequestSchema, { reviewerIds: [ids.reviewer] }) },
    { route: 'POST /api/diagrams/:id/revisions/:n/comments', agent: () => designer, method: 'post', url: () => `${rev()}/comments`, body: json(commentSchema, { body: 'Torque to 12 N·m', partId: 'b1', parentId: ids.comment }) },
    { route: 'PATCH /api/diagrams/:id/revisions/:n/comments/:commentId', agent: () => designer, method: 'patch', url: () => `${rev()}/comments/${ids.comment}`, body: json(resolveCommentSchema, { resolved: true }) },
    { route: 'POST /api/diagrams/:id/revisions/:n/decision', agent: () => reviewer, method: 'post', url: () => `${rev()}/decision`, body: json(decisionSchema, { decision: 'request_changes', note: 'Fuse at each post' }) },
    { route: 'POST /api/projects/:id/uploads', agent: () => designer, method: 'post', url: () => `/api/projects/${ids.project}/uploads`, body: files },
    { route: 'DELETE /api/uploads/:id', agent: () => designer, method: 'delete', url: () => `/api/uploads/${MISSING}`, body: json(updateAccountSchema, { name: 'x' }) },
  ];
}

async function currentVersion(): Promise<number> {
  const [r] = await rows<{ v: number }>(`select working_copy_version as v from diagrams where id = '${ids.diagram}'`);
  return r!.v;
}
async function latestRevision(): Promise<number | null> {
  const [r] = await rows<{ n: number | null }>(`select max(number) as n from diagram_revisions where diagram_id = '${ids.diagram}'`);
  return r?.n ?? null;
}

function documentCases(): Case[] {
  const fillVersion = async (v: Record<string, unknown>) => {
    if (v.baseVersion === '__current__') v.baseVersion = await currentVersion();
  };
  return [
    { route: 'POST /api/projects/:id/diagrams', agent: () => designer, method: 'post', url: () => `/api/projects/${ids.project}/diagrams`, body: bodies(DOCS.chain((content) => fromZod(createDiagramSchema, { name: 'Fuzzed diagram', description: '', content }))) },
    {
      route: 'PUT /api/diagrams/:id/working-copy', agent: () => designer, method: 'put', url: () => `/api/diagrams/${ids.diagram}/working-copy`, prepare: fillVersion,
      body: bodies(DOCS.chain((content) => fromZod(workingCopySchema, { content, baseVersion: '__current__' }).map((v) => ({ ...(v as object), content, baseVersion: '__current__' })))),
    },
    {
      route: 'POST /api/diagrams/:id/revisions', agent: () => designer, method: 'post', url: () => `/api/diagrams/${ids.diagram}/revisions`,
      prepare: async (v) => {
        if (v.baseRevision === '__latest__') v.baseRevision = await latestRevision();
      },
      body: bodies(DOCS.chain((content) => fromZod(saveRevisionSchema, { baseRevision: '__latest__', message: 'fuzz', content }).map((v) => ({ ...(v as object), content, baseRevision: '__latest__' })))),
    },
    {
      route: 'PUT /api/diagrams/:id/annotations', agent: () => designer, method: 'put', url: () => `/api/diagrams/${ids.diagram}/annotations`, prepare: fillVersion,
      body: json(annotationsBodySchema, { annotations: [{ id: 'note-1', kind: 'callout', text: 'Main fuse here', at: { x: 10, y: 20 } }], baseVersion: '__current__' }),
    },
    { route: 'POST /api/diagrams/:id/check', agent: () => designer, method: 'post', url: () => `/api/diagrams/${ids.diagram}/check`, body: bodies(DOCS.chain((content) => fromZod(checkOptionsSchema, { mode: 'load', content }))) },
  ];
}

function passwordCases(): Case[] {
  return [
    { route: 'POST /api/auth/sign-up', agent: () => t.agent(), method: 'post', url: () => '/api/auth/sign-up', body: bodies(fc.constant(null).chain(() => fromZod(signUpSchema, { email: `${uniq('new')}@example.test`, password: 'a long enough password', name: 'New Person' }))) },
    { route: 'POST /api/auth/sign-in', agent: () => t.agent(), method: 'post', url: () => '/api/auth/sign-in', body: json(signInSchema, { email: 'viewer@demo.test', password: 'bankwright-demo' }) },
    { route: 'POST /api/account/password', agent: () => pwUser, method: 'post', url: () => '/api/account/password', body: json(changePasswordSchema, { currentPassword: 'pw fuzz password', newPassword: 'pw fuzz password', endOtherSessions: false }) },
    // The example is the account's own address (a change to it changes nothing); generated addresses move the account, whose session goes on.
    { route: 'PATCH /api/account/email', agent: () => pwUser, method: 'patch', url: () => '/api/account/email', body: json(changeEmailSchema, { email: 'pw-fuzz@example.test', currentPassword: 'pw fuzz password' }) },
  ];
}

describe('fuzz: every mutating API route', () => {
  const started = Date.now();

  it(`${API_RUNS.light} generated and mutated bodies on team, invite, project, account, library, review, diagram and upload routes`, async () => {
    await run(lightCases(), API_RUNS.light);
    expect(stats.rejected).toBeGreaterThan(API_RUNS.light / 4);
    expect(stats.accepted).toBeGreaterThan(API_RUNS.light / 20);
  }, RUN_TIMEOUT_MS);

  it(`${API_RUNS.documents} generated and mutated diagram documents on create, working copy, revisions, annotations and check`, async () => {
    await run(documentCases(), API_RUNS.documents);
  }, RUN_TIMEOUT_MS);

  it(`${API_RUNS.passwords} on sign-up, sign-in, password and e-mail change`, async () => {
    await run(passwordCases(), API_RUNS.passwords);
  }, RUN_TIMEOUT_MS);

  it('covered every mutating route, and reports its counts', () => {
    const total = API_RUNS.light + API_RUNS.documents + API_RUNS.passwords;
    expect(stats.requests).toBe(total);
    const routes = [...lightCases(), ...documentCases(), ...passwordCases()].map((c) => c.route);
    for (const r of routes) expect(stats.byRoute[r] ?? 0, `${r} was never sent a body`).toBeGreaterThan(0);
    // Printed for docs/reliability.md.
    console.log(`[fuzz:api] ${JSON.stringify({ ...stats, seconds: Math.round((Date.now() - started) / 1000) })}`);
  });
});
