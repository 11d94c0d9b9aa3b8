import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { meWith, mockApi, renderApp } from './helpers';

const me = meWith([
  { id: 't-north', name: 'North Shore Off-Grid', role: 'designer' },
  { id: 't-harbour', name: 'Harbour Marine Electric', role: 'viewer' },
]);
const api = {
  'GET /api/auth/me': { body: me },
  'GET /api/projects?teamId=t-north': { body: { projects: [] } },
  'GET /api/projects?teamId=t-harbour': { body: { projects: [] } },
};

describe('team switcher', () => {
  it('lists the user’s teams with their roles, the current one checked', async () => {
    mockApi(api);
    renderApp('/teams/t-north/projects');
    const user = userEvent.setup();
    const button = await screen.findByRole('button', { name: 'Team: North Shore Off-Grid. Switch team' });
    await user.click(button);
    const menu = screen.getByRole('menu');
    const items = within(menu).getAllByRole('menuitemradio');
    expect(items.map((i) => i.textContent)).toEqual(['North Shore Off-GridDesigner', 'Harbour Marine ElectricViewer']);
    expect(items[0]).toHaveAttribute('aria-checked', 'true');
    expect(items[1]).toHaveAttribute('aria-checked', 'false');
    // Focus moves into the menu; arrows move it; Escape closes and returns focus.
    expect(items[0]).toHaveFocus();
    await user.keyboard('{ArrowDown}');
    expect(items[1]).toHaveFocus();
    await user.keyboard('{Escape}');
    expect(screen.queryByRole('menu')).not.toBeInTheDocument();
    expect(button).toHaveFocus();
  });

  it('switches team, shows that team’s role and remembers the choice for "/"', async () => {
    mockApi(api);
    const { router } = renderApp('/teams/t-north/projects');
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: /Switch team/ }));
    await user.click(screen.getByRole('menuitemradio', { name: /Harbour Marine Electric/ }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/teams/t-harbour/projects'));
    const header = screen.getByRole('banner');
    expect(within(header).getByText('Viewer')).toBeInTheDocument();
    expect(await screen.findByRole('heading', { name: 'No projects yet' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'New project' })).not.toBeInTheDocument();

    await router.navigate('/');
    await waitFor(() => expect(router.state.location.pathname).toBe('/teams/t-harbour/projects'));
  });

  it('shows "not found" for a team the user is not in', async () => {
    mockApi(api);
    renderApp('/teams/t-elsewhere/projects');
    expect(await screen.findByRole('heading', { name: 'This team was not found' })).toBeInTheDocument();
  });

  it('offers to create a first team when the user has none', async () => {
    mockApi({ 'GET /api/auth/me': { body: meWith([]) } });
    renderApp('/');
    expect(await screen.findByRole('heading', { name: 'Create your first team' })).toBeInTheDocument();
    expect(screen.getByLabelText('Team name')).toBeInTheDocument();
  });
});
