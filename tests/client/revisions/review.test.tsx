import '../editor/flow-mocks';
import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { mockApi, renderApp } from '../helpers';
import { DIAGRAM_ID, diagramAnswer, meAs, people, revisionAnswer, summary, versionA } from './fixtures';

const s = summary([0.5, 0.5], [10, 10], { imbalance_pct: 0, drop_pct: 1, losses_W: 2 });
const comments = [
  { id: 'c1', parentId: null, partId: 'bat1', body: 'Fuse this battery closer to the post', author: people.reviewer, createdAt: '2026-11-14T10:00:00Z', resolved: false, resolvedAt: null, resolvedBy: null },
  { id: 'c2', parentId: 'c1', partId: 'bat1', body: 'Will do', author: people.designer, createdAt: '2026-11-14T11:00:00Z', resolved: false, resolvedAt: null, resolvedBy: null },
];

function open(role: 'designer' | 'reviewer' | 'viewer', state: 'draft' | 'in_review' | 'approved', onDecision?: (body: unknown) => void) {
  mockApi({
    'GET /api/auth/me': { body: meAs(role) },
    [`GET /api/diagrams/${DIAGRAM_ID}`]: diagramAnswer(role),
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions`]: { body: { revisions: [] } },
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions/1`]: revisionAnswer(1, state, versionA(), s),
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions/1/comments`]: { body: { comments } },
    [`POST /api/diagrams/${DIAGRAM_ID}/revisions/1/decision`]: ({ body }) => {
      onDecision?.(body);
      return { body: { review: {} } };
    },
  });
  renderApp(`/diagrams/${DIAGRAM_ID}/revisions/1`);
  return screen.findByRole('heading', { name: /Review of revision 1/ }, { timeout: 20_000 });
}

describe('review controls by role', { timeout: 30_000 }, () => {
  it('gives a reviewer Approve and Request changes on a revision in review, and sends the decision with the note', async () => {
    const sent: unknown[] = [];
    await open('reviewer', 'in_review', (b) => sent.push(b));
    expect(screen.queryByRole('button', { name: /Request review/ })).toBeNull();
    const user = userEvent.setup();
    await user.type(screen.getByLabelText(/Note to the designer/), 'Looks balanced now');
    await user.click(screen.getByRole('button', { name: /Approve revision 1/ }));
    await waitFor(() => expect(sent).toEqual([{ decision: 'approve', note: 'Looks balanced now' }]));
    expect(screen.getByRole('button', { name: /Request changes/ })).toBeInTheDocument();
  });

  it('gives a designer Request review but never the decision buttons', async () => {
    await open('designer', 'in_review');
    expect(screen.getByRole('button', { name: /Request review/ })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Approve/ })).toBeNull();
    expect(screen.queryByRole('button', { name: /Request changes/ })).toBeNull();
  });

  it('shows a viewer the state and comments, but no review actions and no comment form', async () => {
    await open('viewer', 'in_review');
    expect(await screen.findByText('Fuse this battery closer to the post')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Request review|Approve|Request changes/ })).toBeNull();
    expect(screen.queryByRole('form', { name: 'New comment' })).toBeNull();
  });

  it('locks an approved revision: no decision or request buttons, a locked notice', async () => {
    await open('reviewer', 'approved');
    expect(screen.getByText('Approved and locked.')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Approve|Request changes/ })).toBeNull();
  });

  it('threads replies under the first comment and names the part it is pinned to', async () => {
    await open('reviewer', 'in_review');
    await screen.findByText('Will do');
    const threads = screen.getByRole('list', { name: 'Comment threads' });
    expect(threads.children).toHaveLength(1);
    expect(threads).toHaveTextContent(/Battery 1 \(battery\).*Fuse this battery.*Will do/);
    // The pinned part carries a marker on the canvas.
    await waitFor(() => expect(document.querySelector('[data-id="bat1"] .bw-pin-tag')).toHaveTextContent('1'));
  });
});
