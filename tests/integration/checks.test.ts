/**
 * POST /api/diagrams/:id/check (docs/api.md "Checking a diagram"): the analysis of sent content or of the
 * working copy, in the analysis worker pool. Results are compared with the shared core's
 * `analyzeDiagram` called here directly (the route must hand it back unchanged); limits and the pool's
 * refusals (busy, timeout) answer clear errors; the request thread stays free while a big check runs.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { analyzeDiagram } from '../../shared/electrical/study';
import { compileDiagram } from '../../shared/electrical/compile';
import { createApp } from '../../server/app';
import { testConfig } from '../../server/config';
import { diagramRevisions, diagrams } from '../../server/db/schema';
import { seedDemo } from '../../server/db/demo-data';
import { createOutboxMailer } from '../../server/mail/mailer';
import { analysisPool, createAnalysisPool, type AnalysisPool } from '../../server/services/analysis-pool';
import { createTestDatabase, type TestDatabase } from '../helpers/db';
import { makeTestApp, DEMO_PASSWORD, TEST_ORIGIN, type Agent, type TestApp } from '../helpers/app';
import { smallBank } from './fixtures';
import { bigBank, oversizedBank } from './check-fixtures';

let t: TestApp;
let designer: Agent;
let viewer: Agent;
let projectId: string;
let diagramId: string;

const asJson = (v: unknown) => JSON.parse(JSON.stringify(v));
const elementsOf = (doc: Parameters<typeof compileDiagram>[0]) => {
  const c = compileDiagram(doc);
  if (!c.ok) throw new Error('fixture does not compile');
  return c.network.elements.length;
};

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  viewer = await t.agentFor('viewer');
  const teamId = (await designer.get('/api/teams')).body.teams[0].id;
  projectId = (await designer.post('/api/projects').send({ teamId, name: 'Check project' })).body.project.id;
  diagramId = (await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'Checked bank', content: smallBank() })).body.diagram.id;
});
afterAll(async () => {
  await t?.close();
});

describe('POST /api/diagrams/:id/check', () => {
  it('answers the analysis of sent, unsaved content (load case by default), and stores nothing', async () => {
    const doc = smallBank('Unsaved edit');
    doc.parts.find((p) => p.id === 'bat2')!.label = 'Edited battery';
    const before = (await t.db.select({ n: count() }).from(diagramRevisions))[0].n;
    const res = await designer.post(`/api/diagrams/${diagramId}/check`).send({ content: doc });
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200);
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(res.body.source).toBe('request');
    expect(res.body.elements).toBe(elementsOf(doc));
    expect(res.body.analysis).toEqual(asJson(analyzeDiagram(doc, { mode: 'load' })));
    expect(res.body.analysis.ok).toBe(true);
    expect(Object.keys(res.body.analysis.operating.sources).sort()).toEqual(['bat1', 'bat2']);
    expect((await t.db.select({ n: count() }).from(diagramRevisions))[0].n).toBe(before);
  });

  it('without content checks the working copy; a viewer may check (project.read)', async () => {
    const res = await viewer.post(`/api/diagrams/${diagramId}/check`).send({});
    expect(res.status).toBe(200);
    expect(res.body.source).toBe('working_copy');
    const [row] = await t.db.select({ content: diagrams.content }).from(diagrams).where(eq(diagrams.id, diagramId));
    expect(res.body.analysis).toEqual(asJson(analyzeDiagram(row.content as never, { mode: 'load' })));
  });

  it('runs the other modes: charge refuses a bank without a charger, fault solves one named case in full', async () => {
    const doc = smallBank();
    const charge = await designer.post(`/api/diagrams/${diagramId}/check`).send({ mode: 'charge', content: doc });
    expect(charge.status).toBe(200);
    expect(charge.body.analysis).toEqual(asJson(analyzeDiagram(doc, { mode: 'charge' })));
    expect(charge.body.analysis.ok).toBe(false);
    expect(charge.body.analysis.errors[0].code).toBe('no_charger');

    const fault = await designer.post(`/api/diagrams/${diagramId}/check`).send({ mode: 'fault', fault: { kind: 'battery', id: 'bat1' }, content: doc });
    expect(fault.status).toBe(200);
    expect(fault.body.analysis).toEqual(asJson(analyzeDiagram(doc, { mode: 'fault', fault: { kind: 'battery', id: 'bat1' } })));
    expect(fault.body.analysis.faultCase.faultCurrent_A).toBeGreaterThan(0);
  });

  it('refuses bad options and invalid content with 400 naming the field', async () => {
    const badMode = await designer.post(`/api/diagrams/${diagramId}/check`).send({ mode: 'explode' });
    expect(badMode.status).toBe(400);
    expect(Object.keys(badMode.body.error.details.fields)).toEqual(['mode']);

    const faultOutsideFaultMode = await designer.post(`/api/diagrams/${diagramId}/check`).send({ mode: 'load', fault: { kind: 'battery', id: 'bat1' } });
    expect(faultOutsideFaultMode.status).toBe(400);
    expect(Object.keys(faultOutsideFaultMode.body.error.details.fields)).toEqual(['fault']);

    const doc = smallBank() as unknown as { parts: { props: Record<string, unknown> }[] };
    doc.parts[0].props.capacity_Ah = -5;
    const invalid = await designer.post(`/api/diagrams/${diagramId}/check`).send({ content: doc });
    expect(invalid.status).toBe(400);
    expect(invalid.body.error.code).toBe('validation_failed');
    expect(Object.keys(invalid.body.error.details.fields).every((k) => k.startsWith('content.parts.0.')), JSON.stringify(invalid.body.error.details)).toBe(true);
  });

  it('refuses a diagram compiling to more than 60,000 network elements with 413 network_too_large naming the count and the limit', async () => {
    const doc = oversizedBank();
    const n = elementsOf(doc);
    expect(n).toBeGreaterThan(60_000);
    const res = await designer.post(`/api/diagrams/${diagramId}/check`).send({ content: doc });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('network_too_large');
    expect(res.body.error.details).toEqual({ elements: n, limit: 60_000 });
    expect(res.body.error.message).toContain(n.toLocaleString('en-US'));
    expect(res.body.error.message).toContain('60,000');
  });

  it('keeps answering /api/health while a 5,000-element check is in flight (the solve runs in a worker thread)', async () => {
    const doc = bigBank();
    expect(elementsOf(doc)).toBeGreaterThan(5000);
    const pool = analysisPool();
    let settled = false;
    const check = designer
      .post(`/api/diagrams/${diagramId}/check`)
      .send({ content: doc })
      .then((r) => {
        settled = true;
        return r;
      });
    // Wait until the job is running in a worker, then ask for health.
    while (pool.stats().running === 0 && !settled) await new Promise((r) => setTimeout(r, 5));
    const healthAnswers: boolean[] = [];
    for (let i = 0; i < 3; i++) {
      const h = await request(t.server).get('/api/health');
      expect(h.status).toBe(200);
      healthAnswers.push(settled);
    }
    expect(healthAnswers).toEqual([false, false, false]);
    const res = await check;
    expect(res.status).toBe(200);
    expect(res.body.elements).toBe(elementsOf(doc));
    expect(res.body.analysis.ok).toBe(true);
  });
});

describe('the analysis pool refuses work it cannot take', () => {
  let database: TestDatabase;
  let server: http.Server;
  let pools: AnalysisPool[] = [];

  async function appWith(pool: AnalysisPool) {
    pools.push(pool);
    const app = createApp({ db: database.db, mailer: createOutboxMailer(database.db), config: testConfig({ appOrigin: TEST_ORIGIN }), analysis: pool });
    server?.closeAllConnections();
    await new Promise<void>((r) => (server ? server.close(() => r()) : r()));
    server = http.createServer(app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    const a = request.agent(`http://127.0.0.1:${(server.address() as AddressInfo).port}`).set('Origin', TEST_ORIGIN);
    expect((await a.post('/api/auth/sign-in').send({ email: 'designer@demo.test', password: DEMO_PASSWORD })).status).toBe(200);
    const teamId = (await a.get('/api/teams')).body.teams[0].id;
    const project = (await a.post('/api/projects').send({ teamId, name: 'Pool project' })).body.project.id;
    const diagram = (await a.post(`/api/projects/${project}/diagrams`).send({ name: 'Pool bank', content: smallBank() })).body.diagram.id;
    return { a, diagram };
  }

  beforeAll(async () => {
    database = await createTestDatabase();
    await seedDemo(database.db, DEMO_PASSWORD);
  });
  afterAll(async () => {
    server?.closeAllConnections();
    await new Promise<void>((r) => (server ? server.close(() => r()) : r()));
    await Promise.all(pools.map((p) => p.close()));
    pools = [];
    await database?.destroy();
  });

  it('answers 503 busy with Retry-After when every worker is busy and the queue is full', async () => {
    const pool = createAnalysisPool({ workers: 1, maxQueued: 0 });
    const { a, diagram } = await appWith(pool);
    const first = a.post(`/api/diagrams/${diagram}/check`).send({ content: bigBank() }).then((r) => r);
    while (pool.stats().running + pool.stats().waiting === 0) await new Promise((r) => setTimeout(r, 5));
    const second = await a.post(`/api/diagrams/${diagram}/check`).send({ content: smallBank() });
    expect(second.status).toBe(503);
    expect(second.body.error.code).toBe('busy');
    expect(Number(second.headers['retry-after'])).toBeGreaterThan(0);
    expect((await first).status).toBe(200);
    // The queue drained: the next check is taken.
    expect((await a.post(`/api/diagrams/${diagram}/check`).send({ content: smallBank() })).status).toBe(200);
  });

  it('stops a check over the time limit with 504 analysis_timeout, and the next check gets a fresh worker', async () => {
    const pool = createAnalysisPool({ workers: 1, timeoutMs: 1000 });
    const { a, diagram } = await appWith(pool);
    // Seven 64S61P banks tied together: about 57,000 elements, within the element limit; seconds to solve.
    const slow = await a.post(`/api/diagrams/${diagram}/check`).send({ content: oversizedBank(7) });
    expect(slow.status).toBe(504);
    expect(slow.body.error.code).toBe('analysis_timeout');
    expect(slow.body.error.message).toContain('1 s');
    const next = await a.post(`/api/diagrams/${diagram}/check`).send({ content: smallBank() });
    expect(next.status).toBe(200);
    expect(next.body.analysis.ok).toBe(true);
  });
});
