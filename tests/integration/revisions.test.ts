import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, count, eq } from 'drizzle-orm';
import { activity, diagramRevisions, diagrams } from '../../server/db/schema';
import { diagramSchema, type DiagramDocument } from '../../shared/electrical/document/schema';
import { resultsSummarySchema } from '../../shared/diagram/diff';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { partLimitBank, smallBank } from './fixtures';

let t: TestApp;
let designer: Agent;
let owner: Agent;
let stationId: string;

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  owner = await t.agentFor('owner');
  const teamId = (await designer.get('/api/teams')).body.teams[0].id;
  const projects = (await designer.get(`/api/projects?teamId=${teamId}`)).body.projects;
  stationId = projects.find((p: { name: string }) => p.name === 'Gannet Island ranger station').id;
});
afterAll(async () => {
  await t?.close();
});

/** SHA-256 of JSON with every object's keys sorted (written here independently of the server's serialiser). */
function expectedHash(doc: unknown): string {
  const sorted = JSON.stringify(doc, (_k, v) =>
    v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.keys(v).sort().map((k) => [k, v[k]])) : v,
  );
  return createHash('sha256').update(sorted).digest('hex');
}

async function newDiagram(name = 'Revision test'): Promise<string> {
  const res = await designer.post(`/api/projects/${stationId}/diagrams`).send({ name, content: smallBank(name) });
  expect(res.status).toBe(201);
  return res.body.diagram.id;
}

const save = (a: Agent, id: string, baseRevision: number | null, content: unknown, message = '') =>
  a.post(`/api/diagrams/${id}/revisions`).send({ baseRevision, message, content });

const revisionCount = async (id: string) => (await t.db.select({ n: count() }).from(diagramRevisions).where(eq(diagramRevisions.diagramId, id)))[0].n;

describe('saving revisions', () => {
  it('numbers revisions 1, 2, … and stores author, message, content hash and results summary', async () => {
    const id = await newDiagram();
    const doc = smallBank('First cut');
    const r1 = await save(designer, id, null, doc, '  First cut  ');
    expect(r1.status).toBe(201);
    const rev = r1.body.revision;
    expect(rev).toMatchObject({
      diagramId: id,
      number: 1,
      author: { id: expect.any(String), name: 'Tomasz Ilunga' },
      message: 'First cut',
      state: 'draft',
      restoredFrom: null,
      approvedBy: null,
      approvedAt: null,
      createdAt: expect.any(String),
    });
    expect(rev.contentHash).toBe(expectedHash(diagramSchema.parse(doc)));
    expect(rev.content).toEqual(diagramSchema.parse(doc));

    // Two equal 12 V batteries with a diagonal take-off share the load equally (first principles: symmetry).
    const summary = rev.resultsSummary;
    expect(resultsSummarySchema.safeParse(summary).success).toBe(true);
    expect(summary.status).toBe('solved');
    expect(summary.batteries.map((b: { id: string }) => b.id).sort()).toEqual(['bat1', 'bat2']);
    for (const b of summary.batteries) expect(b.share).toBeCloseTo(0.5, 3);
    expect(summary.imbalance_pct).toBeCloseTo(0, 3);
    // The template has no fuse at either battery: the core flags each battery in parallel without its own fuse.
    expect(summary.findings.filter((f: { rule: string }) => f.rule === 'parallel-battery-without-fuse').map((f: { parts: string[] }) => f.parts).sort()).toEqual([['bat1'], ['bat2']]);
    const counts = { error: 0, warning: 0, note: 0 } as Record<string, number>;
    for (const f of summary.findings) counts[f.severity] += 1;
    expect(summary.findingCounts).toEqual(counts);
    expect(rev.results).toEqual({ status: 'solved', findingCounts: counts });

    const r2 = await save(designer, id, 1, { ...doc, name: 'Second cut' }, 'Second cut');
    expect(r2.status).toBe(201);
    expect(r2.body.revision.number).toBe(2);
    expect(r2.body.revision.contentHash).not.toBe(rev.contentHash);

    const log = await t.db.select().from(activity).where(and(eq(activity.projectId, stationId), eq(activity.action, 'revision.saved')));
    expect(log.map((a) => a.detail)).toContainEqual({ diagramId: id, name: 'Revision test', number: 2, message: 'Second cut' });
  });

  it('gives equal documents the same hash whatever their key order', async () => {
    const id = await newDiagram();
    const doc = diagramSchema.parse(smallBank());
    const reversed = JSON.parse(JSON.stringify(doc, (_k, v) => (v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.entries(v).reverse()) : v)));
    const a = await save(designer, id, null, doc);
    const b = await save(designer, id, 1, reversed);
    expect(b.body.revision.contentHash).toBe(a.body.revision.contentHash);
  });

  it('refuses a save based on a revision that is no longer the latest (409 with the latest), storing nothing', async () => {
    const id = await newDiagram();
    await save(designer, id, null, smallBank('Base'));
    const theirs = await save(owner, id, 1, smallBank('Owner revision'), 'Owner moved the fuse');
    expect(theirs.status).toBe(201);
    const mine = await save(designer, id, 1, smallBank('Designer revision'), 'Designer changed a cable');
    expect(mine.status).toBe(409);
    expect(mine.body.error.code).toBe('revision_conflict');
    expect(mine.body.error.details).toEqual({
      latest: {
        number: 2,
        author: { id: expect.any(String), name: 'Maren Okafor' },
        createdAt: theirs.body.revision.createdAt,
        message: 'Owner moved the fuse',
        contentHash: theirs.body.revision.contentHash,
        state: 'draft',
      },
    });
    expect(await revisionCount(id)).toBe(2);
    // After review, the user saves their version on top of the latest.
    const onTop = await save(designer, id, 2, smallBank('Designer revision'), 'Designer changed a cable');
    expect(onTop.status).toBe(201);
    expect(onTop.body.revision.number).toBe(3);
  });

  it('refuses a first save that names a base, and a null base once revisions exist', async () => {
    const id = await newDiagram();
    const ghost = await save(designer, id, 3, smallBank());
    expect(ghost.status).toBe(409);
    expect(ghost.body.error.details).toEqual({ latest: null });
    await save(designer, id, null, smallBank());
    const again = await save(designer, id, null, smallBank());
    expect(again.status).toBe(409);
    expect(again.body.error.details.latest.number).toBe(1);
    expect(await revisionCount(id)).toBe(1);
  });

  it('lets only one of two saves from the same base through', async () => {
    const id = await newDiagram();
    await save(designer, id, null, smallBank());
    const [a, b] = await Promise.all([save(designer, id, 1, smallBank('A')), save(owner, id, 1, smallBank('B'))]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    expect(await revisionCount(id)).toBe(2);
  });

  it('validates the body (document paths under content), storing nothing', async () => {
    const id = await newDiagram();
    const doc = smallBank();
    const res = await designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: 'one', message: 'x'.repeat(501), content: { ...doc, parts: [{ ...doc.parts[0], type: 'flux_capacitor' }] } });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.details.fields).sort()).toEqual(['baseRevision', 'content.parts.0.type', 'message']);
    const missing = await designer.post(`/api/diagrams/${id}/revisions`).send({ message: 'no base' });
    expect(Object.keys(missing.body.error.details.fields).sort()).toEqual(['baseRevision', 'content']);
    expect(await revisionCount(id)).toBe(0);
  });

  it('names only the fields at fault, whether in the document (checked in a worker) or around it', async () => {
    const id = await newDiagram();
    const doc = smallBank();
    const badDoc = await designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: null, message: 'ok', content: { ...doc, cables: [{ ...doc.cables[0], from: 42 }] } });
    expect(badDoc.status).toBe(400);
    expect(badDoc.body.error.code).toBe('validation_failed');
    expect(Object.keys(badDoc.body.error.details.fields)).toEqual(['content.cables.0.from']);
    const badBase = await designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: 0, message: 'ok', content: doc });
    expect(badBase.status).toBe(400);
    expect(Object.keys(badBase.body.error.details.fields)).toEqual(['baseRevision']);
    const notObject = await designer.post(`/api/diagrams/${id}/revisions`).send([doc]);
    expect(notObject.status).toBe(400);
    expect(Object.keys(notObject.body.error.details.fields)).toEqual(['']);
    const notDoc = await designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: null, content: 'a diagram' });
    expect(Object.keys(notDoc.body.error.details.fields)).toEqual(['content']);
    expect(await revisionCount(id)).toBe(0);
  });

  it('answers a save with the revision as it is stored and read back', async () => {
    const id = await newDiagram();
    const saved = (await save(designer, id, null, smallBank('Answered'), 'Answered')).body.revision;
    const read = (await designer.get(`/api/diagrams/${id}/revisions/1`)).body.revision;
    expect(saved).toEqual(read);
    const restored = (await designer.post(`/api/diagrams/${id}/revisions/1/restore`).send({})).body.revision;
    expect(restored).toEqual((await designer.get(`/api/diagrams/${id}/revisions/2`)).body.revision);
  });

  it('is refused to a reviewer, a trainer and a viewer (403)', async () => {
    const id = await newDiagram();
    for (const role of ['reviewer', 'trainer', 'viewer'] as const) {
      const res = await save(await t.agentFor(role), id, null, smallBank());
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
    expect(await revisionCount(id)).toBe(0);
  });

  it('saves a 2,000-part revision, analysed off the request thread', async () => {
    const id = await newDiagram();
    const order: string[] = [];
    const big = partLimitBank();
    const saving = save(designer, id, null, big, 'Part-limit bank').then((r) => {
      order.push('save');
      return r;
    });
    // Give the request time to reach the analysis, then ask for something else: it must not wait for the solve.
    await new Promise((r) => setTimeout(r, 300));
    const health = await t.agent().get('/api/health');
    order.push('health');
    const res = await saving;
    expect(health.status).toBe(200);
    expect(res.status).toBe(201);
    expect(order).toEqual(['health', 'save']);
    expect(res.body.revision.resultsSummary.batteries).toHaveLength(big.parts.filter((p) => p.type === 'battery').length);
  });
});

describe('reading revisions', () => {
  let id: string;
  let docs: DiagramDocument[];
  beforeAll(async () => {
    id = await newDiagram('History');
    docs = [smallBank('v1'), smallBank('v2'), smallBank('v3')];
    let base: number | null = null;
    for (const [i, d] of docs.entries()) {
      const r = await save(designer, id, base, d, `Step ${i + 1}`);
      base = r.body.revision.number;
    }
  });

  it('lists revisions newest first, without content', async () => {
    const res = await (await t.agentFor('viewer')).get(`/api/diagrams/${id}/revisions`);
    expect(res.status).toBe(200);
    expect(res.body.revisions.map((r: { number: number; message: string }) => [r.number, r.message])).toEqual([
      [3, 'Step 3'],
      [2, 'Step 2'],
      [1, 'Step 1'],
    ]);
    for (const r of res.body.revisions) {
      expect(r).not.toHaveProperty('content');
      expect(r).not.toHaveProperty('resultsSummary');
      expect(r.results.status).toBe('solved');
    }
  });

  it('opens any revision with its content; unknown or malformed numbers are 404', async () => {
    const res = await (await t.agentFor('reviewer')).get(`/api/diagrams/${id}/revisions/2`);
    expect(res.status).toBe(200);
    expect(res.body.revision.content.name).toBe('v2');
    expect(res.body.revision.review).toEqual({ reviewers: [], decisions: [] });
    for (const n of ['4', '0', 'abc', '-1', '1.5', '01']) expect((await designer.get(`/api/diagrams/${id}/revisions/${n}`)).status).toBe(404);
  });

  it('shows the latest revision and the working copy hash on the diagram and the project list', async () => {
    const d = (await designer.get(`/api/diagrams/${id}`)).body.diagram;
    expect(d.latestRevision).toMatchObject({ number: 3, state: 'draft', message: 'Step 3', author: { name: 'Tomasz Ilunga' } });
    // The working copy still holds the content the diagram was created with (revisions do not touch it).
    expect(d.content.name).toBe('History');
    expect(d.workingCopyHash).toBe(expectedHash(d.content));
    expect(d.workingCopyHash).not.toBe(d.latestRevision.contentHash);
    const list = (await designer.get(`/api/projects/${stationId}/diagrams`)).body.diagrams;
    expect(list.find((x: { id: string }) => x.id === id).latestRevision).toEqual({ number: 3, state: 'draft' });
    const fresh = await newDiagram('No revisions');
    expect((await designer.get(`/api/projects/${stationId}/diagrams`)).body.diagrams.find((x: { id: string }) => x.id === fresh).latestRevision).toBeNull();
    expect((await designer.get(`/api/diagrams/${fresh}`)).body.diagram.latestRevision).toBeNull();
  });

  it('restores an old revision as a new revision on top', async () => {
    const res = await designer.post(`/api/diagrams/${id}/revisions/1/restore`).send({});
    expect(res.status).toBe(201);
    const first = (await designer.get(`/api/diagrams/${id}/revisions/1`)).body.revision;
    expect(res.body.revision).toMatchObject({ number: 4, restoredFrom: 1, message: 'Restored revision 1', contentHash: first.contentHash, state: 'draft' });
    expect(res.body.revision.content).toEqual(first.content);
    const named = await owner.post(`/api/diagrams/${id}/revisions/2/restore`).send({ message: 'Back to step 2 after site visit' });
    expect(named.body.revision).toMatchObject({ number: 5, restoredFrom: 2, message: 'Back to step 2 after site visit' });
    expect((await designer.post(`/api/diagrams/${id}/revisions/9/restore`).send({})).status).toBe(404);
    expect((await (await t.agentFor('reviewer')).post(`/api/diagrams/${id}/revisions/1/restore`).send({})).status).toBe(403);
    const log = await t.db.select().from(activity).where(and(eq(activity.projectId, stationId), eq(activity.action, 'revision.restored')));
    expect(log.map((a) => a.detail)).toContainEqual({ diagramId: id, name: 'History', number: 4, message: 'Restored revision 1', restoredFrom: 1 });
  });

  it('duplicates a diagram from its latest revision, or a chosen one, into the same project', async () => {
    const latest = (await designer.get(`/api/diagrams/${id}/revisions`)).body.revisions[0];
    const dup = await designer.post(`/api/diagrams/${id}/duplicate`).send({ name: 'History copy' });
    expect(dup.status).toBe(201);
    expect(dup.body.diagram).toMatchObject({ projectId: stationId, name: 'History copy', workingCopyVersion: 1 });
    const latestDoc = (await designer.get(`/api/diagrams/${id}/revisions/${latest.number}`)).body.revision.content;
    expect(dup.body.diagram.content).toEqual({ ...latestDoc, name: 'History copy' });
    expect((await designer.get(`/api/diagrams/${dup.body.diagram.id}/revisions`)).body.revisions).toEqual([]);

    const fromThree = await designer.post(`/api/diagrams/${id}/duplicate`).send({ name: 'Step 3 copy', revision: 3 });
    expect(fromThree.body.diagram.content.parts).toEqual(docs[2].parts);
    expect((await designer.post(`/api/diagrams/${id}/duplicate`).send({ name: 'Nope', revision: 42 })).status).toBe(404);
    expect((await designer.post(`/api/diagrams/${id}/duplicate`).send({})).status).toBe(400);

    // Without revisions, the working copy is copied.
    const plain = await newDiagram('Working copy only');
    const dupPlain = await designer.post(`/api/diagrams/${plain}/duplicate`).send({ name: 'Working copy only (copy)' });
    expect(dupPlain.body.diagram.content.parts).toEqual(smallBank().parts);
    const log = await t.db.select().from(activity).where(and(eq(activity.projectId, stationId), eq(activity.action, 'diagram.duplicated')));
    expect(log.map((a) => a.detail)).toContainEqual({ diagramId: dup.body.diagram.id, name: 'History copy', sourceDiagramId: id, sourceName: 'History', sourceRevision: latest.number });
  });
});

describe('immutability', () => {
  it('has no route that changes a revision', async () => {
    const id = await newDiagram();
    await save(designer, id, null, smallBank());
    for (const res of [
      await owner.put(`/api/diagrams/${id}/revisions/1`).send({ content: smallBank('changed') }),
      await owner.patch(`/api/diagrams/${id}/revisions/1`).send({ message: 'changed' }),
      await owner.delete(`/api/diagrams/${id}/revisions/1`),
    ]) {
      expect(res.status).toBe(404);
    }
  });

  it('the database refuses to change a saved revision, and anything about an approved one', async () => {
    const id = await newDiagram();
    const rev = (await save(designer, id, null, smallBank(), 'Frozen')).body.revision;
    const where = and(eq(diagramRevisions.diagramId, id), eq(diagramRevisions.number, 1));
    await expect(t.db.update(diagramRevisions).set({ content: smallBank('tampered') }).where(where)).rejects.toThrow();
    await expect(t.db.update(diagramRevisions).set({ message: 'rewritten' }).where(where)).rejects.toThrow();
    await expect(t.db.update(diagramRevisions).set({ contentHash: '0'.repeat(64) }).where(where)).rejects.toThrow();
    // The review state may move until approval…
    await t.db.update(diagramRevisions).set({ state: 'approved', approvedAt: new Date() }).where(where);
    // …and then nothing changes.
    await expect(t.db.update(diagramRevisions).set({ state: 'draft' }).where(where)).rejects.toThrow();
    const [row] = await t.db.select().from(diagramRevisions).where(where);
    expect(row).toMatchObject({ message: 'Frozen', contentHash: rev.contentHash, state: 'approved' });
    // Deleting the diagram still removes its revisions.
    await designer.delete(`/api/diagrams/${id}`);
    expect(await revisionCount(id)).toBe(0);
    expect((await t.db.select({ n: count() }).from(diagrams).where(eq(diagrams.id, id)))[0].n).toBe(0);
  });
});

describe("another team's revisions", () => {
  it('answer 404 on every revision route', async () => {
    const rival = t.agent();
    await rival.post('/api/auth/sign-up').send({ email: 'rival-rev@example.test', password: 'rival password 1', name: 'Rival' });
    const team = (await rival.post('/api/teams').send({ name: 'Rival Batteries' })).body.team.id;
    const project = (await rival.post('/api/projects').send({ teamId: team, name: 'Rival project' })).body.project.id;
    const diagram = (await rival.post(`/api/projects/${project}/diagrams`).send({ name: 'Rival diagram', content: smallBank('Rival') })).body.diagram.id;
    expect((await save(rival, diagram, null, smallBank('Rival'), 'Rival secret')).status).toBe(201);
    for (const res of [
      await designer.get(`/api/diagrams/${diagram}/revisions`),
      await designer.get(`/api/diagrams/${diagram}/revisions/1`),
      await save(designer, diagram, 1, smallBank()),
      await designer.post(`/api/diagrams/${diagram}/revisions/1/restore`).send({}),
      await designer.post(`/api/diagrams/${diagram}/duplicate`).send({ name: 'Stolen' }),
    ]) {
      expect(res.status).toBe(404);
      expect(JSON.stringify(res.body)).not.toContain('Rival');
    }
    expect(await revisionCount(diagram)).toBe(1);
  });
});
