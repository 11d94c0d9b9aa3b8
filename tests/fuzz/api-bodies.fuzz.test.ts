/**
 * Fuzzing the API's mutation routes with generated and mutated bodies against the real app (supertest,
 * a fresh database). For every request: never a 5xx; every rejection is a 4xx with
 * {"error":{"code","message"}} and no stack trace; and a rejected request stores nothing (a fingerprint
 * of every table's full contents is equal before and after).
 */
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { busbarBankTemplate, postToPostTemplate } from '../../shared/diagram/templates';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { hostileValue, mutatedText, mutatedValue, scaled } from './mutate';

/** Cases per route group; the total is recorded in docs/reliability.md. */
export const API_RUNS = scaled({ cheap: 900, argon: 100, diagrams: 400 });

let t: TestApp;
let owner: Agent;
let designer: Agent;
let pwUser: Agent;
let teamId: string;
let fuzzTeamId: string;
let projectId: string;
let diagramId: string | null = null;
let tables: string[] = [];

let fingerprintSql = '';

/**
 * One hash per table of its full contents, in one query. jsonb columns (whole diagram documents) count
 * by their stored size, which is far cheaper than their text and still changes with any edit that
 * matters here (rows added, removed, or rewritten with other content).
 */
async function fingerprint(): Promise<Record<string, string>> {
  const q = fingerprintSql;
  const res = (await t.db.execute(sql.raw(q))) as unknown as { rows: { t: string; h: string }[] };
  return Object.fromEntries(res.rows.map((r) => [r.t, r.h]));
}

const STACK = /\bat .+\.(js|ts|mjs):\d+|node_modules|\n\s+at /;

interface Case {
  route: string;
  agent: () => Agent;
  method: 'post' | 'patch' | 'put';
  url: () => string | Promise<string>;
  base: fc.Arbitrary<unknown>;
}

type Body = { kind: 'value'; value: unknown } | { kind: 'text'; text: string; type: string };

/** A mutated JSON value, a damaged JSON text, a hostile top-level value, or the right fields in another content type. */
function bodies(base: fc.Arbitrary<unknown>): fc.Arbitrary<Body> {
  return fc.oneof(
    { weight: 6, arbitrary: mutatedValue(base).map((value): Body => ({ kind: 'value', value })) },
    { weight: 2, arbitrary: mutatedText(base).map((text): Body => ({ kind: 'text', text, type: 'application/json' })) },
    { weight: 1, arbitrary: hostileValue.map((v): Body => ({ kind: 'text', text: JSON.stringify(v) ?? 'undefined', type: 'application/json' })) },
    {
      weight: 1,
      arbitrary: fc.tuple(base, fc.constantFrom('text/plain', 'application/x-www-form-urlencoded', 'multipart/form-data; boundary=x', 'application/json; charset=utf-7')).map(
        ([v, type]): Body => ({ kind: 'text', text: type.startsWith('application/x-www') ? new URLSearchParams(v as Record<string, string>).toString() : JSON.stringify(v), type }),
      ),
    },
  );
}

const stats = { requests: 0, accepted: 0, rejected: 0, byStatus: {} as Record<number, number> };

async function send(c: Case, body: Body) {
  const url = await c.url();
  const before = await fingerprint();
  const req = c.agent()[c.method](url);
  // supertest sends objects and arrays as JSON; any other top-level value goes as its JSON text.
  const res =
    body.kind === 'value' && body.value !== null && typeof body.value === 'object'
      ? await req.send(body.value as object)
      : body.kind === 'value'
        ? await req.set('Content-Type', 'application/json').send(JSON.stringify(body.value) ?? '')
        : await req.set('Content-Type', body.type).send(body.text);
  stats.requests++;
  stats.byStatus[res.status] = (stats.byStatus[res.status] ?? 0) + 1;
  const where = `${c.route} -> ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`;
  expect(res.status, where).toBeLessThan(500);
  if (res.status >= 400) {
    stats.rejected++;
    expect(res.body?.error?.code, where).toMatch(/^[a-z_]+$/);
    expect(typeof res.body.error.message, where).toBe('string');
    expect(res.body.error.message.length, where).toBeGreaterThan(0);
    expect(res.text, where).not.toMatch(STACK);
    expect(await fingerprint(), `${where}: a rejected request changed the database`).toEqual(before);
  } else {
    stats.accepted++;
  }
}

let seq = 0;
const uniq = (p: string) => `${p}${++seq}`;

beforeAll(async () => {
  // The limiter is tested on its own (tests/integration/auth.test.ts); here it must not turn every sign-in into 429.
  t = await makeTestApp({ limiter: { accountMaxFailures: 1e9, ipMaxFailures: 1e9 } });
  owner = await t.agentFor('owner');
  designer = await t.agentFor('designer');
  teamId = (await owner.get('/api/teams')).body.teams[0].id;
  fuzzTeamId = (await owner.post('/api/teams').send({ name: 'Fuzz team' })).body.team.id;
  projectId = (await designer.post('/api/projects').send({ teamId, name: 'Fuzz project' })).body.project.id;
  pwUser = t.agent();
  expect((await pwUser.post('/api/auth/sign-up').send({ email: 'pw-fuzz@example.test', password: 'pw fuzz password', name: 'Pw Fuzz' })).status).toBe(201);
  const created = await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'Fuzz diagram', content: busbarBankTemplate({ count: 2 }) });
  if (created.status === 201) diagramId = created.body.diagram.id;
  const res = (await t.db.execute(sql.raw(`select table_name as t from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`))) as unknown as { rows: { t: string }[] };
  tables = res.rows.map((r) => r.t);
  const cols = (await t.db.execute(
    sql.raw(`select table_name as t, column_name as c, data_type as d from information_schema.columns where table_schema = 'public' order by table_name, ordinal_position`),
  )) as unknown as { rows: { t: string; c: string; d: string }[] };
  fingerprintSql = tables
    .map((name) => {
      const row = cols.rows.filter((c) => c.t === name).map((c) => (c.d === 'jsonb' || c.d === 'json' ? `pg_column_size(x."${c.c}")::text` : `coalesce(x."${c.c}"::text, '∅')`));
      const expr = `concat_ws('¦', ${row.join(', ')})`;
      return `select '${name}' as t, count(*)::text || ':' || md5(coalesce(string_agg(${expr}, '|' order by ${expr}), '')) as h from "${name}" x`;
    })
    .join(' union all ');
});
afterAll(async () => {
  await t?.close();
});

const CHEAP: Case[] = [
  { route: 'POST /api/teams', agent: () => owner, method: 'post', url: () => '/api/teams', base: fc.constant({ name: 'Tern Point Marine', unitSystem: 'us' }) },
  { route: 'PATCH /api/teams/:id', agent: () => owner, method: 'patch', url: () => `/api/teams/${fuzzTeamId}`, base: fc.constant({ name: 'Renamed fuzz team', unitSystem: 'metric' }) },
  {
    route: 'POST /api/teams/:id/invites', agent: () => owner, method: 'post', url: () => `/api/teams/${fuzzTeamId}/invites`,
    base: fc.constantFrom('viewer', 'designer', 'owner').map((role) => ({ email: `${uniq('invitee')}@example.test`, role })),
  },
  { route: 'POST /api/invites/accept', agent: () => designer, method: 'post', url: () => '/api/invites/accept', base: fc.constant({ token: 'a'.repeat(43) }) },
  {
    route: 'POST /api/projects', agent: () => designer, method: 'post', url: () => '/api/projects',
    base: fc.constant(null).map(() => ({ teamId, name: 'Skua Rock weather station', site: 'Skua Rock', description: '24 V, two strings' })),
  },
  { route: 'PATCH /api/projects/:id', agent: () => designer, method: 'patch', url: () => `/api/projects/${projectId}`, base: fc.constant({ name: 'Fuzz project', site: 'Dock 4', description: 'd' }) },
  { route: 'PATCH /api/account', agent: () => designer, method: 'patch', url: () => '/api/account', base: fc.constant({ name: 'Tomas Reyes' }) },
];

const ARGON: Case[] = [
  {
    route: 'POST /api/auth/sign-up', agent: () => t.agent(), method: 'post', url: () => '/api/auth/sign-up',
    base: fc.constant(null).map(() => ({ email: `${uniq('new')}@example.test`, password: 'a long enough password', name: 'New Person' })),
  },
  { route: 'POST /api/auth/sign-in', agent: () => t.agent(), method: 'post', url: () => '/api/auth/sign-in', base: fc.constant({ email: 'viewer@demo.test', password: 'bankwright-demo' }) },
  {
    route: 'POST /api/account/password', agent: () => pwUser, method: 'post', url: () => '/api/account/password',
    base: fc.constant({ currentPassword: 'pw fuzz password', newPassword: 'pw fuzz password', endOtherSessions: false }),
  },
];

async function workingCopyVersion(): Promise<number> {
  const res = await designer.get(`/api/diagrams/${diagramId}`);
  return res.body.diagram.workingCopyVersion;
}

const DIAGRAM_DOCS = fc.oneof(
  fc.integer({ min: 1, max: 4 }).map((count) => busbarBankTemplate({ count })),
  fc.integer({ min: 1, max: 4 }).map((count) => postToPostTemplate({ count, takeOff: 'diagonal' })),
);

function runCases(cases: Case[], numRuns: number) {
  return fc.assert(
    fc.asyncProperty(fc.integer({ min: 0, max: cases.length - 1 }).chain((i) => fc.tuple(fc.constant(cases[i]), bodies(cases[i].base))), async ([c, body]) => {
      await send(c, body);
    }),
    { numRuns, endOnFailure: true },
  );
}

describe('fuzz: API bodies', () => {
  it(`${API_RUNS.cheap} mutated bodies on team, invite, project and account routes: 4xx with the error shape, nothing stored`, async () => {
    await runCases(CHEAP, API_RUNS.cheap);
    expect(stats.rejected).toBeGreaterThan(API_RUNS.cheap / 4);
    expect(stats.accepted).toBeGreaterThan(0);
  });

  it(`${API_RUNS.argon} mutated bodies on sign-up, sign-in and password change`, async () => {
    await runCases(ARGON, API_RUNS.argon);
  });

  it(`${API_RUNS.diagrams} mutated diagram documents on create, working copy and revisions`, async (ctx) => {
    if (!diagramId) ctx.skip(); // POST /api/projects/:id/diagrams is missing: nothing to fuzz yet
    const hasRevisions = (await designer.get(`/api/diagrams/${diagramId}/revisions`)).status === 200;
    const cases: Case[] = [
      {
        route: 'POST /api/projects/:id/diagrams', agent: () => designer, method: 'post', url: () => `/api/projects/${projectId}/diagrams`,
        base: DIAGRAM_DOCS.map((content) => ({ name: 'Fuzzed diagram', description: '', content })),
      },
      {
        route: 'PUT /api/diagrams/:id/working-copy', agent: () => designer, method: 'put', url: () => `/api/diagrams/${diagramId}/working-copy`,
        // The current version, fetched per case by the body below, so the content itself is what gets tested.
        base: DIAGRAM_DOCS.map((content) => ({ content, baseVersion: '__current__' })),
      },
      ...(hasRevisions
        ? [
            {
              route: 'POST /api/diagrams/:id/revisions', agent: () => designer, method: 'post' as const, url: () => `/api/diagrams/${diagramId}/revisions`,
              base: DIAGRAM_DOCS.map((content) => ({ baseRevision: '__latest__', message: 'fuzz', content })),
            },
          ]
        : []),
    ];
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: cases.length - 1 }).chain((i) => fc.tuple(fc.constant(cases[i]), bodies(cases[i].base))), async ([c, body]) => {
        if (body.kind === 'value' && body.value && typeof body.value === 'object') {
          const v = body.value as Record<string, unknown>;
          if (v.baseVersion === '__current__') v.baseVersion = await workingCopyVersion();
          if (v.baseRevision === '__latest__') {
            const list = (await designer.get(`/api/diagrams/${diagramId}/revisions`)).body.revisions as { number: number }[];
            v.baseRevision = list.length ? Math.max(...list.map((r) => r.number)) : null;
          }
        }
        await send(c, body);
      }),
      { numRuns: API_RUNS.diagrams, endOnFailure: true },
    );
  });

  it('reports its counts', () => {
    // Printed for docs/reliability.md.
    console.log(`[fuzz:api] ${JSON.stringify(stats)}`);
    expect(stats.requests).toBeGreaterThan(0);
  });
});
