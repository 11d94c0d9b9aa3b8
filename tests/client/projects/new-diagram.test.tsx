/** New diagram: blank, from a template with its parameters, or from a file; created in one request and opened. */
import { describe, expect, it } from 'vitest';
import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import { NewDiagramDialog } from '@/features/projects/NewDiagramDialog';
import { MoveCopyDialog } from '@/features/projects/MoveCopyDialog';
import { diagramFileText } from '@/features/diagram-files/file';
import { mockApi } from '../helpers';

function renderAt(element: React.ReactNode) {
  const qc = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  const router = createMemoryRouter(
    [
      { path: '/projects/p1', element },
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

function createdBodies() {
  const bodies: { name: string; content: DiagramDocument }[] = [];
  const fetchMock = mockApi({
    'POST /api/projects/p1/diagrams': ({ body }) => {
      bodies.push(body as (typeof bodies)[number]);
      return { status: 201, body: { diagram: { id: 'd9', projectId: 'p1', name: (body as { name: string }).name } } };
    },
    'GET /api/projects/p1/diagrams': { body: { diagrams: [] } },
  });
  return { bodies, fetchMock };
}

describe('NewDiagramDialog', () => {
  it('asks for a name before sending anything', async () => {
    const { fetchMock } = createdBodies();
    const user = userEvent.setup();
    renderAt(<NewDiagramDialog projectId="p1" open onClose={() => {}} />);
    await user.click(screen.getByRole('button', { name: 'Create and open' }));
    expect(await screen.findByText('Diagram name is required')).toBeInTheDocument();
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('creates a blank diagram and opens it in the editor', async () => {
    const { bodies } = createdBodies();
    const user = userEvent.setup();
    const router = renderAt(<NewDiagramDialog projectId="p1" open onClose={() => {}} />);
    await user.type(screen.getByLabelText('Diagram name'), 'Shed bank');
    await user.click(screen.getByRole('button', { name: 'Create and open' }));
    expect(await screen.findByText('Editor opened')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/diagrams/d9');
    expect(bodies).toHaveLength(1);
    expect(bodies[0]).toMatchObject({ name: 'Shed bank', content: { name: 'Shed bank', parts: [], cables: [] } });
  });

  it('builds a template from its parameters: series strings of the chosen battery', async () => {
    const { bodies } = createdBodies();
    const user = userEvent.setup();
    renderAt(<NewDiagramDialog projectId="p1" open onClose={() => {}} />);
    await user.type(screen.getByLabelText('Diagram name'), '48 V bank');
    await user.click(screen.getByText('From a template'));
    await user.click(screen.getByText('Series-parallel strings'));
    const battery = screen.getByLabelText(/^Battery/) as HTMLSelectElement;
    await user.selectOptions(battery, 'agm-12V-200Ah');
    const series = screen.getByLabelText('Batteries in series per string');
    await user.clear(series);
    await user.type(series, '4');
    const strings = screen.getByLabelText('Strings in parallel');
    await user.clear(strings);
    await user.type(strings, '3');
    await user.click(screen.getByRole('button', { name: 'Create and open' }));
    await screen.findByText('Editor opened');
    const doc = bodies[0].content;
    expect(doc.name).toBe('48 V bank');
    const stringsDrawn = doc.parts.filter((p) => p.type === 'series_string');
    expect(stringsDrawn).toHaveLength(3);
    expect(stringsDrawn.every((p) => (p.props as { count: number }).count === 4)).toBe(true);
    expect(stringsDrawn.map((p) => (p.props as { member: { chemistry: string; capacity_Ah: number } }).member)).toEqual(
      Array(3).fill(expect.objectContaining({ chemistry: 'agm', capacity_Ah: 200 })),
    );
  });

  it('builds a post-to-post bank with the chosen count and inner take-off', async () => {
    const { bodies } = createdBodies();
    const user = userEvent.setup();
    renderAt(<NewDiagramDialog projectId="p1" open onClose={() => {}} />);
    await user.type(screen.getByLabelText('Diagram name'), 'Cabin bank');
    await user.click(screen.getByText('From a template'));
    const count = screen.getByLabelText('Batteries in parallel');
    await user.clear(count);
    await user.type(count, '6');
    await user.selectOptions(screen.getByLabelText('Take-off'), 'inner');
    await user.click(screen.getByRole('button', { name: 'Create and open' }));
    await screen.findByText('Editor opened');
    expect(bodies[0].content.parts.filter((p) => p.type === 'battery')).toHaveLength(6);
  });

  it('creates from a valid file, named from the file, and refuses a broken one', async () => {
    const { bodies, fetchMock } = createdBodies();
    const user = userEvent.setup();
    renderAt(<NewDiagramDialog projectId="p1" open onClose={() => {}} />);
    await user.click(screen.getByText('From a file'));
    await user.upload(screen.getByLabelText(/Diagram file/), new File(['{"parts": 3}'], 'broken.json', { type: 'application/json' }));
    expect(await screen.findByRole('list', { name: 'Problems in the file' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Create and open' })).toBeDisabled();
    expect(fetchMock).not.toHaveBeenCalled();

    const doc = postToPostTemplate({ count: 3, takeOff: 'same-end' });
    await user.upload(screen.getByLabelText(/Diagram file/), new File([diagramFileText(doc, 'Boathouse bank')], 'boathouse.bankwright.json', { type: 'application/json' }));
    await waitFor(() => expect(screen.getByLabelText('Diagram name')).toHaveValue('Boathouse bank'));
    await user.click(screen.getByRole('button', { name: 'Create and open' }));
    await screen.findByText('Editor opened');
    expect(bodies[0].content.parts.filter((p) => p.type === 'battery')).toHaveLength(3);
  });
});

describe('MoveCopyDialog', () => {
  const diagram = { id: 'd1', name: 'House bank', projectId: 'p1', teamId: 't1' };
  const projects = { projects: [{ id: 'p1', teamId: 't1', name: 'Cabin' }, { id: 'p2', teamId: 't1', name: 'Boathouse' }] };

  it('moves to another project of the team (the current one is not offered)', async () => {
    const fetchMock = mockApi({
      'GET /api/projects': { body: projects },
      'POST /api/diagrams/d1/move': { body: { diagram: { ...diagram, projectId: 'p2' } } },
    });
    const user = userEvent.setup();
    let closed = false;
    renderAt(<MoveCopyDialog diagram={diagram} mode="move" open onClose={() => { closed = true; }} />);
    const select = await screen.findByLabelText('Project');
    expect(Array.from((select as HTMLSelectElement).options).map((o) => o.value)).toEqual(['p2']);
    await user.click(screen.getByRole('button', { name: 'Move' }));
    await waitFor(() => expect(closed).toBe(true));
    const call = fetchMock.mock.calls.find(([url]) => String(url).endsWith('/move'));
    expect(JSON.parse(String(call?.[1]?.body))).toEqual({ projectId: 'p2' });
  });

  it('copies and opens the copy', async () => {
    mockApi({
      'GET /api/projects': { body: projects },
      'POST /api/diagrams/d1/copy': { status: 201, body: { diagram: { id: 'd7', projectId: 'p2', name: 'House bank (copy)' } } },
    });
    const user = userEvent.setup();
    const router = renderAt(<MoveCopyDialog diagram={diagram} mode="copy" open onClose={() => {}} />);
    expect(screen.getByText(/House bank \(copy\)/)).toBeInTheDocument();
    await user.selectOptions(await screen.findByLabelText('Project'), 'p2');
    await user.click(screen.getByRole('button', { name: 'Copy and open' }));
    await screen.findByText('Editor opened');
    expect(router.state.location.pathname).toBe('/diagrams/d7');
  });
});
