/**
 * PUT /api/diagrams/:id/annotations: trainers (and owners, designers) change only the annotation layer;
 * the electrical model cannot travel with it. Same 409 working_copy_conflict as the working-copy save.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../helpers/app';
import { smallBank } from './fixtures';

let t: TestApp;
let projectId: string;

beforeAll(async () => {
  t = await makeTestApp();
  const owner = await t.agentFor('owner');
  const teamId = (await owner.get('/api/teams')).body.teams[0].id;
  projectId = (await owner.get(`/api/projects?teamId=${teamId}`)).body.projects[0].id;
});
afterAll(async () => {
  await t?.close();
});

async function newDiagram(): Promise<string> {
  const res = await (await t.agentFor('designer')).post(`/api/projects/${projectId}/diagrams`).send({ name: 'Briefing bank', content: smallBank() });
  expect(res.status).toBe(201);
  return res.body.diagram.id;
}

const callout = { id: 'an1', kind: 'callout', partId: 'bat1', text: 'Torque to the value on the lug' };
const step = { id: 'an2', kind: 'step', number: 1, text: 'Fit the main fuse before the first cable', partIds: ['bat1', 'bat2'] };
const note = { id: 'an3', kind: 'note', position: { x: 40, y: -80 }, text: 'Isolate the bank before work' };

describe('PUT /api/diagrams/:id/annotations', () => {
  it('lets a trainer replace the annotations; the parts, cables and settings stay as they were', async () => {
    const id = await newDiagram();
    const before = (await (await t.agentFor('trainer')).get(`/api/diagrams/${id}`)).body.diagram;
    const trainer = await t.agentFor('trainer');
    const res = await trainer.put(`/api/diagrams/${id}/annotations`).send({ annotations: [callout, step, note], baseVersion: before.workingCopyVersion });
    expect(res.status).toBe(200);
    expect(res.body.workingCopyVersion).toBe(before.workingCopyVersion + 1);
    const after = (await trainer.get(`/api/diagrams/${id}`)).body.diagram;
    expect(after.content.annotations).toEqual([callout, step, note]);
    expect(after.content.parts).toEqual(before.content.parts);
    expect(after.content.cables).toEqual(before.content.cables);
    expect(after.content.settings).toEqual(before.content.settings);
    expect(after.updatedBy.name).toBe('Sione Valdés');
  });

  it('refuses a body that carries electrical changes (parts, cables, settings, content) with 400, storing nothing', async () => {
    const id = await newDiagram();
    const trainer = await t.agentFor('trainer');
    const doc = smallBank();
    doc.parts = doc.parts.slice(1);
    for (const extra of [{ parts: doc.parts }, { cables: [] }, { settings: doc.settings }, { content: doc }]) {
      const res = await trainer.put(`/api/diagrams/${id}/annotations`).send({ annotations: [], baseVersion: 1, ...extra });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
    const after = (await trainer.get(`/api/diagrams/${id}`)).body.diagram;
    expect(after.workingCopyVersion).toBe(1);
    expect(after.content.parts).toHaveLength(smallBank().parts.length);
  });

  it('trainers still cannot use the working-copy route (electrical edits)', async () => {
    const id = await newDiagram();
    const res = await (await t.agentFor('trainer')).put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank('Changed'), baseVersion: 1 });
    expect(res.status).toBe(403);
  });

  it('checks each annotation strictly: known kinds, parts that exist, ids free of parts and cables', async () => {
    const id = await newDiagram();
    const designer = await t.agentFor('designer');
    const cases: [unknown[], string][] = [
      [[{ ...callout, partId: 'bat99' }], 'annotations.0.partId'],
      [[{ ...callout, text: '' }], 'annotations.0.text'],
      [[{ ...step, number: 0 }], 'annotations.0.number'],
      [[{ ...callout, id: 'bat1' }], 'annotations.0.id'],
      [[callout, { ...note, id: 'an1' }], 'annotations.1.id'],
      [[step, { ...step, id: 'an9' }], 'annotations.1.number'],
    ];
    for (const [annotations, field] of cases) {
      const res = await designer.put(`/api/diagrams/${id}/annotations`).send({ annotations, baseVersion: 1 });
      expect({ field, status: res.status }).toEqual({ field, status: 400 });
      expect(Object.keys(res.body.error.details.fields)).toContain(field);
    }
    expect((await designer.get(`/api/diagrams/${id}`)).body.diagram.workingCopyVersion).toBe(1);
  });

  it('keeps entries of kinds a later version may add', async () => {
    const id = await newDiagram();
    const later = { id: 'an7', kind: 'measurement', from: 'bat1', to: 'bat2' };
    const res = await (await t.agentFor('owner')).put(`/api/diagrams/${id}/annotations`).send({ annotations: [later], baseVersion: 1 });
    expect(res.status).toBe(200);
    expect((await (await t.agentFor('owner')).get(`/api/diagrams/${id}`)).body.diagram.content.annotations).toEqual([later]);
  });

  it('answers 409 working_copy_conflict when someone saved since baseVersion, naming who', async () => {
    const id = await newDiagram();
    const designer = await t.agentFor('designer');
    expect((await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: smallBank('Moved a battery'), baseVersion: 1 })).status).toBe(200);
    const res = await (await t.agentFor('trainer')).put(`/api/diagrams/${id}/annotations`).send({ annotations: [note], baseVersion: 1 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('working_copy_conflict');
    expect(res.body.error.details).toMatchObject({ workingCopyVersion: 2, updatedBy: { name: 'Tomasz Ilunga' } });
    expect(res.body.error.message).toContain('Tomasz Ilunga');
  });

  it('two saves from the same version: exactly one wins', async () => {
    const id = await newDiagram();
    const trainer = await t.agentFor('trainer');
    const designer = await t.agentFor('designer');
    const [a, b] = await Promise.all([
      trainer.put(`/api/diagrams/${id}/annotations`).send({ annotations: [note], baseVersion: 1 }),
      designer.put(`/api/diagrams/${id}/annotations`).send({ annotations: [callout], baseVersion: 1 }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
  });

  it('reviewers and viewers get 403; another team 404; signed out 401', async () => {
    const id = await newDiagram();
    for (const role of ['reviewer', 'viewer'] as const) {
      expect((await (await t.agentFor(role)).put(`/api/diagrams/${id}/annotations`).send({ annotations: [], baseVersion: 1 })).status).toBe(403);
    }
    const outsider = t.agent();
    await outsider.post('/api/auth/sign-up').send({ email: 'annotations-outsider@elsewhere.test', password: 'outsider password', name: 'Outsider' });
    expect((await outsider.put(`/api/diagrams/${id}/annotations`).send({ annotations: [], baseVersion: 1 })).status).toBe(404);
    expect((await t.agent().put(`/api/diagrams/${id}/annotations`).send({ annotations: [], baseVersion: 1 })).status).toBe(401);
  });
});
