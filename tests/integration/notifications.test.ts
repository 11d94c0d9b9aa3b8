/**
 * Notifications, the work list, each user's own outbox and unit preference: the review events reach every
 * recipient in the app (not only by mail), each user sees only their own, and a removed member sees none
 * of the team's.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { notifications } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { smallBank } from './fixtures';

let t: TestApp;
let designer: Agent;
let reviewer: Agent;
let owner: Agent;
let trainer: Agent;
let teamId: string;
let stationId: string;
const ids: Record<string, string> = {};

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  reviewer = await t.agentFor('reviewer');
  owner = await t.agentFor('owner');
  trainer = await t.agentFor('trainer');
  teamId = (await designer.get('/api/teams')).body.teams[0].id;
  const projects = (await designer.get(`/api/projects?teamId=${teamId}`)).body.projects;
  stationId = projects.find((p: { name: string }) => p.name === 'Gannet Island ranger station').id;
  for (const m of (await designer.get(`/api/teams/${teamId}/members`)).body.members) ids[m.email.split('@')[0]] = m.userId;
});
afterAll(async () => {
  await t?.close();
});

async function diagramWithRevisions(count: number, name: string): Promise<string> {
  const id = (await designer.post(`/api/projects/${stationId}/diagrams`).send({ name, content: smallBank(name) })).body.diagram.id;
  let base: number | null = null;
  for (let i = 1; i <= count; i++) {
    const res: { status: number; body: { revision: { number: number } } } = await designer
      .post(`/api/diagrams/${id}/revisions`)
      .send({ baseRevision: base, message: `Revision ${i}`, content: smallBank(`${name} ${i}`) });
    expect(res.status).toBe(201);
    base = res.body.revision.number;
  }
  return id;
}

type Notice = { id: string; kind: string; diagram: { id: string; name: string }; revision: number; actor: { name: string } | null; read: boolean; excerpt: string; path: string };
const noticesOf = async (a: Agent, diagramId: string): Promise<Notice[]> =>
  (await a.get('/api/notifications?limit=100')).body.notifications.filter((n: Notice) => n.diagram.id === diagramId);

describe('notifications of the review flow', () => {
  it('the demo’s review history comes with the notices it would have stored', async () => {
    const r = (await reviewer.get('/api/notifications')).body;
    // The reviewer commented after each of these: acting on a revision read them.
    expect(r.notifications.map((n: Notice) => [n.kind, n.revision, n.read])).toEqual([
      ['reply', 3, true],
      ['review_requested', 3, true],
      ['review_requested', 2, true],
    ]);
    expect(r.unread).toBe(0);
    const d = (await designer.get('/api/notifications')).body;
    expect(d.notifications.map((n: Notice) => [n.kind, n.revision, n.read])).toEqual([
      ['comment', 3, false],
      ['comment', 3, true],
      ['approved', 2, true],
    ]);
    expect((await trainer.get('/api/notifications')).body).toEqual({ notifications: [], unread: 0 });
  });

  it('stores one notice per recipient for a request, comments, replies and decisions, never to the actor', async () => {
    const id = await diagramWithRevisions(2, 'Notice flow');
    const before = (await reviewer.get('/api/notifications')).body.unread;
    expect((await designer.post(`/api/diagrams/${id}/revisions/2/review-requests`).send({ reviewerIds: [ids.reviewer] })).status).toBe(200);

    let rev = await noticesOf(reviewer, id);
    expect(rev).toHaveLength(1);
    expect(rev[0]).toMatchObject({ kind: 'review_requested', revision: 2, read: false, actor: { name: expect.any(String) }, path: `/diagrams/${id}/compare?a=1&b=2` });
    expect((await reviewer.get('/api/notifications')).body.unread).toBe(before + 1);
    expect(await noticesOf(designer, id)).toHaveLength(0);
    expect(await noticesOf(trainer, id)).toHaveLength(0);

    const c = await reviewer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Fuse F1   is\nundersized' });
    expect(c.status).toBe(201);
    const d1 = await noticesOf(designer, id);
    expect(d1.map((n) => n.kind)).toEqual(['comment']);
    expect(d1[0].excerpt).toBe('Fuse F1 is undersized');

    // Commenting on the revision read the reviewer's own notice about it.
    expect((await noticesOf(reviewer, id)).map((n) => n.read)).toEqual([true]);

    const reply = await designer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Raised to 200 A', parentId: c.body.comment.id });
    expect(reply.status).toBe(201);
    rev = await noticesOf(reviewer, id);
    expect(rev.map((n) => n.kind)).toEqual(['reply', 'review_requested']);

    expect((await reviewer.get('/api/notifications')).body.unread).toBe(before + 1);
    expect((await reviewer.post(`/api/diagrams/${id}/revisions/2/decision`).send({ decision: 'request_changes', note: 'See F1' })).status).toBe(200);
    // Deciding read the reply too.
    expect((await noticesOf(reviewer, id)).every((n) => n.read)).toBe(true);
    expect((await reviewer.post(`/api/diagrams/${id}/revisions/2/decision`).send({ decision: 'approve', note: '' })).status).toBe(200);
    const d2 = await noticesOf(designer, id);
    expect(d2.map((n) => n.kind)).toEqual(['approved', 'changes_requested', 'comment']);
    expect(d2[1].excerpt).toBe('See F1');
  });

  it('marks read only the caller’s own notices and answers the unread count', async () => {
    const id = await diagramWithRevisions(1, 'Mark read');
    await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer, ids.owner] });
    const [mine] = await noticesOf(reviewer, id);
    const [owners] = await noticesOf(owner, id);
    const unread = (await reviewer.get('/api/notifications')).body.unread;

    // Another user's id changes nothing.
    const other = await reviewer.post('/api/notifications/read').send({ ids: [owners.id] });
    expect(other.status).toBe(200);
    expect(other.body.unread).toBe(unread);
    expect((await noticesOf(owner, id))[0].read).toBe(false);

    const res = await reviewer.post('/api/notifications/read').send({ ids: [mine.id] });
    expect(res.body.unread).toBe(unread - 1);
    expect((await noticesOf(reviewer, id))[0].read).toBe(true);
    const unreadList = (await reviewer.get('/api/notifications?unread=1')).body.notifications;
    expect(unreadList.some((n: Notice) => n.id === mine.id)).toBe(false);

    const all = await owner.post('/api/notifications/read').send({ all: true });
    expect(all.body).toEqual({ unread: 0 });
  });

  it('refuses a malformed body with a message naming the field', async () => {
    const both = await reviewer.post('/api/notifications/read').send({ ids: ['x'], all: true });
    expect(both.status).toBe(400);
    expect(both.body.error.details.fields.ids).toEqual(['Give either ids or all: true']);
    const none = await reviewer.post('/api/notifications/read').send({});
    expect(none.status).toBe(400);
    const empty = await reviewer.post('/api/notifications/read').send({ ids: [] });
    expect(empty.body.error.details.fields.ids).toEqual(['Name at least one notification']);
    const limit = await reviewer.get('/api/notifications?limit=500');
    expect(limit.status).toBe(400);
    expect(limit.body.error.details.fields.limit).toEqual(['limit must be at most 100']);
  });

  it('a notice stored with the event: a refused request stores none', async () => {
    const id = await diagramWithRevisions(1, 'Refused');
    const bad = await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer, ids.viewer] });
    expect(bad.status).toBe(400);
    expect(await t.db.select().from(notifications).where(eq(notifications.diagramId, id))).toHaveLength(0);
  });
});

describe('work that waits', () => {
  it('lists a reviewer’s pending reviews until they decide, the designer’s changes requested, and approvals', async () => {
    const id = await diagramWithRevisions(2, 'Work list');
    await designer.post(`/api/diagrams/${id}/revisions/2/review-requests`).send({ reviewerIds: [ids.reviewer] });
    const waiting = (await reviewer.get('/api/work')).body.waitingForReview;
    expect(waiting.filter((w: { diagram: { id: string } }) => w.diagram.id === id)).toMatchObject([{ revision: 2, state: 'in_review', path: `/diagrams/${id}/compare?a=1&b=2` }]);
    // Not on the owner's list: they were not asked.
    expect((await owner.get('/api/work')).body.waitingForReview.some((w: { diagram: { id: string } }) => w.diagram.id === id)).toBe(false);

    await reviewer.post(`/api/diagrams/${id}/revisions/2/decision`).send({ decision: 'request_changes', note: 'Fuse' });
    expect((await reviewer.get('/api/work')).body.waitingForReview.some((w: { diagram: { id: string } }) => w.diagram.id === id)).toBe(false);
    const changes = (await designer.get('/api/work')).body.changesRequested;
    expect(changes.some((w: { diagram: { id: string }; revision: number }) => w.diagram.id === id && w.revision === 2)).toBe(true);

    // Asked again: waiting again.
    await designer.post(`/api/diagrams/${id}/revisions/2/review-requests`).send({ reviewerIds: [ids.reviewer] });
    await reviewer.post(`/api/diagrams/${id}/revisions/2/decision`).send({ decision: 'approve', note: '' });
    const approvals = (await trainer.get('/api/work')).body.recentApprovals;
    expect(approvals[0]).toMatchObject({ diagram: { id }, revision: 2, state: 'approved' });
  });
});

describe('a removed member', () => {
  it('sees none of the team’s notices or work', async () => {
    const id = await diagramWithRevisions(1, 'Removed');
    await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer] });
    expect((await noticesOf(reviewer, id)).length).toBe(1);
    expect((await owner.delete(`/api/teams/${teamId}/members/${ids.reviewer}`)).status).toBe(204);
    expect(await noticesOf(reviewer, id)).toHaveLength(0);
    expect((await reviewer.get('/api/notifications')).body.unread).toBe(0);
    expect((await reviewer.get('/api/work')).body).toEqual({ waitingForReview: [], changesRequested: [], recentApprovals: [] });
  });
});

describe('own outbox and preferences', () => {
  it('gives each user only the mail captured for their account', async () => {
    const t2 = await makeTestApp();
    try {
      const d = await t2.agentFor('designer');
      const r = await t2.agentFor('reviewer');
      const v = await t2.agentFor('viewer');
      const o = await t2.agentFor('owner');
      const team = (await d.get('/api/teams')).body.teams[0].id;
      const members = (await d.get(`/api/teams/${team}/members`)).body.members;
      const rid = members.find((m: { email: string }) => m.email === 'reviewer@demo.test').userId;
      const proj = (await d.get(`/api/projects?teamId=${team}`)).body.projects[0].id;
      const id = (await d.post(`/api/projects/${proj}/diagrams`).send({ name: 'Mail', content: smallBank('Mail') })).body.diagram.id;
      await d.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: null, message: '', content: smallBank('Mail') });
      await d.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [rid] });
      // An invite to an address no account has stays with the owners.
      await o.post(`/api/teams/${team}/invites`).send({ email: 'newcomer@example.test', role: 'viewer' });

      const mine = (await r.get('/api/account/outbox')).body.messages;
      expect(mine.map((m: { to: string; subject: string }) => [m.to, m.subject])).toEqual([['reviewer@demo.test', 'Review requested: Mail revision 1']]);
      expect((await v.get('/api/account/outbox')).body.messages).toEqual([]);
      expect((await o.get(`/api/teams/${team}/outbox`)).body.messages.map((m: { to: string }) => m.to).sort()).toEqual(['newcomer@example.test', 'reviewer@demo.test']);
    } finally {
      await t2.close();
    }
  });

  it('has no own outbox when mail goes by SMTP', async () => {
    const t3 = await makeTestApp({ mailer: { mode: 'smtp', async sendMail() {}, async close() {} } });
    try {
      const r = await t3.agentFor('reviewer');
      expect((await r.get('/api/account/outbox')).status).toBe(404);
    } finally {
      await t3.close();
    }
  });

  it('stores the user’s unit system, shows it on /me, and refuses anything but metric, us or null', async () => {
    expect((await designer.get('/api/auth/me')).body.preferences).toEqual({ unitSystem: null });
    const set = await designer.patch('/api/account/preferences').send({ unitSystem: 'us' });
    expect(set.status).toBe(200);
    expect(set.body.preferences).toEqual({ unitSystem: 'us' });
    expect((await designer.get('/api/auth/me')).body.preferences).toEqual({ unitSystem: 'us' });
    // Another user's preference is untouched.
    expect((await reviewer.get('/api/account/preferences')).body.preferences).toEqual({ unitSystem: null });
    const bad = await designer.patch('/api/account/preferences').send({ unitSystem: 'imperial' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields.unitSystem).toEqual(['Unit system must be metric, us or null (follow the team)']);
    expect((await designer.get('/api/account/preferences')).body.preferences).toEqual({ unitSystem: 'us' });
    expect((await designer.patch('/api/account/preferences').send({ unitSystem: null })).body.preferences).toEqual({ unitSystem: null });
  });

  it('lets an owner switch the team between metric and US; others may not', async () => {
    expect((await designer.patch(`/api/teams/${teamId}`).send({ unitSystem: 'us' })).status).toBe(403);
    const res = await owner.patch(`/api/teams/${teamId}`).send({ unitSystem: 'us' });
    expect(res.status).toBe(200);
    expect(res.body.team.unitSystem).toBe('us');
    expect((await designer.get('/api/auth/me')).body.teams.find((x: { id: string }) => x.id === teamId).unitSystem).toBe('us');
    await owner.patch(`/api/teams/${teamId}`).send({ unitSystem: 'metric' });
  });
});
