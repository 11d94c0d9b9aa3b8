/**
 * Attack: insecure direct object reference across teams. A signed-in member of one team (the attacker)
 * uses the ids of another team's diagram, revision, comment, invite or member in every route that takes
 * them. Each must answer 404 not_found (never 403, which would confirm the id exists), leak nothing of
 * the resource, and change nothing. Projects and teams are covered by tests/integration/projects.test.ts
 * ("another team's resources"); this file adds what came after.
 *
 * Each case first makes the same call as a member of the victim team and requires a success, so a
 * missing route cannot pass as "404 for the attacker". A route that does not exist yet is skipped with
 * its name in the reason.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq } from 'drizzle-orm';
import { sql } from 'drizzle-orm';
import { busbarBankTemplate } from '../../shared/diagram/templates';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { diagrams, invites } from '../../server/db/schema';
import { multipart, png } from '../integration/upload-fixtures';

let t: TestApp;
let uploadDir: string;
let victim: Agent; // the demo team's designer
let victimOwner: Agent;
let attacker: Agent; // owner of a team of their own
let attackerTeamId: string;
let demoTeamId: string;
let projectId: string;
let diagramId: string;
let revisionNumber: number | null = null;
let commentId: string | null = null;

const SECRET = 'Victim secret bank layout';

async function tableFingerprint(): Promise<string> {
  const res = (await t.db.execute(
    sql.raw(`select string_agg(table_name, ',' order by table_name) as t from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE'`),
  )) as unknown as { rows: { t: string }[] };
  const names = res.rows[0].t.split(',');
  const q = names.map((n) => `select '${n}' as t, count(*)::text || md5(coalesce(string_agg(x::text, '|' order by x::text), '')) as h from "${n}" x`).join(' union all ');
  const rows = ((await t.db.execute(sql.raw(q))) as unknown as { rows: { t: string; h: string }[] }).rows;
  return JSON.stringify(rows);
}

beforeAll(async () => {
  uploadDir = fs.mkdtempSync(path.join(os.tmpdir(), 'bw-idor-'));
  t = await makeTestApp({ config: { dataDir: uploadDir } });
  victim = await t.agentFor('designer');
  victimOwner = await t.agentFor('owner');
  demoTeamId = (await victim.get('/api/teams')).body.teams[0].id;
  projectId = (await victim.post('/api/projects').send({ teamId: demoTeamId, name: SECRET })).body.project.id;
  const created = await victim.post(`/api/projects/${projectId}/diagrams`).send({ name: SECRET, content: busbarBankTemplate({ count: 2, name: SECRET }) });
  expect(created.status).toBe(201);
  diagramId = created.body.diagram.id;
  const rev = await victim.post(`/api/diagrams/${diagramId}/revisions`).send({ baseRevision: null, message: SECRET, content: busbarBankTemplate({ count: 2, name: SECRET }) });
  if (rev.status === 201) {
    revisionNumber = rev.body.revision.number;
    const c = await victimOwner.post(`/api/diagrams/${diagramId}/revisions/${revisionNumber}/comments`).send({ body: SECRET });
    if (c.status === 201) commentId = c.body.comment.id;
  }
  attacker = t.agent();
  expect((await attacker.post('/api/auth/sign-up').send({ email: 'mallory@rival.test', password: 'mallory password', name: 'Mallory' })).status).toBe(201);
  attackerTeamId = (await attacker.post('/api/teams').send({ name: 'Rival Power Systems' })).body.team.id;
});
afterAll(async () => {
  await t?.close();
  fs.rmSync(uploadDir, { recursive: true, force: true });
});

interface Probe {
  name: string;
  needs?: () => string | null; // reason to skip when a prerequisite route is missing
  method: 'get' | 'post' | 'patch' | 'put' | 'delete';
  url: () => string;
  body?: () => object;
  /** The victim team's own call, proving the route and the resource are real (not run for deletes). */
  legit?: { agent: () => Agent; status: number };
}

const doc = () => busbarBankTemplate({ count: 1, name: 'Defaced' });

const PROBES: Probe[] = [
  { name: 'read a diagram', method: 'get', url: () => `/api/diagrams/${diagramId}`, legit: { agent: () => victim, status: 200 } },
  { name: 'overwrite the working copy', method: 'put', url: () => `/api/diagrams/${diagramId}/working-copy`, body: () => ({ content: doc(), baseVersion: 1 }) },
  { name: 'rename a diagram', method: 'patch', url: () => `/api/diagrams/${diagramId}`, body: () => ({ name: 'Defaced' }) },
  { name: 'delete a diagram', method: 'delete', url: () => `/api/diagrams/${diagramId}` },
  { name: 'duplicate a diagram into reach', method: 'post', url: () => `/api/diagrams/${diagramId}/duplicate`, body: () => ({ name: 'Stolen copy' }) },
  { name: 'create a diagram in their project', method: 'post', url: () => `/api/projects/${projectId}/diagrams`, body: () => ({ name: 'Planted' }) },
  { name: 'list revisions', method: 'get', url: () => `/api/diagrams/${diagramId}/revisions`, legit: { agent: () => victim, status: 200 } },
  { name: 'save a revision', method: 'post', url: () => `/api/diagrams/${diagramId}/revisions`, body: () => ({ baseRevision: revisionNumber, message: 'planted', content: doc() }) },
  {
    name: 'read a revision', needs: () => (revisionNumber ? null : 'POST /api/diagrams/:id/revisions is missing'),
    method: 'get', url: () => `/api/diagrams/${diagramId}/revisions/${revisionNumber}`, legit: { agent: () => victim, status: 200 },
  },
  {
    name: 'restore a revision', needs: () => (revisionNumber ? null : 'revisions route missing'),
    method: 'post', url: () => `/api/diagrams/${diagramId}/revisions/${revisionNumber}/restore`, body: () => ({}),
  },
  {
    name: 'read comments', needs: () => (commentId ? null : 'comment routes missing'),
    method: 'get', url: () => `/api/diagrams/${diagramId}/revisions/${revisionNumber}/comments`, legit: { agent: () => victim, status: 200 },
  },
  {
    name: 'post a comment', needs: () => (commentId ? null : 'comment routes missing'),
    method: 'post', url: () => `/api/diagrams/${diagramId}/revisions/${revisionNumber}/comments`, body: () => ({ body: 'planted' }),
  },
  {
    name: 'resolve a comment', needs: () => (commentId ? null : 'comment routes missing'),
    method: 'patch', url: () => `/api/diagrams/${diagramId}/revisions/${revisionNumber}/comments/${commentId}`, body: () => ({ resolved: true }),
  },
  {
    name: 'decide a review', needs: () => (revisionNumber ? null : 'revisions route missing'),
    method: 'post', url: () => `/api/diagrams/${diagramId}/revisions/${revisionNumber}/decision`, body: () => ({ decision: 'approve' }),
  },
];

describe('IDOR: another team\'s diagrams, revisions and comments answer 404 and stay unchanged', () => {
  for (const p of PROBES) {
    it(`${p.name}: ${p.method.toUpperCase()} ${p.url().replace(/undefined|null/g, ':id')}`, async (ctx) => {
      const reason = p.needs?.();
      if (reason) ctx.skip(reason);
      if (p.legit) {
        const ok = await p.legit.agent()[p.method](p.url());
        expect(ok.status, `the victim's own call must work (route missing?): ${JSON.stringify(ok.body).slice(0, 200)}`).toBe(p.legit.status);
      }
      const before = await tableFingerprint();
      const req = attacker[p.method](p.url());
      const res = p.body ? await req.send(p.body()) : await req;
      expect(res.status).toBe(404);
      expect(res.body.error.code).toBe('not_found');
      expect(res.text).not.toContain(SECRET);
      expect(res.text).not.toContain(projectId);
      expect(await tableFingerprint()).toBe(before);
    });
  }

  it('the victim\'s diagram is intact after every attempt', async () => {
    const [row] = await t.db.select().from(diagrams).where(eq(diagrams.id, diagramId));
    expect(row.name).toBe(SECRET);
    expect((await t.db.select({ n: count() }).from(diagrams).where(eq(diagrams.projectId, projectId)))[0].n).toBe(1);
  });
});

describe('IDOR: another team\'s invites and members through one\'s own team path', () => {
  it('revoking their invite through my team answers 404 and the invite stays open', async () => {
    const inv = await victimOwner.post(`/api/teams/${demoTeamId}/invites`).send({ email: 'new.hire@example.test', role: 'viewer' });
    expect(inv.status).toBe(201);
    const res = await attacker.delete(`/api/teams/${attackerTeamId}/invites/${inv.body.invite.id}`);
    expect(res.status).toBe(404);
    const [row] = await t.db.select().from(invites).where(eq(invites.id, inv.body.invite.id));
    expect(row.acceptedAt).toBeNull();
    expect((await victimOwner.get(`/api/teams/${demoTeamId}/members`)).body.invites.map((i: { id: string }) => i.id)).toContain(inv.body.invite.id);
  });

  it('changing the role of or removing their member through my team answers 404', async () => {
    const members = (await victimOwner.get(`/api/teams/${demoTeamId}/members`)).body.members as { userId: string; role: string }[];
    const target = members.find((m) => m.role === 'viewer')!;
    expect((await attacker.patch(`/api/teams/${attackerTeamId}/members/${target.userId}`).send({ role: 'owner' })).status).toBe(404);
    expect((await attacker.delete(`/api/teams/${attackerTeamId}/members/${target.userId}`)).status).toBe(404);
    const after = (await victimOwner.get(`/api/teams/${demoTeamId}/members`)).body.members as { userId: string; role: string }[];
    expect(after.find((m) => m.userId === target.userId)?.role).toBe('viewer');
  });

  it("uploads: another team's upload by id answers 404 to download and delete, and their upload list too; the file stays", async () => {
    const bytes = png(4, 4);
    const { body, type } = multipart('victim site photo.png', bytes, 'image/png');
    const up = await victim.post(`/api/projects/${projectId}/uploads`).set('Content-Type', type).send(body);
    expect(up.status).toBe(201);
    const uploadId = up.body.upload.id;
    // The same calls work for the victim.
    expect((await victim.get(`/api/uploads/${uploadId}/content`)).status).toBe(200);
    const before = await tableFingerprint();
    const download = await attacker.get(`/api/uploads/${uploadId}/content`);
    expect(download.status).toBe(404);
    expect(download.body.error.code).toBe('not_found');
    expect(JSON.stringify(download.body)).not.toContain('victim site photo');
    const list = await attacker.get(`/api/projects/${projectId}/uploads`);
    expect(list.status).toBe(404);
    expect(JSON.stringify(list.body)).not.toContain('victim site photo');
    expect((await attacker.delete(`/api/uploads/${uploadId}`)).status).toBe(404);
    expect(await tableFingerprint()).toBe(before);
    const again = await victim.get(`/api/uploads/${uploadId}/content`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(again.status).toBe(200);
    expect(Buffer.compare(again.body as Buffer, bytes)).toBe(0);
  });
});
