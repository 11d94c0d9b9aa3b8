/** Moving and copying a diagram between projects of one team (POST /api/diagrams/:id/move, /copy). */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { activity, diagramRevisions, diagrams } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { smallBank } from './fixtures';

let t: TestApp;
let designer: Agent;
let teamId: string;
let fromId: string;
let toId: string;

async function newProject(agent: Agent, team: string, name: string): Promise<string> {
  const res = await agent.post('/api/projects').send({ teamId: team, name });
  expect(res.status).toBe(201);
  return res.body.project.id;
}

async function newDiagram(projectId: string, name: string): Promise<string> {
  const res = await designer.post(`/api/projects/${projectId}/diagrams`).send({ name, content: smallBank(name) });
  expect(res.status).toBe(201);
  return res.body.diagram.id;
}

async function activityOf(projectId: string) {
  return t.db.select({ action: activity.action, detail: activity.detail }).from(activity).where(eq(activity.projectId, projectId));
}

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  teamId = (await designer.get('/api/teams')).body.teams[0].id;
  fromId = await newProject(designer, teamId, 'Harbour shed');
  toId = await newProject(designer, teamId, 'Harbour shed, stage 2');
});
afterAll(async () => {
  await t?.close();
});

describe('POST /api/diagrams/:id/move', () => {
  it('moves the diagram with its revisions and history, and both projects record the move', async () => {
    const id = await newDiagram(fromId, 'Shed bank');
    const saved = await designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: null, message: 'First', content: smallBank('Shed bank') });
    expect(saved.status).toBe(201);
    const comment = await designer.post(`/api/diagrams/${id}/revisions/1/comments`).send({ body: 'Check the jumper length' });
    expect(comment.status).toBe(201);

    const before = (await designer.get(`/api/diagrams/${id}`)).body.diagram;
    const res = await designer.post(`/api/diagrams/${id}/move`).send({ projectId: toId });
    expect(res.status).toBe(200);
    expect(res.body.diagram).toMatchObject({ id, projectId: toId, projectName: 'Harbour shed, stage 2', name: 'Shed bank' });
    // The working copy itself is untouched: same version, time and content.
    expect(res.body.diagram).toMatchObject({ workingCopyVersion: before.workingCopyVersion, updatedAt: before.updatedAt, content: before.content });

    // Same id, same revisions and comments, now listed under the new project only.
    const revisions = await designer.get(`/api/diagrams/${id}/revisions`);
    expect(revisions.body.revisions.map((r: { number: number }) => r.number)).toEqual([1]);
    const comments = await designer.get(`/api/diagrams/${id}/revisions/1/comments`);
    expect(comments.body.comments).toHaveLength(1);
    const inFrom = (await designer.get(`/api/projects/${fromId}/diagrams`)).body.diagrams.map((d: { id: string }) => d.id);
    const inTo = (await designer.get(`/api/projects/${toId}/diagrams`)).body.diagrams.map((d: { id: string }) => d.id);
    expect(inFrom).not.toContain(id);
    expect(inTo).toContain(id);

    expect(await activityOf(fromId)).toContainEqual(expect.objectContaining({ action: 'diagram.moved_out', detail: expect.objectContaining({ diagramId: id, toProjectId: toId }) }));
    expect(await activityOf(toId)).toContainEqual(expect.objectContaining({ action: 'diagram.moved_in', detail: expect.objectContaining({ diagramId: id, fromProjectId: fromId }) }));
  });

  it('refuses the project the diagram is already in, naming the field, and changes nothing', async () => {
    const id = await newDiagram(fromId, 'Stays put');
    const before = (await activityOf(fromId)).length;
    const res = await designer.post(`/api/diagrams/${id}/move`).send({ projectId: fromId });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.projectId[0]).toMatch(/already in this project/);
    expect((await activityOf(fromId)).length).toBe(before);
  });

  it('refuses a project of another team the caller belongs to (400 on projectId), and answers 404 for one they cannot see', async () => {
    const id = await newDiagram(fromId, 'Team bound');
    // The designer's own second team: a member there, but not the diagram's team.
    const team = await designer.post('/api/teams').send({ name: 'Side jobs' });
    expect(team.status).toBe(201);
    const elsewhere = await newProject(designer, team.body.team.id, 'Side job');
    const res = await designer.post(`/api/diagrams/${id}/move`).send({ projectId: elsewhere });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.projectId[0]).toMatch(/same team/);

    const owner = await t.agentFor('owner');
    const hidden = await newProject(designer, team.body.team.id, 'Not shared');
    const notVisible = await owner.post(`/api/diagrams/${id}/move`).send({ projectId: hidden });
    expect(notVisible.status).toBe(404);
    const [row] = await t.db.select({ projectId: diagrams.projectId }).from(diagrams).where(eq(diagrams.id, id));
    expect(row?.projectId).toBe(fromId);
  });

  it('answers 400 naming projectId when it is missing, and 403 for a reviewer', async () => {
    const id = await newDiagram(fromId, 'Body checks');
    const res = await designer.post(`/api/diagrams/${id}/move`).send({});
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.projectId).toEqual(['projectId is required']);
    const reviewer = await t.agentFor('reviewer');
    expect((await reviewer.post(`/api/diagrams/${id}/move`).send({ projectId: toId })).status).toBe(403);
  });
});

describe('POST /api/diagrams/:id/copy', () => {
  it('copies the working copy only, named "… (copy)", and records it in the target project', async () => {
    const id = await newDiagram(fromId, 'Copied bank');
    expect((await designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: null, content: smallBank('Copied bank') })).status).toBe(201);
    // The working copy moves on after the revision: the copy takes the working copy, not revision 1.
    const current = (await designer.get(`/api/diagrams/${id}`)).body.diagram;
    const edited = { ...smallBank('Copied bank'), settings: { ...smallBank().settings, systemVoltage_V: 24 } };
    expect((await designer.put(`/api/diagrams/${id}/working-copy`).send({ content: edited, baseVersion: current.workingCopyVersion })).status).toBe(200);

    const res = await designer.post(`/api/diagrams/${id}/copy`).send({ projectId: toId });
    expect(res.status).toBe(201);
    const copy = res.body.diagram;
    expect(copy).toMatchObject({ projectId: toId, name: 'Copied bank (copy)', workingCopyVersion: 1 });
    expect(copy.id).not.toBe(id);
    expect(copy.content.name).toBe('Copied bank (copy)');
    expect(copy.content.settings.systemVoltage_V).toBe(24);
    expect(await t.db.select().from(diagramRevisions).where(eq(diagramRevisions.diagramId, copy.id))).toHaveLength(0);
    // The source is untouched.
    expect((await designer.get(`/api/diagrams/${id}`)).body.diagram.projectId).toBe(fromId);
    const rows = await t.db.select({ detail: activity.detail }).from(activity).where(and(eq(activity.projectId, toId), eq(activity.action, 'diagram.copied')));
    expect(rows.map((r) => r.detail)).toContainEqual(expect.objectContaining({ diagramId: copy.id, sourceDiagramId: id, sourceProjectId: fromId }));
  });

  it('takes a given name, and shortens a long one so " (copy)" fits in 120 characters', async () => {
    const id = await newDiagram(fromId, 'N'.repeat(120));
    const long = await designer.post(`/api/diagrams/${id}/copy`).send({ projectId: fromId });
    expect(long.status).toBe(201);
    expect(long.body.diagram.name).toBe(`${'N'.repeat(113)} (copy)`);
    const named = await designer.post(`/api/diagrams/${id}/copy`).send({ projectId: toId, name: 'Stage 2 bank' });
    expect(named.body.diagram.name).toBe('Stage 2 bank');
  });
});
