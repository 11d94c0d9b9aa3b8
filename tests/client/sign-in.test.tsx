import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { apiError, designer, mockApi, renderApp } from './helpers';

const signedOut = { 'GET /api/auth/me': apiError(401, 'unauthenticated', 'Sign in first.') };

describe('sign-in form', () => {
  it('shows the schema’s field errors and sends nothing when the form is empty or malformed', async () => {
    const fetchMock = mockApi(signedOut);
    renderApp('/sign-in');
    const user = userEvent.setup();

    await user.click(await screen.findByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Password is required')).toBeInTheDocument();
    expect(screen.getByText('E-mail is required')).toBeInTheDocument();
    // One message per field: the first rule broken.
    expect(screen.queryByText('Enter a valid e-mail address')).not.toBeInTheDocument();

    await user.type(screen.getByLabelText('E-mail'), 'dana-at-fieldcrew');
    await user.type(screen.getByLabelText('Password'), 'x');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Enter a valid e-mail address')).toBeInTheDocument();
    expect(screen.queryByText('Password is required')).not.toBeInTheDocument();
    // The error is tied to its input for screen readers.
    expect(screen.getByLabelText('E-mail')).toHaveAccessibleDescription('Enter a valid e-mail address');
    expect(screen.getByLabelText('E-mail')).toHaveAttribute('aria-invalid', 'true');

    expect(fetchMock.mock.calls.some(([url]) => String(url).includes('/api/auth/sign-in'))).toBe(false);
  });

  it('shows the server’s 401 message', async () => {
    const fetchMock = mockApi({
      ...signedOut,
      'POST /api/auth/sign-in': apiError(401, 'invalid_credentials', 'E-mail or password is incorrect.'),
    });
    renderApp('/sign-in');
    const user = userEvent.setup();
    await user.type(await screen.findByLabelText('E-mail'), 'Dana@FieldCrew.test ');
    await user.type(screen.getByLabelText('Password'), 'not-the-password');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByRole('alert')).toHaveTextContent('E-mail or password is incorrect.');
    const call = fetchMock.mock.calls.find(([url]) => url === '/api/auth/sign-in')!;
    // The schema trims and lower-cases the e-mail before it is sent.
    expect(JSON.parse(String(call[1]!.body))).toEqual({ email: 'dana@fieldcrew.test', password: 'not-the-password' });
  });

  it('shows the server’s 429 message and field errors from details.fields', async () => {
    let attempt = 0;
    mockApi({
      ...signedOut,
      'POST /api/auth/sign-in': () =>
        ++attempt === 1
          ? apiError(400, 'validation_failed', 'Check the highlighted fields.', { fields: { email: ['This address is not accepted here'] } })
          : { ...apiError(429, 'too_many_attempts', 'Too many sign-in attempts.'), headers: { 'Retry-After': '300' } },
    });
    renderApp('/sign-in');
    const user = userEvent.setup();
    await user.type(await screen.findByLabelText('E-mail'), 'dana@fieldcrew.test');
    await user.type(screen.getByLabelText('Password'), 'whatever-it-is');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('This address is not accepted here')).toBeInTheDocument();
    expect(screen.getByLabelText('E-mail')).toHaveAccessibleDescription('This address is not accepted here');

    await user.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('Too many sign-in attempts. Try again in 5 minutes.');
  });

  it('goes to the current team’s projects after a successful sign-in', async () => {
    let signedIn = false;
    mockApi({
      'GET /api/auth/me': () => (signedIn ? { body: designer } : apiError(401, 'unauthenticated', 'Sign in first.')),
      'POST /api/auth/sign-in': () => {
        signedIn = true;
        return { body: { user: designer.user } };
      },
      'GET /api/projects?teamId=t-north': { body: { projects: [] } },
    });
    const { router } = renderApp('/sign-in');
    const user = userEvent.setup();
    await user.type(await screen.findByLabelText('E-mail'), 'dana@fieldcrew.test');
    await user.type(screen.getByLabelText('Password'), 'correct-horse-battery');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/teams/t-north/projects'));
    expect(await screen.findByRole('heading', { name: 'Projects' })).toBeInTheDocument();
  });

  it('sends signed-out visitors of a page to sign-in, keeping where they were going', async () => {
    mockApi(signedOut);
    const { router } = renderApp('/teams/t-north/members');
    await screen.findByRole('button', { name: 'Sign in' });
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/teams/t-north/members')}`);
  });
});

describe('sign-up form', () => {
  it('when the server answers alike but no session came of it (the address already had an account), says to check the mail and sign in', async () => {
    mockApi({
      ...signedOut,
      'POST /api/auth/sign-up': { status: 201, body: { user: { id: 'decoy', email: 'dana@fieldcrew.test', name: 'Dana', createdAt: '2026-12-01T00:00:00Z' } } },
    });
    renderApp('/sign-up');
    const user = userEvent.setup();
    await user.type(await screen.findByLabelText('Name'), 'Dana Okafor');
    await user.type(screen.getByLabelText('E-mail'), 'dana@fieldcrew.test');
    await user.type(screen.getByLabelText('Password'), 'four unrelated words here');
    await user.click(screen.getByRole('button', { name: 'Create account' }));
    expect(await screen.findByText(/We have sent a message to dana@fieldcrew\.test\. If this address already has an account, sign in/)).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Create account' })).toBeInTheDocument();
  });
});
