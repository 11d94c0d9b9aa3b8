/** New diagram from a file: broken files list their problems and import nothing; an exported file imports as it was. */
import { describe, expect, it } from 'vitest';
import { render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import { diagramFileText } from '@/features/diagram-files/file';
import { NewDiagramDialog } from '@/features/projects/NewDiagramDialog';
import { mockApi } from '../helpers';

function renderDialog() {
  const qc = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  const router = createMemoryRouter(
    [
      { path: '/projects/p1', element: <NewDiagramDialog projectId="p1" open onClose={() => {}} initialSource="file" /> },
      { path: '/diagrams/:id', element: <p>Editor opened</p> },
    ],
    { initialEntries: ['/projects/p1'] },
  );
  render(
    <QueryClientProvider client={qc}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return router;
}

const file = (text: string, name = 'bank.bankwright.json') => new File([text], name, { type: 'application/json' });

describe('New diagram from a file', () => {
  it('lists each problem of a broken file by path and imports nothing', async () => {
    const fetchMock = mockApi({});
    const user = userEvent.setup();
    renderDialog();
    const doc = postToPostTemplate({ count: 2, takeOff: 'same-end' });
    const broken = JSON.parse(JSON.stringify(doc));
    broken.parts[0].props.capacity_Ah = -5;
    broken.parts[1].rotation = 45;
    await user.upload(screen.getByLabelText(/Diagram file/), file(JSON.stringify(broken)));

    const list = await screen.findByRole('list', { name: 'Problems in the file' });
    const items = within(list).getAllByRole('listitem').map((li) => li.textContent ?? '');
    expect(items.some((t) => t.startsWith('$.parts[0].props.capacity_Ah: '))).toBe(true);
    expect(items.some((t) => t.startsWith('$.parts[1].rotation: '))).toBe(true);
    expect(items).toHaveLength(2);
    expect(screen.getByRole('alert')).toHaveTextContent('Nothing was imported');
    expect(screen.getByRole('button', { name: 'Create and open' })).toBeDisabled();

    // A well-formed file whose cable ends on a part that does not exist (checked once the shape is valid).
    const dangling = JSON.parse(JSON.stringify(doc));
    dangling.cables[0].to.part = 'ghost';
    await user.upload(screen.getByLabelText(/Diagram file/), file(JSON.stringify(dangling)));
    await waitFor(() => expect(screen.getByRole('list', { name: 'Problems in the file' })).toHaveTextContent('$.cables[0].to.part: No part with id "ghost"'));
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('rejects annotations that break their schema or point at missing parts', async () => {
    const fetchMock = mockApi({});
    const user = userEvent.setup();
    renderDialog();
    const doc = postToPostTemplate({ count: 2, takeOff: 'same-end' });
    const withBad = { ...doc, annotations: [{ id: 'c1', kind: 'callout', partId: 'nowhere', text: 'x' }, { id: 's1', kind: 'step', number: 0, text: 'y', partIds: [] }] };
    await user.upload(screen.getByLabelText(/Diagram file/), file(JSON.stringify(withBad)));
    const list = await screen.findByRole('list', { name: 'Problems in the file' });
    const items = within(list).getAllByRole('listitem').map((li) => li.textContent ?? '');
    expect(items).toContain('$.annotations[0].partId: No part with id "nowhere"');
    expect(items.some((t) => t.startsWith('$.annotations[1].number: '))).toBe(true);
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('says when a file is not JSON, and lists at most 20 problems', async () => {
    mockApi({});
    const user = userEvent.setup();
    renderDialog();
    await user.upload(screen.getByLabelText(/Diagram file/), file('{"formatVersion": 1,'));
    const first = await screen.findByRole('list', { name: 'Problems in the file' });
    expect(within(first).getAllByRole('listitem')[0].textContent).toMatch(/^\$: Not valid JSON/);

    const doc = postToPostTemplate({ count: 2, takeOff: 'same-end' });
    const many = { ...doc, parts: Array.from({ length: 30 }, (_, i) => ({ ...doc.parts[0], id: `b${i}`, props: { ...doc.parts[0].props, soc: 7 } })), cables: [] };
    await user.upload(screen.getByLabelText(/Diagram file/), file(JSON.stringify(many)));
    await waitFor(() => expect(screen.getByText(/30 problems/)).toBeInTheDocument());
    expect(within(screen.getByRole('list', { name: 'Problems in the file' })).getAllByRole('listitem')).toHaveLength(20);
    expect(screen.getByText('…and 10 more not listed.')).toBeInTheDocument();
  });

  it('imports a file exported from a document unchanged (round trip)', async () => {
    const doc: DiagramDocument = {
      ...postToPostTemplate({ count: 3, takeOff: 'diagonal' }),
      annotations: [
        { id: 'a1', kind: 'callout', partId: 'bat1', text: 'Check torque' },
        { id: 'a2', kind: 'highlight', partIds: ['bat1', 'bat2'], label: 'Pair' },
      ],
    };
    let posted: { name: string; content: DiagramDocument } | null = null;
    const fetchMock = mockApi({
      'POST /api/projects/p1/diagrams': ({ body }) => {
        posted = body as typeof posted;
        return { status: 201, body: { diagram: { id: 'd9', projectId: 'p1', name: 'Van bank' } } };
      },
    });
    const user = userEvent.setup();
    const router = renderDialog();
    await user.upload(screen.getByLabelText(/Diagram file/), file(diagramFileText(doc, 'Van bank'), 'van-bank.bankwright.json'));
    expect(await screen.findByText(/3 parts|parts, /)).toBeInTheDocument();
    expect(screen.getByLabelText('Diagram name')).toHaveValue('Van bank');
    await user.click(screen.getByRole('button', { name: 'Create and open' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/diagrams/d9'));
    expect(fetchMock).toHaveBeenCalledTimes(1);
    expect(posted!.name).toBe('Van bank');
    expect(posted!.content).toEqual({ ...doc, name: 'Van bank' });
  });
});
