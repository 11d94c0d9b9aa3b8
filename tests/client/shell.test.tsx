import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { describe, expect, it, vi } from 'vitest';
import { RouteError } from '@/app/RouteError';
import { apiError, designer, mockApi, renderApp } from './helpers';

const CAUTION = /battery banks can deliver thousands of amperes into a short.*not approval to install.*local electrical codes and licensed practice/;

describe('app shell', () => {
  it('shows the safety caution in the signed-in shell’s footer', async () => {
    mockApi({ 'GET /api/auth/me': { body: designer }, 'GET /api/projects?teamId=t-north': { body: { projects: [] } } });
    renderApp('/teams/t-north/projects');
    expect(await screen.findByRole('contentinfo')).toHaveTextContent(CAUTION);
  });

  it('shows the caution on the sign-in screen too', async () => {
    mockApi({ 'GET /api/auth/me': apiError(401, 'unauthenticated', 'Sign in first.') });
    renderApp('/sign-in');
    expect(await screen.findByRole('contentinfo')).toHaveTextContent(CAUTION);
  });

  it('shows a 404 page inside the shell for an unknown path', async () => {
    mockApi({ 'GET /api/auth/me': { body: designer } });
    renderApp('/no/such/place');
    expect(await screen.findByRole('heading', { name: 'This page was not found' })).toBeInTheDocument();
    expect(screen.getByRole('banner')).toBeInTheDocument();
  });

  it('signs out from the account menu and lands on sign-in', async () => {
    let signedIn = true;
    const fetchMock = mockApi({
      'GET /api/auth/me': () => (signedIn ? { body: designer } : apiError(401, 'unauthenticated', 'Sign in first.')),
      'GET /api/projects?teamId=t-north': { body: { projects: [] } },
      'POST /api/auth/sign-out': () => {
        signedIn = false;
        return { status: 204 };
      },
    });
    const { router } = renderApp('/teams/t-north/projects');
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Account: Dana Whitlock' }));
    await user.click(screen.getByRole('menuitem', { name: 'Sign out' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/sign-in'));
    expect(await screen.findByRole('button', { name: 'Sign in' })).toBeInTheDocument();
    expect(fetchMock).toHaveBeenCalledWith('/api/auth/sign-out', expect.objectContaining({ method: 'POST' }));
  });

  it('shows an error screen, not a blank page, when a screen crashes', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {});
    function Broken(): never {
      throw new Error('busbar table missing');
    }
    const router = createMemoryRouter([{ path: '/', element: <Broken />, errorElement: <RouteError /> }]);
    render(<RouterProvider router={router} />);
    expect(await screen.findByRole('alert')).toHaveTextContent('this screen stopped working');
    expect(screen.getByText('busbar table missing')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Reload' })).toBeInTheDocument();
  });
});
