/**
 * Attack: resource exhaustion through oversized input. Every limit answers a clear 4xx naming the limit,
 * and stores nothing: request body size (1 MB; 5 MB on the diagram document routes), diagram part count
 * (2,000, DIAGRAM_LIMITS), compiled network size on the check route (60,000 elements), upload size
 * (UPLOAD_MAX_MB). The 1 MB limit on an ordinary route is in tests/integration/auth.test.ts; the check
 * route's busy and timeout answers are in tests/integration/checks.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count } from 'drizzle-orm';
import { diagrams, uploads } from '../../server/db/schema';
import { DIAGRAM_LIMITS, emptyDiagram } from '../../shared/electrical/document/schema';
import { busbarBankTemplate } from '../../shared/diagram/templates';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { compileDiagram } from '../../shared/electrical/compile';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { oversizedBank } from '../integration/check-fixtures';
import { multipart, png } from '../integration/upload-fixtures';

const UPLOAD_LIMIT = 64 * 1024;
let t: TestApp;
let designer: Agent;
let projectId: string;
let dataDir: string;
beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-limits-'));
  t = await makeTestApp({ config: { dataDir, uploadMaxBytes: UPLOAD_LIMIT } });
  designer = await t.agentFor('designer');
  const teamId = (await designer.get('/api/teams')).body.teams[0].id;
  projectId = (await designer.post('/api/projects').send({ teamId, name: 'Limits project' })).body.project.id;
});
afterAll(async () => {
  await t?.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

const diagramCount = async () => (await t.db.select({ n: count() }).from(diagrams))[0].n;

function notes(n: number) {
  return Array.from({ length: n }, (_, i) => ({ id: `n${i}`, type: 'note', position: { x: i, y: 0 }, props: { text: 'x' } }));
}

describe('limits', () => {
  it(`a diagram with ${DIAGRAM_LIMITS.maxParts + 1} parts is refused with 400 naming content.parts; ${DIAGRAM_LIMITS.maxParts} pass`, async () => {
    const before = await diagramCount();
    const tooMany = await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'Too many parts', content: { ...emptyDiagram(), parts: notes(DIAGRAM_LIMITS.maxParts + 1) } });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.code).toBe('validation_failed');
    const keys = Object.keys(tooMany.body.error.details.fields);
    expect(keys.some((k) => /parts/.test(k)), keys.join(', ')).toBe(true);
    expect(await diagramCount()).toBe(before);
    const atLimit = await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'At the limit', content: { ...emptyDiagram(), parts: notes(DIAGRAM_LIMITS.maxParts) } });
    expect(atLimit.status, JSON.stringify(atLimit.body).slice(0, 300)).toBe(201);
  });

  it('a diagram body over 5 MB answers 413 payload_too_large with the limit, storing nothing', async () => {
    const before = await diagramCount();
    const res = await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'Huge', content: { ...emptyDiagram(), name: 'x'.repeat(5.5 * 1024 * 1024) } });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.details.limitBytes).toBe(5 * 1024 * 1024);
    expect(await diagramCount()).toBe(before);
  });

  it('the 1 MB limit still holds beside the diagram routes (PATCH of a diagram\'s name)', async () => {
    const list = (await designer.get(`/api/projects/${projectId}/diagrams`)).body.diagrams as { id: string }[];
    const res = await designer.patch(`/api/diagrams/${list[0].id}`).send({ name: 'y'.repeat(1_100_000) });
    expect(res.status).toBe(413);
    expect(res.body.error.details.limitBytes).toBe(1024 * 1024);
  });

  // diagramSchema used to list terminals from props that had failed validation: this document threw inside
  // the parse and the server answered 500 (a tapCount of 2^31 − 1 would allocate two billion names).
  it('a busbar with an absurd tapCount is refused with 400, not a server fault', async () => {
    const content = busbarBankTemplate({ count: 1 });
    (content.parts.find((p) => p.type === 'busbar')!.props as { tapCount: number }).tapCount = 2e300;
    const res = await designer.post(`/api/projects/${projectId}/diagrams`).send({ name: 'Absurd taps', content });
    expect(res.status).toBe(400);
  });

  it('network element count: a check of a diagram compiling to over 60,000 elements answers 413 network_too_large with the count and the limit', async () => {
    const list = (await designer.get(`/api/projects/${projectId}/diagrams`)).body.diagrams as { id: string }[];
    const doc = oversizedBank();
    const compiled = compileDiagram(doc);
    expect(compiled.ok).toBe(true);
    const elements = compiled.ok ? compiled.network.elements.length : 0;
    expect(doc.parts.length).toBeLessThanOrEqual(DIAGRAM_LIMITS.maxParts);
    const res = await designer.post(`/api/diagrams/${list[0].id}/check`).send({ content: doc });
    expect(res.status).toBe(413);
    expect(res.body.error).toMatchObject({ code: 'network_too_large', details: { elements, limit: 60_000 } });
    expect(JSON.stringify(res.body)).not.toMatch(/at \w+ \(|\.ts:\d+/);
  });

  it(`the check route keeps the part-count limit: ${DIAGRAM_LIMITS.maxParts + 1} parts answer 400 naming content.parts`, async () => {
    const list = (await designer.get(`/api/projects/${projectId}/diagrams`)).body.diagrams as { id: string }[];
    const res = await designer.post(`/api/diagrams/${list[0].id}/check`).send({ content: { ...emptyDiagram(), parts: notes(DIAGRAM_LIMITS.maxParts + 1) } });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.details.fields)).toContain('content.parts');
  });

  it('upload size: a file over UPLOAD_MAX_MB answers 413 payload_too_large with the limit, storing nothing', async () => {
    const before = (await t.db.select({ n: count() }).from(uploads))[0].n;
    const photo = png(8, 8);
    const big = Buffer.concat([photo, Buffer.alloc(UPLOAD_LIMIT, 0)]);
    const { body, type } = multipart('site photo.png', big, 'image/png');
    const res = await designer.post(`/api/projects/${projectId}/uploads`).set('Content-Type', type).send(body);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.details.limitBytes).toBe(UPLOAD_LIMIT);
    expect((await t.db.select({ n: count() }).from(uploads))[0].n).toBe(before);
    const small = multipart('site photo.png', photo, 'image/png');
    expect((await designer.post(`/api/projects/${projectId}/uploads`).set('Content-Type', small.type).send(small.body)).status).toBe(201);
  });
});
