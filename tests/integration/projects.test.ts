import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { activity, diagrams, projects } from '../../server/db/schema';
import { newId } from '../../server/ids';
import { diagramSchema } from '../../shared/electrical/document/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';

let t: TestApp;
let designer: Agent;
let demoTeamId: string;

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  demoTeamId = (await designer.get('/api/teams')).body.teams[0].id;
});
afterAll(async () => {
  await t?.close();
});

const projectCount = async () => (await t.db.select({ n: count() }).from(projects))[0].n;

describe('projects', () => {
  it('lists the demo projects, the ranger station with its three diagrams', async () => {
    const res = await designer.get(`/api/projects?teamId=${demoTeamId}`);
    expect(res.status).toBe(200);
    expect(res.body.projects.map((p: { name: string }) => p.name).sort()).toEqual([
      'Gannet Island ranger station',
      'MV Storm Petrel house bank',
      'Ridgeback repeater site 7',
    ]);
    const station = res.body.projects.find((p: { name: string }) => p.name === 'Gannet Island ranger station');
    expect(station).toEqual({
      id: expect.any(String),
      teamId: demoTeamId,
      name: 'Gannet Island ranger station',
      site: expect.stringContaining('Gannet Island'),
      description: expect.any(String),
      createdAt: expect.any(String),
      updatedAt: expect.any(String),
      diagramCount: 3,
    });
    const list = await designer.get(`/api/projects/${station.id}/diagrams`);
    expect(list.status).toBe(200);
    expect(list.body.diagrams.map((d: { name: string }) => d.name)).toEqual([
      'Post-to-post bank, end take-off',
      'Busbar bank, unequal cables',
      '48 V series-parallel 4S2P',
    ]);
    expect(list.body.diagrams[0]).toEqual({
      id: expect.any(String),
      projectId: station.id,
      name: 'Post-to-post bank, end take-off',
      description: expect.any(String),
      updatedAt: expect.any(String),
      partCount: expect.any(Number),
      latestRevision: { number: 3, state: 'in_review' },
    });
    expect(list.body.diagrams.slice(1).map((d: { latestRevision: unknown }) => d.latestRevision)).toEqual([null, null]);
    // The seeded documents are valid diagram documents, and partCount counts their parts.
    const rows = await t.db.select().from(diagrams).where(eq(diagrams.projectId, station.id));
    for (const d of list.body.diagrams) {
      const row = rows.find((r) => r.id === d.id)!;
      expect(diagramSchema.safeParse(row.content).success).toBe(true);
      const parts = (row.content as { parts: unknown[] }).parts;
      expect(parts.length).toBeGreaterThan(0);
      expect(d.partCount).toBe(parts.length);
    }
  });

  it('counts the parts of a diagram document', async () => {
    const created = await designer.post('/api/projects').send({ teamId: demoTeamId, name: 'Part count check' });
    const projectId = created.body.project.id;
    await t.db.insert(diagrams).values([
      { id: newId(), projectId, name: 'three parts', content: { formatVersion: 1, parts: [{ id: 'a' }, { id: 'b' }, { id: 'c' }], cables: [] } },
      { id: newId(), projectId, name: 'no parts array', content: { formatVersion: 1, parts: 'oops' } },
    ]);
    const list = await designer.get(`/api/projects/${projectId}/diagrams`);
    const byName = Object.fromEntries(list.body.diagrams.map((d: { name: string; partCount: number }) => [d.name, d.partCount]));
    expect(byName).toEqual({ 'three parts': 3, 'no parts array': 0 });
    expect((await designer.get(`/api/projects/${projectId}`)).body.project.diagramCount).toBe(2);
  });

  it('requires teamId to list, and answers 404 for a team the user is not in', async () => {
    const missing = await designer.get('/api/projects');
    expect(missing.status).toBe(400);
    expect(missing.body.error.details.fields.teamId).toEqual(['teamId is required']);
    expect((await designer.get('/api/projects?teamId=no-such-team')).status).toBe(404);
  });

  it('creates, reads, updates and deletes a project, logging activity', async () => {
    const created = await designer.post('/api/projects').send({ teamId: demoTeamId, name: '  Tern Point lighthouse  ', site: 'Tern Point', description: '24 V bank for the light and the radio.' });
    expect(created.status).toBe(201);
    expect(created.body.project).toMatchObject({ teamId: demoTeamId, name: 'Tern Point lighthouse', site: 'Tern Point', diagramCount: 0 });
    const id = created.body.project.id;

    expect((await designer.get(`/api/projects/${id}`)).body.project.name).toBe('Tern Point lighthouse');

    const patched = await designer.patch(`/api/projects/${id}`).send({ description: '24 V bank, 400 Ah.' });
    expect(patched.status).toBe(200);
    expect(patched.body.project).toMatchObject({ name: 'Tern Point lighthouse', description: '24 V bank, 400 Ah.' });
    expect(new Date(patched.body.project.updatedAt).getTime()).toBeGreaterThanOrEqual(new Date(created.body.project.updatedAt).getTime());

    const log = await t.db.select().from(activity).where(eq(activity.projectId, id));
    expect(log.map((a) => a.action).sort()).toEqual(['project.created', 'project.updated']);

    expect((await designer.delete(`/api/projects/${id}`)).status).toBe(204);
    expect((await designer.get(`/api/projects/${id}`)).status).toBe(404);
    expect((await t.db.select({ n: count() }).from(activity).where(eq(activity.projectId, id)))[0].n).toBe(0);
  });

  it('refuses an empty update and invalid fields without storing anything', async () => {
    const list = await designer.get(`/api/projects?teamId=${demoTeamId}`);
    const p = list.body.projects[0];
    const empty = await designer.patch(`/api/projects/${p.id}`).send({});
    expect(empty.status).toBe(400);
    expect(empty.body.error.code).toBe('validation_failed');
    const bad = await designer.patch(`/api/projects/${p.id}`).send({ name: 'x', site: 'y'.repeat(201) });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.details.fields).sort()).toEqual(['name', 'site']);
    const after = (await designer.get(`/api/projects/${p.id}`)).body.project;
    expect(after).toEqual(p);
  });

  it('a viewer may read but not create, edit or delete (403), and nothing is stored', async () => {
    const viewer = await t.agentFor('viewer');
    const before = await projectCount();
    const list = await viewer.get(`/api/projects?teamId=${demoTeamId}`);
    expect(list.status).toBe(200);
    const p = list.body.projects[0];
    const create = await viewer.post('/api/projects').send({ teamId: demoTeamId, name: 'Viewer project' });
    expect(create.status).toBe(403);
    expect(create.body.error.code).toBe('forbidden');
    expect((await viewer.patch(`/api/projects/${p.id}`).send({ name: 'Viewer rename' })).status).toBe(403);
    expect((await viewer.delete(`/api/projects/${p.id}`)).status).toBe(403);
    expect(await projectCount()).toBe(before);
    expect((await viewer.get(`/api/projects/${p.id}`)).body.project.name).toBe(p.name);
  });
});

describe("another team's resources", () => {
  it('answer 404, never their data, and are left unchanged', async () => {
    const other = t.agent();
    await other.post('/api/auth/sign-up').send({ email: 'rival@example.test', password: 'rival password 1', name: 'Rival' });
    const rivalTeam = (await other.post('/api/teams').send({ name: 'Rival Batteries' })).body.team.id;
    const rivalProject = (await other.post('/api/projects').send({ teamId: rivalTeam, name: 'Rival secret bank', site: 'Hidden' })).body.project.id;

    for (const res of [
      await designer.get(`/api/projects?teamId=${rivalTeam}`),
      await designer.get(`/api/projects/${rivalProject}`),
      await designer.get(`/api/projects/${rivalProject}/diagrams`),
      await designer.patch(`/api/projects/${rivalProject}`).send({ name: 'Defaced' }),
      await designer.delete(`/api/projects/${rivalProject}`),
      await designer.post('/api/projects').send({ teamId: rivalTeam, name: 'Planted project' }),
      await designer.get(`/api/teams/${rivalTeam}`),
      await designer.get(`/api/teams/${rivalTeam}/members`),
      await designer.get(`/api/teams/${rivalTeam}/outbox`),
    ]) {
      expect(res.status).toBe(404);
      expect(res.body.error.code).toBe('not_found');
      expect(JSON.stringify(res.body)).not.toContain('Rival');
    }
    const [row] = await t.db.select().from(projects).where(eq(projects.id, rivalProject));
    expect(row.name).toBe('Rival secret bank');
    expect((await t.db.select({ n: count() }).from(projects).where(eq(projects.teamId, rivalTeam)))[0].n).toBe(1);
  });
});
