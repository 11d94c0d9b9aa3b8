/**
 * Saves that race for the same revision number. A save is one statement (server/services/revisions.ts):
 * on PostgreSQL two saves from the same base both read the same latest number and the unique index on
 * (diagram_id, number) refuses the second; on PGlite statements run one at a time, so the second sees
 * the first's revision. Either way the loser answers 409 (a restore goes on top instead) and stores
 * nothing: no revision, no activity row.
 *
 * To make the race certain, the test itself holds revision 2 in an open transaction while the save
 * arrives; on PostgreSQL it waits until the save is blocked on that row's index entry before committing.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, count, eq, sql } from 'drizzle-orm';
import { activity, diagramRevisions } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { smallBank } from './fixtures';

const onPostgres = Boolean(process.env.DATABASE_URL);

let t: TestApp;
let designer: Agent;
let stationId: string;

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  const teamId = (await designer.get('/api/teams')).body.teams[0].id;
  const projects = (await designer.get(`/api/projects?teamId=${teamId}`)).body.projects;
  stationId = projects.find((p: { name: string }) => p.name === 'Gannet Island ranger station').id;
});
afterAll(async () => {
  await t?.close();
});

const save = (id: string, baseRevision: number | null, name: string) =>
  designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision, message: name, content: smallBank(name) });

async function diagramWithOneRevision(name: string) {
  const d = await designer.post(`/api/projects/${stationId}/diagrams`).send({ name, content: smallBank(name) });
  expect(d.status).toBe(201);
  const first = await save(d.body.diagram.id, null, `${name} 1`);
  expect(first.status).toBe(201);
  return { id: d.body.diagram.id as string, first: first.body.revision };
}

const revisionNumbers = async (id: string) =>
  (await t.db.select({ n: diagramRevisions.number }).from(diagramRevisions).where(eq(diagramRevisions.diagramId, id))).map((r) => r.n).sort((a, b) => a - b);

const activityRows = async (id: string, action: string) =>
  (await t.db.select({ n: count() }).from(activity).where(and(eq(activity.action, action), sql`${activity.detail}->>'diagramId' = ${id}`)))[0].n;

/** Backends of this database waiting for a lock (PostgreSQL only). */
async function waitingBackends(): Promise<number> {
  const r = (await t.db.execute(sql`select count(*)::int as n from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock'`)) as unknown as { rows: { n: number }[] };
  return Number(r.rows[0].n);
}

/**
 * Inserts revision 2 of `first`'s diagram in a transaction, sends `request` while it is open, and commits
 * once the request is waiting for it (PostgreSQL: a backend waits for a lock; PGlite runs one statement at
 * a time, so the request simply queues behind the transaction). Returns the request's response and
 * whether it was seen waiting on the index entry.
 */
async function raceAgainstHeldRevision(first: { diagramId: string; content: unknown; contentHash: string; resultsSummary: unknown }, request: () => Promise<{ status: number; body: any }>) {
  let response!: Promise<{ status: number; body: any }>;
  let sawWaiting = false;
  await t.db.transaction(async (tx) => {
    await tx.insert(diagramRevisions).values({
      id: `held-${first.diagramId}`,
      diagramId: first.diagramId,
      number: 2,
      authorId: null,
      message: 'held by the test',
      content: first.content,
      contentHash: first.contentHash,
      resultsSummary: first.resultsSummary,
    });
    // supertest sends a request only once it is awaited (then): start it now, inside the transaction.
    response = Promise.resolve(request());
    if (onPostgres) {
      for (let i = 0; i < 100 && !sawWaiting; i++) {
        await new Promise((r) => setTimeout(r, 50));
        sawWaiting = (await waitingBackends()) > 0;
      }
    } else {
      // Any query of the request (its access check) waits for this transaction on PGlite.
      await new Promise((r) => setTimeout(r, 300));
    }
  });
  return { res: await response, sawWaiting };
}

describe('saves racing for a revision number', () => {
  it('the save that loses answers 409 naming the winner, and stores neither a revision nor an activity row', async () => {
    const { id, first } = await diagramWithOneRevision('Race lost');
    const { res, sawWaiting } = await raceAgainstHeldRevision(first, () => save(id, 1, 'Race lost 2'));
    if (onPostgres) expect(sawWaiting).toBe(true);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('revision_conflict');
    expect(res.body.error.details.latest).toMatchObject({ number: 2, message: 'held by the test', author: null });
    expect(await revisionNumbers(id)).toEqual([1, 2]);
    expect(await activityRows(id, 'revision.saved')).toBe(1);
  });

  it('a restore that loses the number goes on top of the winner', async () => {
    const { id, first } = await diagramWithOneRevision('Restore race');
    const { res, sawWaiting } = await raceAgainstHeldRevision(first, () => designer.post(`/api/diagrams/${id}/revisions/1/restore`).send({}));
    if (onPostgres) expect(sawWaiting).toBe(true);
    expect(res.status).toBe(201);
    expect(res.body.revision).toMatchObject({ number: 3, restoredFrom: 1, contentHash: first.contentHash });
    expect(await revisionNumbers(id)).toEqual([1, 2, 3]);
    expect(await activityRows(id, 'revision.restored')).toBe(1);
  });

  it('of eight saves from one base sent at once, one is stored and seven answer 409', async () => {
    const { id } = await diagramWithOneRevision('Eight at once');
    const results = await Promise.all(Array.from({ length: 8 }, (_, i) => save(id, 1, `Eight at once, try ${i}`)));
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([201, 409, 409, 409, 409, 409, 409, 409]);
    const winner = results.find((r) => r.status === 201)!.body.revision;
    for (const r of results.filter((x) => x.status === 409)) expect(r.body.error.details.latest).toMatchObject({ number: 2, contentHash: winner.contentHash });
    expect(await revisionNumbers(id)).toEqual([1, 2]);
    expect(await activityRows(id, 'revision.saved')).toBe(2);
    // The answer was built from the insert: it matches the stored revision read back.
    const stored = (await designer.get(`/api/diagrams/${id}/revisions/2`)).body.revision;
    expect(winner).toEqual(stored);
  });
});
