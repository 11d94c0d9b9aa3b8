import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, desc, eq } from 'drizzle-orm';
import { diagramRevisions, mailOutbox } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';
import { smallBank } from './fixtures';

let t: TestApp;
let designer: Agent;
let reviewer: Agent;
let owner: Agent;
let teamId: string;
let stationId: string;
const ids: Record<string, string> = {};

const ORIGIN = 'http://bankwright.test';

beforeAll(async () => {
  t = await makeTestApp();
  designer = await t.agentFor('designer');
  reviewer = await t.agentFor('reviewer');
  owner = await t.agentFor('owner');
  teamId = (await designer.get('/api/teams')).body.teams[0].id;
  const projects = (await designer.get(`/api/projects?teamId=${teamId}`)).body.projects;
  stationId = projects.find((p: { name: string }) => p.name === 'Gannet Island ranger station').id;
  for (const m of (await designer.get(`/api/teams/${teamId}/members`)).body.members) ids[m.email.split('@')[0]] = m.userId;
});
afterAll(async () => {
  await t?.close();
});

/** A diagram with `count` revisions by the given agent. */
async function diagramWithRevisions(count: number, by: Agent = designer, name = 'Review test'): Promise<string> {
  const id = (await by.post(`/api/projects/${stationId}/diagrams`).send({ name, content: smallBank(name) })).body.diagram.id;
  let base: number | null = null;
  for (let i = 1; i <= count; i++) {
    const res: { status: number; body: { revision: { number: number } } } = await by
      .post(`/api/diagrams/${id}/revisions`)
      .send({ baseRevision: base, message: `Revision ${i}`, content: smallBank(`${name} ${i}`) });
    expect(res.status).toBe(201);
    base = res.body.revision.number;
  }
  return id;
}

const mailTo = async (email: string) => t.db.select().from(mailOutbox).where(eq(mailOutbox.to, email)).orderBy(desc(mailOutbox.createdAt));
const stateOf = async (id: string, n: number) =>
  (await t.db.select({ state: diagramRevisions.state }).from(diagramRevisions).where(and(eq(diagramRevisions.diagramId, id), eq(diagramRevisions.number, n))))[0].state;

describe('review requests', () => {
  it('puts the revision in review and e-mails each reviewer a link to the compare view', async () => {
    const id = await diagramWithRevisions(2);
    const res = await designer.post(`/api/diagrams/${id}/revisions/2/review-requests`).send({ reviewerIds: [ids.reviewer, ids.owner] });
    expect(res.status).toBe(200);
    expect(res.body.review).toMatchObject({ number: 2, state: 'in_review' });
    expect(res.body.review.reviewers.map((r: { name: string }) => r.name).sort()).toEqual(['Maren Okafor', 'Priya Halvorsen']);
    for (const email of ['reviewer@demo.test', 'owner@demo.test']) {
      const [mail] = await mailTo(email);
      expect(mail.subject).toBe('Review requested: Review test revision 2');
      expect(mail.text).toContain(`${ORIGIN}/diagrams/${id}/compare?a=1&b=2`);
      expect(mail.html).toContain(`${ORIGIN}/diagrams/${id}/compare?a=1&amp;b=2`);
      expect(mail.teamId).toBe(teamId);
    }
    // Visible on the revision and on the project's diagram list.
    expect((await reviewer.get(`/api/diagrams/${id}/revisions/2`)).body.revision.review.reviewers).toHaveLength(2);
    const list = (await designer.get(`/api/projects/${stationId}/diagrams`)).body.diagrams;
    expect(list.find((d: { id: string }) => d.id === id).latestRevision).toEqual({ number: 2, state: 'in_review' });
  });

  it('links a first revision to the revision itself', async () => {
    const id = await diagramWithRevisions(1);
    await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer] });
    const [mail] = await mailTo('reviewer@demo.test');
    expect(mail.text).toContain(`${ORIGIN}/diagrams/${id}/revisions/1`);
  });

  it('accepts only team members who may decide, and only from those who edit; nothing changes otherwise', async () => {
    const id = await diagramWithRevisions(1);
    const bad = await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer, ids.designer, 'no-such-user'] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields).toEqual({
      'reviewerIds.1': ['This member’s role cannot approve or request changes'],
      'reviewerIds.2': ['Not a member of this team'],
    });
    expect((await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [] })).status).toBe(400);
    expect((await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer, ids.reviewer] })).status).toBe(400);
    expect((await reviewer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer] })).status).toBe(403);
    expect((await designer.post(`/api/diagrams/${id}/revisions/7/review-requests`).send({ reviewerIds: [ids.reviewer] })).status).toBe(404);
    expect(await stateOf(id, 1)).toBe('draft');
  });
});

describe('comments', () => {
  let id: string;
  beforeAll(async () => {
    id = await diagramWithRevisions(2);
    await designer.post(`/api/diagrams/${id}/revisions/2/review-requests`).send({ reviewerIds: [ids.reviewer] });
  });

  it('are threaded, pinned to a part, listed in order, and notify the author and the other participants', async () => {
    const root = await reviewer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Battery 1 has no fuse of its own.', partId: 'bat1' });
    expect(root.status).toBe(201);
    expect(root.body.comment).toMatchObject({ parentId: null, partId: 'bat1', body: 'Battery 1 has no fuse of its own.', author: { name: 'Priya Halvorsen' }, resolved: false, resolvedBy: null });
    const [toDesigner] = await mailTo('designer@demo.test');
    expect(toDesigner.subject).toBe('New comment on Review test revision 2');
    expect(toDesigner.text).toContain('Battery 1 has no fuse of its own.');
    expect(toDesigner.text).toContain(`${ORIGIN}/diagrams/${id}/compare?a=1&b=2`);

    const reviewerMailsBefore = (await mailTo('reviewer@demo.test')).length;
    const designerMailsBefore = (await mailTo('designer@demo.test')).length;
    const reply = await designer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'A Class T fuse goes in next revision.', parentId: root.body.comment.id });
    expect(reply.status).toBe(201);
    expect(reply.body.comment).toMatchObject({ parentId: root.body.comment.id, partId: 'bat1' });
    // The reviewer (a participant) hears of the reply; the designer is not told of their own comment.
    expect((await mailTo('reviewer@demo.test')).length).toBe(reviewerMailsBefore + 1);
    expect((await mailTo('designer@demo.test')).length).toBe(designerMailsBefore);

    // A reply to a reply joins the thread of the first comment.
    const nested = await (await t.agentFor('trainer')).post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Noted for the crew briefing.', parentId: reply.body.comment.id });
    expect(nested.status).toBe(201);
    expect(nested.body.comment.parentId).toBe(root.body.comment.id);

    const general = await reviewer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Otherwise the layout reads well.' });
    expect(general.body.comment.partId).toBeNull();

    const list = await (await t.agentFor('viewer')).get(`/api/diagrams/${id}/revisions/2/comments`);
    expect(list.status).toBe(200);
    expect(list.body.comments.map((c: { body: string; parentId: string | null }) => [c.body, c.parentId])).toEqual([
      ['Battery 1 has no fuse of its own.', null],
      ['A Class T fuse goes in next revision.', root.body.comment.id],
      ['Noted for the crew briefing.', root.body.comment.id],
      ['Otherwise the layout reads well.', null],
    ]);
    // Comments belong to their revision.
    expect((await designer.get(`/api/diagrams/${id}/revisions/1/comments`)).body.comments).toEqual([]);
  });

  it('refuses unknown parts and parents, empty bodies and viewers, storing nothing', async () => {
    const before = (await designer.get(`/api/diagrams/${id}/revisions/2/comments`)).body.comments.length;
    const ghost = await reviewer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Where?', partId: 'ghost' });
    expect(ghost.status).toBe(400);
    expect(ghost.body.error.details.fields).toEqual({ partId: ['Revision 2 has no part or cable "ghost"'] });
    const onR1 = await reviewer.post(`/api/diagrams/${id}/revisions/1/comments`).send({ body: 'On revision 1' });
    const crossed = await reviewer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Crossed thread', parentId: onR1.body.comment.id });
    expect(crossed.status).toBe(400);
    expect(Object.keys(crossed.body.error.details.fields)).toEqual(['parentId']);
    expect((await reviewer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: '   ' })).status).toBe(400);
    const viewer = await (await t.agentFor('viewer')).post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Viewer comment' });
    expect(viewer.status).toBe(403);
    expect((await designer.get(`/api/diagrams/${id}/revisions/2/comments`)).body.comments.length).toBe(before);
  });

  it('are resolved and reopened by their author or a designer, not by others', async () => {
    const c = (await reviewer.post(`/api/diagrams/${id}/revisions/2/comments`).send({ body: 'Check the jumper length.', partId: 'j-pos-1' })).body.comment;
    const url = `/api/diagrams/${id}/revisions/2/comments/${c.id}`;
    expect((await (await t.agentFor('trainer')).patch(url).send({ resolved: true })).status).toBe(403);
    expect((await (await t.agentFor('viewer')).patch(url).send({ resolved: true })).status).toBe(403);
    const resolved = await designer.patch(url).send({ resolved: true });
    expect(resolved.status).toBe(200);
    expect(resolved.body.comment).toMatchObject({ id: c.id, resolved: true, resolvedBy: { name: 'Tomasz Ilunga' }, resolvedAt: expect.any(String) });
    const reopened = await reviewer.patch(url).send({ resolved: false });
    expect(reopened.body.comment).toMatchObject({ resolved: false, resolvedBy: null, resolvedAt: null });
    expect((await designer.patch(url).send({ resolved: 'yes' })).status).toBe(400);
    expect((await designer.patch(`/api/diagrams/${id}/revisions/2/comments/no-such-comment`).send({ resolved: true })).status).toBe(404);
    // The comment id does not reach through another revision's URL.
    expect((await designer.patch(`/api/diagrams/${id}/revisions/1/comments/${c.id}`).send({ resolved: true })).status).toBe(404);
  });
});

describe('decisions', () => {
  it('a designer cannot decide on their own revision; a reviewer requests changes, then approves', async () => {
    const id = await diagramWithRevisions(2);
    const url = `/api/diagrams/${id}/revisions/2/decision`;
    expect((await reviewer.post(url).send({ decision: 'approve' })).status).toBe(409); // not in review yet
    await designer.post(`/api/diagrams/${id}/revisions/2/review-requests`).send({ reviewerIds: [ids.reviewer] });

    const own = await designer.post(url).send({ decision: 'approve' });
    expect(own.status).toBe(403);
    expect(own.body.error.code).toBe('forbidden');
    expect((await (await t.agentFor('trainer')).post(url).send({ decision: 'approve' })).status).toBe(403);
    expect(await stateOf(id, 2)).toBe('in_review');

    const changes = await reviewer.post(url).send({ decision: 'request_changes', note: 'Fuse each battery.' });
    expect(changes.status).toBe(200);
    expect(changes.body.review.state).toBe('changes_requested');
    const [m1] = await mailTo('designer@demo.test');
    expect(m1.subject).toBe('Changes requested: Review test revision 2');
    expect(m1.text).toContain('Fuse each battery.');
    expect(m1.text).toContain(`${ORIGIN}/diagrams/${id}/compare?a=1&b=2`);

    const approved = await reviewer.post(url).send({ decision: 'approve', note: 'Fuses added on site.' });
    expect(approved.body.review).toMatchObject({ state: 'approved', approvedAt: expect.any(String) });
    expect(approved.body.review.decisions.map((d: { decision: string; reviewer: { name: string } }) => [d.decision, d.reviewer.name])).toEqual([
      ['request_changes', 'Priya Halvorsen'],
      ['approve', 'Priya Halvorsen'],
    ]);
    const [m2] = await mailTo('designer@demo.test');
    expect(m2.subject).toBe('Approved: Review test revision 2');
    expect(m2.text).toContain('not an approval to install');
    const rev = (await designer.get(`/api/diagrams/${id}/revisions/2`)).body.revision;
    expect(rev).toMatchObject({ state: 'approved', approvedBy: { name: 'Priya Halvorsen' } });
    expect((await reviewer.post(url).send({ decision: 'maybe' })).status).toBe(400);
  });

  it('an approved revision is locked: no new decision or review request; editing continues in a new revision', async () => {
    const id = await diagramWithRevisions(1);
    await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer] });
    await reviewer.post(`/api/diagrams/${id}/revisions/1/decision`).send({ decision: 'approve' });
    const before = (await designer.get(`/api/diagrams/${id}/revisions/1`)).body.revision;

    const again = await reviewer.post(`/api/diagrams/${id}/revisions/1/decision`).send({ decision: 'request_changes' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('revision_approved');
    expect((await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.owner] })).body.error.code).toBe('revision_approved');

    const next = await designer.post(`/api/diagrams/${id}/revisions`).send({ baseRevision: 1, message: 'After approval', content: smallBank('After approval') });
    expect(next.status).toBe(201);
    expect(next.body.revision).toMatchObject({ number: 2, state: 'draft' });
    const after = (await designer.get(`/api/diagrams/${id}/revisions/1`)).body.revision;
    expect(after).toEqual(before);
  });

  it('an owner who authored a revision may approve it (owners hold review.decide)', async () => {
    const id = await diagramWithRevisions(1, owner, 'Owner design');
    await owner.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.owner] });
    const res = await owner.post(`/api/diagrams/${id}/revisions/1/decision`).send({ decision: 'approve' });
    expect(res.status).toBe(200);
    expect(res.body.review.state).toBe('approved');
  });
});

describe('GET /api/projects/:id/activity', () => {
  it('lists who did what, newest first, to any member; validates paging', async () => {
    const id = await diagramWithRevisions(1, designer, 'Activity diagram');
    await designer.post(`/api/diagrams/${id}/revisions/1/review-requests`).send({ reviewerIds: [ids.reviewer] });
    await reviewer.post(`/api/diagrams/${id}/revisions/1/comments`).send({ body: 'Looks fine.' });
    await reviewer.post(`/api/diagrams/${id}/revisions/1/decision`).send({ decision: 'approve' });

    const res = await (await t.agentFor('viewer')).get(`/api/projects/${stationId}/activity?limit=4`);
    expect(res.status).toBe(200);
    expect(res.body.activity.map((a: { action: string; user: { name: string } }) => [a.action, a.user.name])).toEqual([
      ['review.decided', 'Priya Halvorsen'],
      ['review.commented', 'Priya Halvorsen'],
      ['review.requested', 'Tomasz Ilunga'],
      ['revision.saved', 'Tomasz Ilunga'],
    ]);
    expect(res.body.activity[0]).toMatchObject({ id: expect.any(String), createdAt: expect.any(String), detail: { diagramId: id, name: 'Activity diagram', number: 1, decision: 'approve' } });
    const older = await designer.get(`/api/projects/${stationId}/activity?limit=2&before=${encodeURIComponent(res.body.activity[1].createdAt)}`);
    expect(older.body.activity.map((a: { action: string }) => a.action)).toEqual(['review.requested', 'revision.saved']);
    expect((await designer.get(`/api/projects/${stationId}/activity?limit=0`)).status).toBe(400);
    expect((await designer.get(`/api/projects/${stationId}/activity?before=yesterday`)).status).toBe(400);
  });
});

describe("another team's reviews", () => {
  it('answer 404 on every review route and leave the rival revision unchanged', async () => {
    const rival = t.agent();
    await rival.post('/api/auth/sign-up').send({ email: 'rival-review@example.test', password: 'rival password 1', name: 'Rival' });
    const team = (await rival.post('/api/teams').send({ name: 'Rival Batteries' })).body.team.id;
    const project = (await rival.post('/api/projects').send({ teamId: team, name: 'Rival project' })).body.project.id;
    const rd = (await rival.post(`/api/projects/${project}/diagrams`).send({ name: 'Rival diagram', content: smallBank('Rival') })).body.diagram.id;
    await rival.post(`/api/diagrams/${rd}/revisions`).send({ baseRevision: null, content: smallBank('Rival') });
    const comment = (await rival.post(`/api/diagrams/${rd}/revisions/1/comments`).send({ body: 'Rival secret note' })).body.comment;
    expect(comment.id).toEqual(expect.any(String));
    for (const res of [
      await owner.get(`/api/diagrams/${rd}/revisions/1/comments`),
      await owner.post(`/api/diagrams/${rd}/revisions/1/comments`).send({ body: 'Planted' }),
      await owner.patch(`/api/diagrams/${rd}/revisions/1/comments/${comment.id}`).send({ resolved: true }),
      await owner.post(`/api/diagrams/${rd}/revisions/1/review-requests`).send({ reviewerIds: [ids.owner] }),
      await owner.post(`/api/diagrams/${rd}/revisions/1/decision`).send({ decision: 'approve' }),
      await owner.get(`/api/projects/${project}/activity`),
    ]) {
      expect(res.status).toBe(404);
      expect(JSON.stringify(res.body)).not.toContain('Rival');
    }
    const list = (await rival.get(`/api/diagrams/${rd}/revisions/1/comments`)).body.comments;
    expect(list).toMatchObject([{ body: 'Rival secret note', resolved: false }]);
    expect(await stateOf(rd, 1)).toBe('draft');
  });
});
