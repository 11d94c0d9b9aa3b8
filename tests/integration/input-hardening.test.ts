/**
 * The input rules applied to every JSON body at the edge (shared/schemas/text.ts, server/http/middleware.ts)
 * and the structured request log (server/http/logger.ts): what the schemas accept is stored as sent,
 * everything else is a 400 naming the field; log lines carry ids and codes, never documents, bodies or
 * query strings.
 */
import http from 'node:http';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { busbarBankTemplate } from '../../shared/diagram/templates';
import { findInputProblems, MAX_JSON_DEPTH } from '../../shared/schemas/text';
import { createApp } from '../../server/app';
import { testConfig } from '../../server/config';
import { diagrams } from '../../server/db/schema';
import { seedDemo } from '../../server/db/demo-data';
import { createLogger, errorSummary } from '../../server/http/logger';
import { createOutboxMailer } from '../../server/mail/mailer';
import { createTestDatabase, type TestDatabase } from '../helpers/db';
import { DEMO_PASSWORD, TEST_ORIGIN } from '../helpers/app';

type Agent = ReturnType<typeof request.agent>;

let database: TestDatabase;
let server: http.Server;
let designer: Agent;
let projectId: string;
let diagramId: string;
/** Every line the app's logger wrote, parsed. */
const lines: Record<string, unknown>[] = [];
const raw: string[] = [];

beforeAll(async () => {
  database = await createTestDatabase();
  await seedDemo(database.db, DEMO_PASSWORD);
  const logger = createLogger('info', {
    write(line: string) {
      raw.push(line);
      lines.push(JSON.parse(line));
    },
  });
  const app = createApp({ db: database.db, mailer: createOutboxMailer(database.db), config: testConfig({ appOrigin: TEST_ORIGIN }), logger });
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
  designer = request.agent(base).set('Origin', TEST_ORIGIN);
  expect((await designer.post('/api/auth/sign-in').send({ email: 'designer@demo.test', password: DEMO_PASSWORD })).status).toBe(200);
  const teamId = (await designer.get('/api/teams')).body.teams[0].id;
  projectId = (await designer.post('/api/projects').send({ teamId, name: 'Input rules project' })).body.project.id;
  diagramId = (await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'Input rules diagram', content: busbarBankTemplate({ count: 2 }) })).body.diagram.id;
});
afterAll(async () => {
  server?.closeAllConnections();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  await database?.destroy();
});

async function stored() {
  const [row] = await database.db.select({ name: diagrams.name, content: diagrams.content, version: diagrams.workingCopyVersion }).from(diagrams).where(eq(diagrams.id, diagramId));
  return row!;
}

/** `depth` levels of {"n": …} around `leaf`. */
function nested(depth: number, leaf: unknown): unknown {
  let v = leaf;
  for (let i = 0; i < depth; i++) v = { n: v };
  return v;
}

const withAnnotation = (extra: Record<string, unknown>) => ({ ...busbarBankTemplate({ count: 2 }), annotations: [{ id: 'note-1', kind: 'site-survey', ...extra }] });

describe('input rules on every JSON body', () => {
  it('a lone UTF-16 surrogate in a diagram name is 400 validation_failed naming the field (it was a 500), and nothing changes', async () => {
    const before = await stored();
    const res = await designer.patch(`/api/diagrams/${diagramId}`).set('Content-Type', 'application/json').send('{"name":"\\ud83d"}');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields).toEqual({ name: ['Text contains an incomplete character (a lone UTF-16 surrogate); retype or paste it again'] });
    expect(await stored()).toEqual(before);
    // The low half alone, inside a longer text, in another route's body.
    const project = await designer.patch(`/api/projects/${projectId}`).set('Content-Type', 'application/json').send('{"description":"Dock \\udc00 4"}');
    expect(project.status).toBe(400);
    expect(Object.keys(project.body.error.details.fields)).toEqual(['description']);
  });

  it('a NUL 70 levels deep inside an annotation of an unknown kind is 400 naming its path (it was a 500), on every document route', async () => {
    const content = withAnnotation({ survey: nested(70, 'x\u0000y') });
    const path = `content.annotations.0.survey${'.n'.repeat(70)}`;
    const before = await stored();
    const put = await designer.put(`/api/diagrams/${diagramId}/working-copy`).send({ content, baseVersion: before.version });
    expect(put.status).toBe(400);
    expect(put.body.error.details.fields).toEqual({ [path]: ['Text must not contain NUL characters'] });
    const created = await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'Deep NUL', content });
    expect(created.status).toBe(400);
    expect(Object.keys(created.body.error.details.fields)).toEqual([path]);
    const revision = await designer.post(`/api/diagrams/${diagramId}/revisions`).send({ baseRevision: null, content });
    expect(revision.status).toBe(400);
    expect(await stored()).toEqual(before);
    const diagramsNamed = (await designer.get(`/api/projects/${projectId}/diagrams`)).body.diagrams.filter((d: { name: string }) => d.name === 'Deep NUL');
    expect(diagramsNamed).toEqual([]);
  });

  it('a NUL or lone surrogate in a field name, and a number too large for JSON, are refused with the field named', async () => {
    const version = (await stored()).version;
    const key = await designer
      .put(`/api/diagrams/${diagramId}/working-copy`)
      .set('Content-Type', 'application/json')
      .send(`{"baseVersion":${version},"content":${JSON.stringify(withAnnotation({})).replace('"kind"', '"tag\\ud800":1,"kind"')}}`);
    expect(key.status).toBe(400);
    expect(key.body.error.details.fields).toEqual({ 'content.annotations.0.tag\\ud800': ['Field names must not contain incomplete characters (lone UTF-16 surrogates)'] });
    const huge = await designer
      .put(`/api/diagrams/${diagramId}/working-copy`)
      .set('Content-Type', 'application/json')
      .send(`{"baseVersion":${version},"content":${JSON.stringify(withAnnotation({ scale: 1 })).replace('"scale":1', '"scale":1e400')}}`);
    expect(huge.status).toBe(400);
    expect(huge.body.error.details.fields).toEqual({ 'content.annotations.0.scale': ['Number is out of range (it must be finite)'] });
    expect((await stored()).version).toBe(version);
  });

  it(`nesting deeper than ${MAX_JSON_DEPTH} levels is 400 naming where it goes too deep; 200,000 levels too, without a 500`, async () => {
    const version = (await stored()).version;
    const tooDeep = await designer.put(`/api/diagrams/${diagramId}/working-copy`).send({ content: withAnnotation({ survey: nested(MAX_JSON_DEPTH, 1) }), baseVersion: version });
    expect(tooDeep.status).toBe(400);
    const [[path, messages]] = Object.entries(tooDeep.body.error.details.fields) as [string, string[]][];
    // body → content → annotations → 0 → survey is 4 levels; the object at level MAX_JSON_DEPTH is refused.
    expect(path).toBe(`content.annotations.0.survey${'.n'.repeat(MAX_JSON_DEPTH - 4)}`);
    expect(messages).toEqual([`Nested more than ${MAX_JSON_DEPTH} levels deep`]);
    const text = `{"baseVersion":${version},"content":${JSON.stringify(withAnnotation({ survey: 0 })).replace('"survey":0', `"survey":${'['.repeat(200_000)}${']'.repeat(200_000)}`)}}`;
    const extreme = await designer.put(`/api/diagrams/${diagramId}/working-copy`).set('Content-Type', 'application/json').send(text);
    expect(extreme.status).toBe(400);
    expect(extreme.body.error.code).toBe('validation_failed');
    expect((await stored()).version).toBe(version);
  });

  it('well-formed text passes unchanged: pairs, combining marks, right-to-left text, deep annotations within the limit', async () => {
    const name = 'Bank 🔋⚡ — café, Ångström, 日本語, עברית, 👩🏽‍🔧';
    const patch = await designer.patch(`/api/diagrams/${diagramId}`).send({ name });
    expect(patch.status).toBe(200);
    const survey = nested(MAX_JSON_DEPTH - 5, { note: '𝄞 e\u0301 \u202Bquoted\u202C', big: 1.7976931348623157e308, tiny: 5e-324 });
    const version = (await stored()).version;
    const put = await designer.put(`/api/diagrams/${diagramId}/working-copy`).send({ content: withAnnotation({ survey }), baseVersion: version });
    expect(put.status, JSON.stringify(put.body).slice(0, 300)).toBe(200);
    const row = await stored();
    expect(row.name).toBe(name);
    expect((row.content as { annotations: { survey: unknown }[] }).annotations[0]!.survey).toEqual(survey);
    const read = await designer.get(`/api/diagrams/${diagramId}`);
    expect(read.body.diagram.name).toBe(name);
  });

  it('findInputProblems walks without recursion and reports every kind of problem with its path', () => {
    expect(findInputProblems({ a: [1, 'ok', { b: 'x\u0000' }], c: '\udfff', d: -Infinity, e: { 'k\u0000': 1 } })).toEqual([
      { path: 'a.2.b', message: 'Text must not contain NUL characters' },
      { path: 'c', message: 'Text contains an incomplete character (a lone UTF-16 surrogate); retype or paste it again' },
      { path: 'd', message: 'Number is out of range (it must be finite)' },
      { path: 'e.k\\u0000', message: 'Field names must not contain NUL characters' },
    ]);
    expect(findInputProblems({ ok: '🔋 \ud83d\udd0b', n: [0, -0, 1e308] })).toEqual([]);
    // A million levels: no stack overflow, one problem at the first level too deep.
    let deep: unknown = 'x';
    for (let i = 0; i < 1_000_000; i++) deep = [deep];
    const problems = findInputProblems(deep);
    expect(problems).toHaveLength(1);
    expect(problems[0]!.path.split('.')).toHaveLength(MAX_JSON_DEPTH);
  });
});

describe('request log', () => {
  it('errorSummary keeps class, codes, schema names and frames; drops message, detail, where, query and params', () => {
    const cause = Object.assign(new Error('duplicate key value violates unique constraint'), {
      code: '23505',
      routine: '_bt_check_unique',
      table: 'users',
      constraint: 'users_email_unique',
      detail: 'Key (email)=(crew.lead@example.test) already exists.',
      where: 'JSON data, line 1: {"secret":',
      schema: 'public',
    });
    class FakeQueryError extends Error {}
    const err = Object.assign(new FakeQueryError('Failed query: insert into users … params: crew.lead@example.test,hunter2-password'), {
      query: 'insert into "users" values ($1, $2)',
      params: ['crew.lead@example.test', 'hunter2-password'],
      cause,
    });
    const summary = errorSummary(err)!;
    expect(summary).toMatchObject({ type: 'FakeQueryError', cause: { type: 'Error', code: '23505', routine: '_bt_check_unique', table: 'users', constraint: 'users_email_unique' } });
    expect((summary.frames as string[])[0]).toMatch(/^at .*input-hardening\.test\.ts/);
    const text = JSON.stringify(summary);
    for (const leak of ['crew.lead@example.test', 'hunter2', 'Failed query', 'duplicate key', 'secret', 'insert into']) expect(text).not.toContain(leak);
  });

  const forRequest = (id: string) => lines.filter((l) => l.reqId === id);

  it('one line per request: id (also in X-Request-Id), method, route pattern, status, duration, user id — never the query string', async () => {
    const res = await designer.get(`/api/diagrams/${diagramId}?token=query-secret-value`);
    expect(res.status).toBe(200);
    const id = res.headers['x-request-id'];
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    const other = await designer.get(`/api/diagrams/${diagramId}`);
    expect(other.headers['x-request-id']).not.toBe(id);
    const mine = forRequest(id);
    expect(mine).toHaveLength(1);
    expect(mine[0]).toMatchObject({ level: 30, req: { method: 'GET' }, res: { status: 200 }, route: '/api/diagrams/:id', ids: { id: diagramId } });
    expect(typeof mine[0]!.durationMs).toBe('number');
    expect(typeof mine[0]!.userId).toBe('string');
    expect(raw.join('')).not.toContain('query-secret-value');
    expect(raw.join('')).not.toContain('bw_session');
  });

  it('a 400 logs its status and route, not the body', async () => {
    const res = await designer.patch(`/api/projects/${projectId}`).send({ name: '', description: 'body-marker-4711' });
    expect(res.status).toBe(400);
    expect(forRequest(res.headers['x-request-id'])[0]).toMatchObject({ route: '/api/projects/:id', res: { status: 400 } });
    expect(raw.join('')).not.toContain('body-marker-4711');
  });

  it('a request that fails in the database logs the code path and ids, and no document', async () => {
    // A real failure inside the database: a constraint the working copy cannot meet.
    await database.db.execute(sql.raw(`alter table diagrams add constraint bw_test_fail check (octet_length(content::text) < 10) not valid`));
    try {
      const version = (await stored()).version;
      const content = withAnnotation({ text: 'document-marker-Kestrel-0815' });
      const res = await designer.put(`/api/diagrams/${diagramId}/working-copy`).send({ content, baseVersion: version });
      expect(res.status).toBe(500);
      expect(res.body).toEqual({ error: { code: 'internal', message: 'Something went wrong on the server. Try again.' } });
      const [line, ...more] = forRequest(res.headers['x-request-id']);
      expect(more).toEqual([]);
      expect(line).toMatchObject({ level: 50, route: '/api/diagrams/:id/working-copy', ids: { id: diagramId }, res: { status: 500 } });
      const err = line!.err as { type: string; frames: string[]; cause?: { code?: string; constraint?: string } };
      expect(err.type).toMatch(/Error$/);
      expect(err.frames.some((f) => f.includes('server/services/diagrams.ts'))).toBe(true);
      expect(err.cause).toMatchObject({ code: '23514', constraint: 'bw_test_fail' });
      const text = raw.join('');
      expect(text).not.toContain('document-marker-Kestrel-0815');
      expect(text).not.toContain('formatVersion');
      expect(text).not.toContain('Failed query');
      expect(JSON.stringify(line)).not.toContain('params');
    } finally {
      await database.db.execute(sql.raw(`alter table diagrams drop constraint bw_test_fail`));
    }
  });
});
