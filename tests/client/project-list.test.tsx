import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { apiError, meWith, mockApi, pending, renderApp } from './helpers';

const listUrl = 'GET /api/projects?teamId=t-north';
const asRole = (role: string) => ({ 'GET /api/auth/me': { body: meWith([{ id: 't-north', name: 'North Shore Off-Grid', role }]) } });

const cabin = {
  id: 'p-cabin',
  teamId: 't-north',
  name: 'Lakeside cabin 24 V',
  site: 'Lot 7, Fernhollow Road',
  description: '',
  createdAt: '2025-04-02T08:00:00Z',
  updatedAt: '2025-04-09T08:00:00Z',
  diagramCount: 2,
};
const shelter = { ...cabin, id: 'p-shelter', name: 'Ridge repeater shelter 48 V', site: '', diagramCount: 1 };

describe('project list', () => {
  it('shows skeletons while loading', async () => {
    mockApi({ ...asRole('designer'), [listUrl]: pending });
    renderApp('/teams/t-north/projects');
    expect(await screen.findByRole('status', { name: 'Loading projects' })).toBeInTheDocument();
    expect(screen.queryByRole('list', { name: 'Projects' })).not.toBeInTheDocument();
  });

  it('shows the empty state with "New project" for a designer', async () => {
    mockApi({ ...asRole('designer'), [listUrl]: { body: { projects: [] } } });
    renderApp('/teams/t-north/projects');
    expect(await screen.findByRole('heading', { name: 'No projects yet' })).toBeInTheDocument();
    // One in the header, one in the empty state.
    expect(screen.getAllByRole('button', { name: 'New project' })).toHaveLength(2);
  });

  it('shows an error with a retry that loads the list', async () => {
    let calls = 0;
    mockApi({
      ...asRole('designer'),
      [listUrl]: () => (++calls === 1 ? apiError(500, 'internal', 'The server had a problem.') : { body: { projects: [cabin] } }),
    });
    renderApp('/teams/t-north/projects');
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('Could not load projects');
    expect(alert).toHaveTextContent('The server had a problem.');
    await userEvent.setup().click(within(alert).getByRole('button', { name: 'Try again' }));
    expect(await screen.findByRole('link', { name: /Lakeside cabin 24 V/ })).toBeInTheDocument();
    expect(calls).toBe(2);
  });

  it('lists projects with site and diagram count, each linking to its page', async () => {
    mockApi({ ...asRole('designer'), [listUrl]: { body: { projects: [cabin, shelter] } } });
    renderApp('/teams/t-north/projects');
    const list = await screen.findByRole('list', { name: 'Projects' });
    const items = within(list).getAllByRole('link');
    expect(items).toHaveLength(2);
    expect(items[0]).toHaveAttribute('href', '/projects/p-cabin');
    expect(items[0]).toHaveTextContent('Lot 7, Fernhollow Road');
    expect(items[0]).toHaveTextContent('2 diagrams');
    expect(items[1]).toHaveTextContent('No site given');
    expect(items[1]).toHaveTextContent('1 diagram');
  });

  it.each(['viewer', 'reviewer', 'trainer'])('hides "New project" for a %s', async (role) => {
    mockApi({ ...asRole(role), [listUrl]: { body: { projects: [] } } });
    renderApp('/teams/t-north/projects');
    expect(await screen.findByRole('heading', { name: 'No projects yet' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'New project' })).not.toBeInTheDocument();
  });

  it('creates a project from the dialog, checking the name with the shared schema first', async () => {
    const posted: unknown[] = [];
    mockApi({
      ...asRole('designer'),
      [listUrl]: { body: { projects: [] } },
      'POST /api/projects': ({ body }) => {
        posted.push(body);
        return { status: 201, body: { project: { ...cabin, id: 'p-new', name: 'Boathouse' } } };
      },
      'GET /api/projects/p-new': { body: { project: { ...cabin, id: 'p-new', name: 'Boathouse' } } },
      'GET /api/projects/p-new/diagrams': { body: { diagrams: [] } },
    });
    const { router } = renderApp('/teams/t-north/projects');
    const user = userEvent.setup();
    const opener = (await screen.findAllByRole('button', { name: 'New project' }))[0];
    await user.click(opener);
    const dialog = screen.getByRole('dialog', { name: 'New project' });
    expect(within(dialog).getByLabelText('Project name')).toHaveFocus();

    await user.type(within(dialog).getByLabelText('Project name'), 'B');
    await user.click(within(dialog).getByRole('button', { name: 'Create project' }));
    expect(await within(dialog).findByText('Project name must be at least 2 characters')).toBeInTheDocument();
    expect(posted).toHaveLength(0);

    await user.type(within(dialog).getByLabelText('Project name'), 'oathouse');
    await user.click(within(dialog).getByRole('button', { name: 'Create project' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/projects/p-new'));
    expect(posted).toEqual([{ teamId: 't-north', name: 'Boathouse', site: '', description: '' }]);
    expect(await screen.findByRole('heading', { name: 'No diagrams in this project' })).toBeInTheDocument();
  });

  it('closes the dialog on Escape and returns focus to the button that opened it', async () => {
    mockApi({ ...asRole('owner'), [listUrl]: { body: { projects: [cabin] } } });
    renderApp('/teams/t-north/projects');
    const user = userEvent.setup();
    const opener = await screen.findByRole('button', { name: 'New project' });
    await user.click(opener);
    expect(screen.getByRole('dialog')).toBeInTheDocument();
    await user.keyboard('{Escape}');
    expect(screen.queryByRole('dialog')).not.toBeInTheDocument();
    expect(opener).toHaveFocus();
  });
});
