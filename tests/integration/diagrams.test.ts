import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, count, eq } from 'drizzle-orm';
import { activity, diagrams } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { partLimitBank, smallBank } from './fixtures';

let t: TestApp;
let designer: Agent;
let owner: Agent;
let teamId: string;
let stationId: string;

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  owner = await t.agentFor('owner');
  teamId = (await designer.get('/api/teams')).body.teams[0].id;
  const projects = (await designer.get(`/api/projects?teamId=${teamId}`)).body.projects;
  stationId = projects.find((p: { name: string }) => p.name === 'Gannet Island ranger station').id;
});
afterAll(async () => {
  await t?.close();
});

async function newDiagram(name = 'Working copy test'): Promise<string> {
  const res = await designer.post(`/api/projects/${stationId}/diagrams`).send({ name, content: smallBank(name) });
  expect(res.status).toBe(201);
  return res.body.diagram.id;
}

describe('GET /api/diagrams/:id', () => {
  it('answers the working copy with its project, team, version and the caller role', async () => {
    const list = (await designer.get(`/api/projects/${stationId}/diagrams`)).body.diagrams;
    const first = list[0];
    const res = await designer.get(`/api/diagrams/${first.id}`);
    expect(res.status).toBe(200);
    expect(res.body.role).toBe('designer');
    expect(res.body.diagram).toMatchObject({
      id: first.id,
      projectId: stationId,
      teamId,
      projectName: 'Gannet Island ranger station',
      name: 'Post-to-post bank, end take-off',
      workingCopyVersion: 1,
      updatedAt: expect.any(String),
    });
    expect(res.body.diagram.content.formatVersion).toBe(1);
    expect(res.body.diagram.content.parts.length).toBe(first.partCount);
    expect((await (await t.agentFor('viewer')).get(`/api/diagrams/${first.id}`)).body.role).toBe('viewer');
  });

  it('answers 404 for an unknown id', async () => {
    const res = await designer.get('/api/diagrams/no-such-diagram');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('POST /api/projects/:id/diagrams', () => {
  it('creates an empty diagram when no content is given, and logs it', async () => {
    const res = await designer.post(`/api/projects/${stationId}/diagrams`).send({ name: '  Spare layout  ' });
    expect(res.status).toBe(201);
    expect(res.body.diagram).toMatchObject({ projectId: stationId, teamId, name: 'Spare layout', description: '', workingCopyVersion: 1 });
    expect(res.body.diagram.content).toMatchObject({ formatVersion: 1, parts: [], cables: [], annotations: [] });
    expect(res.body.diagram.updatedBy).toEqual({ id: expect.any(String), name: 'Tomasz Ilunga' });
    const log = await t.db.select().from(activity).where(and(eq(activity.projectId, stationId), eq(activity.action, 'diagram.created')));
    expect(log.map((a) => a.detail)).toContainEqual({ diagramId: res.body.diagram.id, name: 'Spare layout' });
  });

  it('stores given content with defaults filled in', async () => {
    const doc = smallBank();
    const { settings, ...rest } = doc;
    const sparse = { ...rest, settings: { systemVoltage_V: settings.systemVoltage_V } };
    const res = await designer.post(`/api/projects/${stationId}/diagrams`).send({ name: 'Sparse settings', content: sparse });
    expect(res.status).toBe(201);
    // settingsSchema defaults (shared/electrical/document/schema.ts): 3 % drop limit, 1.25 design margin.
    expect(res.body.diagram.content.settings).toMatchObject({ systemVoltage_V: settings.systemVoltage_V, voltageDropLimit_pct: 3, designMargin: 1.25 });
  });

  it('refuses an invalid document with field errors keyed by the document path, storing nothing', async () => {
    const before = (await t.db.select({ n: count() }).from(diagrams))[0].n;
    const doc = smallBank();
    const broken = { ...doc, cables: [{ ...doc.cables[0], to: { part: 'ghost', terminal: 'pos' } }] };
    const res = await designer.post(`/api/projects/${stationId}/diagrams`).send({ name: 'Broken', content: broken });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields['content.cables.0.to.part']).toEqual(['No part with id "ghost"']);
    const noName = await designer.post(`/api/projects/${stationId}/diagrams`).send({ name: '   ' });
    expect(Object.keys(noName.body.error.details.fields)).toEqual(['name']);
    expect((await t.db.select({ n: count() }).from(diagrams))[0].n).toBe(before);
  });

  it('is refused to a reviewer (403) and to another team (404)', async () => {
    const reviewer = await t.agentFor('reviewer');
    expect((await reviewer.post(`/api/projects/${stationId}/diagrams`).send({ name: 'Reviewer diagram' })).status).toBe(403);
    const rival = t.agent();
    await rival.post('/api/auth/sign-up').send({ email: 'rival-diagrams@example.test', password: 'rival password 1', name: 'Rival' });
    expect((await rival.post(`/api/projects/${stationId}/diagrams`).send({ name: 'Planted' })).status).toBe(404);
  });
});

describe('PUT /api/diagrams/:id/working-copy', () => {
  it('saves from the current version and increments it', async () => {
    const id = await newDiagram();
    const doc = smallBank('Edited');
    const saved = await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: doc, baseVersion: 1 });
    expect(saved.status).toBe(200);
    expect(saved.body).toEqual({ workingCopyVersion: 2, updatedAt: expect.any(String) });
    const again = await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: { ...doc, name: 'Edited twice' }, baseVersion: 2 });
    expect(again.body.workingCopyVersion).toBe(3);
    const got = (await designer.get(`/api/diagrams/${id}`)).body.diagram;
    expect(got.workingCopyVersion).toBe(3);
    expect(got.content.name).toBe('Edited twice');
  });

  it('refuses a save from an old version with 409 and the current version, keeping the newer content', async () => {
    const id = await newDiagram();
    expect((await owner.put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank('Owner edit'), baseVersion: 1 })).status).toBe(200);
    const stale = await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank('Designer edit'), baseVersion: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('working_copy_conflict');
    expect(stale.body.error.details).toEqual({ workingCopyVersion: 2, updatedAt: expect.any(String), updatedBy: { id: expect.any(String), name: 'Maren Okafor' } });
    const got = (await designer.get(`/api/diagrams/${id}`)).body.diagram;
    expect(got.content.name).toBe('Owner edit');
    expect(got.updatedBy.name).toBe('Maren Okafor');
    // A base version from the future is just as stale.
    expect((await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank(), baseVersion: 7 })).status).toBe(409);
  });

  it('lets only one of two saves from the same version through', async () => {
    const id = await newDiagram();
    const [a, b] = await Promise.all([
      designer.put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank('A'), baseVersion: 1 }),
      owner.put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank('B'), baseVersion: 1 }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const winner = a.status === 200 ? 'A' : 'B';
    const got = (await designer.get(`/api/diagrams/${id}`)).body.diagram;
    expect(got).toMatchObject({ workingCopyVersion: 2, content: { name: winner } });
  });

  it('validates the document and the base version, storing nothing', async () => {
    const id = await newDiagram();
    const doc = smallBank();
    const bad = await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: { ...doc, parts: [{ ...doc.parts[0], position: { x: 'left', y: 0 } }, ...doc.parts.slice(1)] }, baseVersion: 0 });
    expect(bad.status).toBe(400);
    const fields = bad.body.error.details.fields;
    expect(fields.baseVersion).toEqual(['baseVersion must be at least 1']);
    expect(Object.keys(fields)).toContain('content.parts.0.position.x');
    const got = (await designer.get(`/api/diagrams/${id}`)).body.diagram;
    expect(got.workingCopyVersion).toBe(1);
  });

  it('takes a 2,000-part document (over the general 1 MB body limit) and refuses one over 5 MB', async () => {
    const id = await newDiagram();
    const big = partLimitBank();
    expect(JSON.stringify(big).length).toBeGreaterThan(1024 * 1024);
    const saved = await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: big, baseVersion: 1 });
    expect(saved.status).toBe(200);
    expect((await designer.get(`/api/projects/${stationId}/diagrams`)).body.diagrams.find((d: { id: string }) => d.id === id).partCount).toBe(2000);

    const padded = { content: { ...big, annotations: [{ id: 'pad', kind: 'note', text: 'x'.repeat(4 * 1024 * 1024) }] }, baseVersion: 2 };
    const tooBig = await designer.put(`/api/diagrams/${id}/working-copy`).send(padded);
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error.code).toBe('payload_too_large');
    // Other routes keep the 1 MB limit.
    const patch = await designer.patch(`/api/diagrams/${id}`).send({ description: 'x'.repeat(1024 * 1024 + 10) });
    expect(patch.status).toBe(413);
  });

  it('is refused to a reviewer and a trainer (403), and changes nothing', async () => {
    const id = await newDiagram();
    for (const role of ['reviewer', 'trainer', 'viewer'] as const) {
      const a = await t.agentFor(role);
      const res = await a.put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank(role), baseVersion: 1 });
      expect(res.status).toBe(403);
    }
    expect((await designer.get(`/api/diagrams/${id}`)).body.diagram.workingCopyVersion).toBe(1);
  });
});

describe('PATCH and DELETE /api/diagrams/:id', () => {
  it('renames and describes, logging a rename', async () => {
    const id = await newDiagram('Before rename');
    const res = await designer.patch(`/api/diagrams/${id}`).send({ name: 'After rename', description: 'Renamed in a test' });
    expect(res.status).toBe(200);
    expect(res.body.diagram).toMatchObject({ id, name: 'After rename', description: 'Renamed in a test', workingCopyVersion: 1 });
    const [log] = await t.db.select().from(activity).where(and(eq(activity.projectId, stationId), eq(activity.action, 'diagram.renamed')));
    expect(log.detail).toMatchObject({ diagramId: id, name: 'After rename', previousName: 'Before rename' });
    expect((await designer.patch(`/api/diagrams/${id}`).send({})).status).toBe(400);
  });

  it('deletes, logging the deletion, after which the diagram is gone', async () => {
    const id = await newDiagram('To delete');
    expect((await (await t.agentFor('viewer')).delete(`/api/diagrams/${id}`)).status).toBe(403);
    expect((await designer.delete(`/api/diagrams/${id}`)).status).toBe(204);
    expect((await designer.get(`/api/diagrams/${id}`)).status).toBe(404);
    expect((await designer.delete(`/api/diagrams/${id}`)).status).toBe(404);
    const log = await t.db.select().from(activity).where(and(eq(activity.projectId, stationId), eq(activity.action, 'diagram.deleted')));
    expect(log.map((a) => a.detail)).toContainEqual({ diagramId: id, name: 'To delete' });
  });
});

describe("another team's diagram", () => {
  it('answers 404 on every diagram route and is left unchanged', async () => {
    const rival = t.agent();
    await rival.post('/api/auth/sign-up').send({ email: 'rival-wc@example.test', password: 'rival password 1', name: 'Rival' });
    const rivalTeam = (await rival.post('/api/teams').send({ name: 'Rival Batteries' })).body.team.id;
    const rivalProject = (await rival.post('/api/projects').send({ teamId: rivalTeam, name: 'Rival project' })).body.project.id;
    const rivalDiagram = (await rival.post(`/api/projects/${rivalProject}/diagrams`).send({ name: 'Rival secret diagram' })).body.diagram.id;
    for (const res of [
      await designer.get(`/api/diagrams/${rivalDiagram}`),
      await designer.put(`/api/diagrams/${rivalDiagram}/working-copy`).send({ content: smallBank(), baseVersion: 1 }),
      await designer.patch(`/api/diagrams/${rivalDiagram}`).send({ name: 'Defaced' }),
      await designer.delete(`/api/diagrams/${rivalDiagram}`),
    ]) {
      expect(res.status).toBe(404);
      expect(JSON.stringify(res.body)).not.toContain('Rival');
    }
    const got = (await rival.get(`/api/diagrams/${rivalDiagram}`)).body.diagram;
    expect(got).toMatchObject({ name: 'Rival secret diagram', workingCopyVersion: 1 });
  });
});
