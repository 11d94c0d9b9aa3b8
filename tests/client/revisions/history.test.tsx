import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { mockApi, renderApp } from '../helpers';
import { DIAGRAM_ID, diagramAnswer, meAs, meta } from './fixtures';

const list = [meta(3, 'in_review', 'Diagonal take-off'), meta(2, 'changes_requested', 'Shorter jumpers'), meta(1, 'approved', 'First layout')];

function api(role: 'designer' | 'reviewer') {
  return mockApi({
    'GET /api/auth/me': { body: meAs(role) },
    [`GET /api/diagrams/${DIAGRAM_ID}`]: diagramAnswer(role),
    [`GET /api/diagrams/${DIAGRAM_ID}/revisions`]: { body: { revisions: list } },
  });
}

describe('revision history', () => {
  it('lists revisions newest first with message, author, state in words, and links to open and compare', async () => {
    api('designer');
    renderApp(`/diagrams/${DIAGRAM_ID}/history`);
    const table = await screen.findByRole('table', { name: 'Revisions' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows.map((r) => within(r).getAllByRole('cell')[1].textContent)).toEqual(['r3latest', 'r2', 'r1']);
    expect(rows[0]).toHaveTextContent('Diagonal take-off');
    expect(rows[0]).toHaveTextContent('Dana Whitlock');
    expect(rows[0]).toHaveTextContent('In review');
    expect(rows[1]).toHaveTextContent('Changes requested');
    expect(rows[2]).toHaveTextContent('Approved');
    expect(within(rows[0]).getByRole('link', { name: 'Compare with r2' })).toHaveAttribute('href', `/diagrams/${DIAGRAM_ID}/compare?a=2&b=3`);
    expect(within(rows[2]).getByRole('link', { name: 'Open' })).toHaveAttribute('href', `/diagrams/${DIAGRAM_ID}/revisions/1`);
    // The first revision has nothing before it.
    expect(within(rows[2]).queryByRole('link', { name: /Compare with/ })).toBeNull();
  });

  it('compares any two ticked revisions, older as A', async () => {
    api('designer');
    renderApp(`/diagrams/${DIAGRAM_ID}/history`);
    const user = userEvent.setup();
    await user.click(await screen.findByRole('checkbox', { name: 'Select revision 3' }));
    await user.click(screen.getByRole('checkbox', { name: 'Select revision 1' }));
    expect(screen.getByRole('link', { name: /Compare selected \(r1 → r3\)/ })).toHaveAttribute('href', `/diagrams/${DIAGRAM_ID}/compare?a=1&b=3`);
  });

  it('offers restore (not for the latest) and duplicate to a designer, and restores as a new revision', async () => {
    const fetchMock = api('designer');
    renderApp(`/diagrams/${DIAGRAM_ID}/history`);
    const user = userEvent.setup();
    const table = await screen.findByRole('table', { name: 'Revisions' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(within(rows[0]).queryByRole('button', { name: 'Restore…' })).toBeNull();
    expect(within(rows[2]).getByRole('button', { name: 'Restore…' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Duplicate diagram…' })).toBeInTheDocument();

    await user.click(within(rows[2]).getByRole('button', { name: 'Restore…' }));
    const dialog = screen.getByRole('dialog', { name: 'Restore revision 1?' });
    expect(dialog).toHaveTextContent('saved as a new revision 4');
    await user.click(within(dialog).getByRole('button', { name: 'Restore as a new revision' }));
    const restoreCall = fetchMock.mock.calls.find(([url, init]) => String(url).endsWith('/revisions/1/restore') && init?.method === 'POST');
    expect(restoreCall).toBeDefined();
  });

  it('hides restore and duplicate from a reviewer', async () => {
    api('reviewer');
    renderApp(`/diagrams/${DIAGRAM_ID}/history`);
    await screen.findByRole('table', { name: 'Revisions' });
    expect(screen.queryByRole('button', { name: 'Restore…' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Duplicate diagram…' })).toBeNull();
  });
});
