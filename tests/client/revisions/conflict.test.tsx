import { render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { describe, expect, it, vi } from 'vitest';
import { authKeys } from '@/features/auth/hooks';
import { SaveRevisionButton } from '@/features/revisions';
import { readUnsaved } from '@/features/revisions/stash';
import { apiError, mockApi } from '../helpers';
import { DIAGRAM_ID, diagramAnswer, meAs, meta, people, revisionAnswer, summary, versionA, versionB } from './fixtures';

const theirs = versionA();
const mine = versionB(theirs);
const s = summary([1], [10], { imbalance_pct: 0, drop_pct: 1, losses_W: 1 });

function setup(onSaved = vi.fn()) {
  const posts: { baseRevision: unknown; message: unknown; content: unknown }[] = [];
  mockApi({
    [`GET /api/diagrams/${DIAGRAM_ID}`]: diagramAnswer('designer', mine),
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions/3`]: revisionAnswer(3, 'draft', theirs, s),
    [`POST /api/diagrams/${DIAGRAM_ID}/revisions`]: ({ body }) => {
      const b = body as (typeof posts)[number];
      posts.push(b);
      if (b.baseRevision === 2) {
        return apiError(409, 'revision_conflict', 'Revision 3 by Olga Brandt was saved after the revision you started from.', {
          latest: { number: 3, author: people.owner, createdAt: '2026-11-20T08:00:00Z', message: 'Bigger fuse', contentHash: 'f'.repeat(64), state: 'draft' },
        });
      }
      return { status: 201, body: { revision: { ...meta(4, 'draft', String(b.message)), content: b.content, resultsSummary: s, review: { reviewers: [], decisions: [] } } } };
    },
  });
  const qc = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  qc.setQueryData(authKeys.me, meAs('designer'));
  const router = createMemoryRouter(
    [
      { path: '/diagrams/:diagramId', element: <SaveRevisionButton diagramId={DIAGRAM_ID} getContent={() => mine} baseRevision={2} onSaved={onSaved} /> },
      { path: '*', element: <p>elsewhere</p> },
    ],
    { initialEntries: [`/diagrams/${DIAGRAM_ID}`] },
  );
  render(
    <QueryClientProvider client={qc}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { posts, router, onSaved };
}

async function saveAndConflict() {
  const user = userEvent.setup();
  await user.click(await screen.findByRole('button', { name: 'Save revision…' }));
  const dialog = screen.getByRole('dialog', { name: 'Save revision 3' });
  await user.type(within(dialog).getByLabelText('What changed'), 'Diagonal take-off');
  await user.click(within(dialog).getByRole('button', { name: 'Save revision 3' }));
  return { user, conflict: await screen.findByRole('dialog', { name: 'A newer revision was saved' }) };
}

describe('saving a revision that is no longer on top (409)', () => {
  it('keeps the user’s version in this browser and offers compare, save on top and save as a copy', async () => {
    setup();
    const { conflict } = await saveAndConflict();
    expect(conflict).toHaveTextContent('Revision 3 by Olga Brandt');
    expect(readUnsaved(DIAGRAM_ID)?.content).toEqual(mine);
    expect(readUnsaved(DIAGRAM_ID)?.message).toBe('Diagonal take-off');
    expect(within(conflict).getByRole('link', { name: 'Compare side by side' })).toHaveAttribute('href', `/diagrams/${DIAGRAM_ID}/compare?a=3&b=unsaved`);
    expect(within(conflict).getByRole('button', { name: 'Save as a copy…' })).toBeInTheDocument();
    // The differences from revision 3 are listed before saving on top (the reconnected take-off among them).
    expect(await within(conflict).findByText(/Reconnected bat1\.neg → bat4\.neg/)).toBeInTheDocument();
  });

  it('saves the same content on top of the newer revision and clears the kept copy', async () => {
    const { posts, onSaved } = setup();
    const { user, conflict } = await saveAndConflict();
    const onTop = within(conflict).getByRole('button', { name: 'Save mine on top as revision 4' });
    await waitFor(() => expect(onTop).toBeEnabled());
    await user.click(onTop);
    await waitFor(() => expect(onSaved).toHaveBeenCalledTimes(1));
    expect(posts[1]).toEqual({ baseRevision: 3, message: 'Diagonal take-off', content: mine });
    expect(onSaved.mock.calls[0][0].number).toBe(4);
    expect(readUnsaved(DIAGRAM_ID)).toBeNull();
  });

  it('keeps the version when the dialog is closed without choosing', async () => {
    setup();
    const { user, conflict } = await saveAndConflict();
    await user.click(within(conflict).getByRole('button', { name: 'Close' }));
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(readUnsaved(DIAGRAM_ID)?.content).toEqual(mine);
  });
});
