import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';

let t: TestApp;
let reviewer: Agent;
let diagramId: string;

beforeAll(async () => {
  t = await makeTestApp();
  reviewer = await t.agentFor('reviewer');
  const teamId = (await reviewer.get('/api/teams')).body.teams[0].id;
  const projects = (await reviewer.get(`/api/projects?teamId=${teamId}`)).body.projects;
  const station = projects.find((p: { name: string }) => p.name === 'Gannet Island ranger station').id;
  diagramId = (await reviewer.get(`/api/projects/${station}/diagrams`)).body.diagrams[0].id;
});
afterAll(async () => {
  await t?.close();
});

describe('the demo post-to-post bank', () => {
  it('has an early draft, an approved revision and one in review', async () => {
    const list = (await reviewer.get(`/api/diagrams/${diagramId}/revisions`)).body.revisions;
    expect(list.map((r: { number: number; state: string; author: { name: string } }) => [r.number, r.state, r.author.name])).toEqual([
      [3, 'in_review', 'Tomasz Ilunga'],
      [2, 'approved', 'Tomasz Ilunga'],
      [1, 'draft', 'Tomasz Ilunga'],
    ]);
    const r2 = (await reviewer.get(`/api/diagrams/${diagramId}/revisions/2`)).body.revision;
    expect(r2.approvedBy.name).toBe('Priya Halvorsen');
    expect(r2.review.decisions.map((d: { decision: string }) => d.decision)).toEqual(['approve']);
    const r3 = (await reviewer.get(`/api/diagrams/${diagramId}/revisions/3`)).body.revision;
    expect(r3.review.reviewers.map((r: { name: string }) => r.name)).toEqual(['Priya Halvorsen']);
  });

  it('has solved results that differ between revisions, so compare shows real changes', async () => {
    const revs = await Promise.all([1, 2, 3].map(async (n) => (await reviewer.get(`/api/diagrams/${diagramId}/revisions/${n}`)).body.revision));
    for (const r of revs) {
      expect(r.resultsSummary.status).toBe('solved');
      expect(r.resultsSummary.batteries).toHaveLength(4);
    }
    // Same-end take-off loads battery 1 most; the diagonal take-off evens the shares (first principles: path resistance).
    const share = (r: { resultsSummary: { batteries: { id: string; share: number }[] } }, id: string) => r.resultsSummary.batteries.find((b) => b.id === id)!.share;
    expect(share(revs[0], 'bat1')).toBeGreaterThan(share(revs[0], 'bat4'));
    expect(revs[1].resultsSummary.imbalance_pct).toBeLessThan(revs[0].resultsSummary.imbalance_pct);
    expect(new Set(revs.map((r) => r.contentHash)).size).toBe(3);
    const d = (await reviewer.get(`/api/diagrams/${diagramId}`)).body.diagram;
    expect(d.workingCopyHash).toBe(revs[2].contentHash);
  });

  it('has review comments on revision 3: one pinned to battery 4 with the designer’s reply, one general', async () => {
    const comments = (await reviewer.get(`/api/diagrams/${diagramId}/revisions/3/comments`)).body.comments;
    expect(comments.map((c: { author: { name: string }; partId: string | null; parentId: string | null }) => [c.author.name, c.partId, c.parentId === null])).toEqual([
      ['Priya Halvorsen', 'bat4', true],
      ['Tomasz Ilunga', 'bat4', false],
      ['Priya Halvorsen', null, true],
    ]);
    expect(comments[1].parentId).toBe(comments[0].id);
  });
});
