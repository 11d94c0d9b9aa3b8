/**
 * Work that waits and units on the user's screens: the header's notification list with its unread count,
 * the work panel on the landing page, each user's own mail, team units (owners) and the personal override.
 */
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { meWith, mockApi, renderApp } from './helpers';

const me = (role: string, extra: Record<string, unknown> = {}) => ({ body: { ...meWith([{ id: 't-north', name: 'North Shore Off-Grid', role }]), preferences: { unitSystem: null }, ...extra } });

const notice = (id: string, kind: string, read = false) => ({
  id,
  kind,
  team: { id: 't-north', name: 'North Shore Off-Grid' },
  actor: { id: 'u-ivo', name: 'Ivo Brandt' },
  diagram: { id: 'd-cabin', name: 'Cabin bank' },
  project: { id: 'p-cabin', name: 'Lakeside cabin' },
  revision: 2,
  commentId: null,
  excerpt: kind === 'comment' ? 'Check the jumper lengths' : '',
  read,
  createdAt: '2025-04-09T08:00:00Z',
  path: '/diagrams/d-cabin/compare?a=1&b=2',
});

const emptyWork = { waitingForReview: [], changesRequested: [], recentApprovals: [] };

describe('notifications in the header', () => {
  it('shows the unread count, lists notices in plain words, and marks one read when it is opened', async () => {
    const reads: unknown[] = [];
    mockApi({
      'GET /api/auth/me': me('reviewer'),
      'GET /api/work': { body: emptyWork },
      'GET /api/projects': { body: { projects: [] } },
      'GET /api/notifications': { body: { notifications: [notice('n1', 'review_requested'), notice('n2', 'comment', true)], unread: 1 } },
      'POST /api/notifications/read': ({ body }) => {
        reads.push(body);
        return { body: { unread: 0 } };
      },
    });
    const { router } = renderApp('/teams/t-north/projects');
    const bell = await screen.findByRole('button', { name: 'Notifications, 1 unread' });
    await userEvent.setup().click(bell);
    const menu = await screen.findByRole('menu');
    const items = within(menu).getAllByRole('menuitem');
    expect(items[0]).toHaveTextContent('Ivo Brandt asked you to review Cabin bank revision 2 (unread)');
    expect(items[1]).toHaveTextContent('Ivo Brandt commented on Cabin bank revision 2');
    expect(items[1]).toHaveTextContent('“Check the jumper lengths”');
    await userEvent.setup().click(items[0]);
    await waitFor(() => expect(reads).toEqual([{ ids: ['n1'] }]));
    await waitFor(() => expect(router.state.location.pathname + router.state.location.search).toBe('/diagrams/d-cabin/compare?a=1&b=2'));
  });
});

describe('work panel', () => {
  it('lists revisions waiting for the reviewer with a link to the compare view', async () => {
    mockApi({
      'GET /api/auth/me': me('reviewer'),
      'GET /api/projects': { body: { projects: [] } },
      'GET /api/notifications': { body: { notifications: [], unread: 0 } },
      'GET /api/work': {
        body: {
          ...emptyWork,
          waitingForReview: [
            {
              diagram: { id: 'd-cabin', name: 'Cabin bank' }, project: { id: 'p-cabin', name: 'Lakeside cabin' }, team: { id: 't-north', name: 'North Shore Off-Grid' },
              revision: 2, state: 'in_review', message: 'Fuses at each post', createdAt: '2025-04-09T08:00:00Z', requestedAt: '2025-04-09T09:00:00Z',
              path: '/diagrams/d-cabin/compare?a=1&b=2',
            },
          ],
        },
      },
    });
    renderApp('/teams/t-north/projects');
    const waiting = await screen.findByRole('region', { name: /Waiting for your review/ });
    const link = await within(waiting).findByRole('link', { name: 'Cabin bank · revision 2' });
    expect(link).toHaveAttribute('href', '/diagrams/d-cabin/compare?a=1&b=2');
    expect(within(screen.getByRole('region', { name: /Changes requested on your designs/ })).getByText('Your role does not edit designs.')).toBeInTheDocument();
  });
});

describe('own mail', () => {
  it('shows a designer the mail captured for them, not the team’s outbox', async () => {
    const calls = mockApi({
      'GET /api/auth/me': me('designer'),
      'GET /api/notifications': { body: { notifications: [], unread: 0 } },
      'GET /api/account/outbox': {
        body: { messages: [{ id: 'm1', to: 'dana@fieldcrew.test', subject: 'Approved: Cabin bank revision 2', text: 'Open it: http://x.test/diagrams/d', html: '', createdAt: '2025-04-09T08:00:00Z' }] },
      },
    });
    renderApp('/teams/t-north/outbox');
    expect(await screen.findByRole('heading', { name: 'Your mail' })).toBeInTheDocument();
    expect(await screen.findByText('Approved: Cabin bank revision 2')).toBeInTheDocument();
    expect(calls.mock.calls.some(([u]) => String(u).includes('/api/teams/t-north/outbox'))).toBe(false);
    expect(screen.getByRole('link', { name: /Your mail/ })).toBeInTheDocument();
  });
});

describe('units', () => {
  it('lets an owner switch the team to US units', async () => {
    const patches: unknown[] = [];
    mockApi({
      'GET /api/auth/me': me('owner'),
      'GET /api/notifications': { body: { notifications: [], unread: 0 } },
      'GET /api/teams/t-north/members': { body: { members: [], invites: [] } },
      'PATCH /api/teams/t-north': ({ body }) => {
        patches.push(body);
        return { body: { team: { id: 't-north', name: 'North Shore Off-Grid', role: 'owner', unitSystem: 'us' } } };
      },
    });
    renderApp('/teams/t-north/members');
    const user = userEvent.setup();
    const select = await screen.findByLabelText('Units');
    expect(screen.getByRole('button', { name: 'Save team units' })).toBeDisabled();
    await user.selectOptions(select, 'us');
    await user.click(screen.getByRole('button', { name: 'Save team units' }));
    await waitFor(() => expect(patches).toEqual([{ unitSystem: 'us' }]));
  });

  it('shows other roles the team’s units without a control', async () => {
    mockApi({
      'GET /api/auth/me': me('designer'),
      'GET /api/notifications': { body: { notifications: [], unread: 0 } },
      'GET /api/teams/t-north/members': { body: { members: [], invites: [] } },
    });
    renderApp('/teams/t-north/members');
    const settings = await screen.findByRole('region', { name: 'Team settings' });
    expect(settings).toHaveTextContent('Units: Metric (m, mm², °C). Owners change this; you may set your own in Account.');
    expect(screen.queryByRole('button', { name: 'Save team units' })).not.toBeInTheDocument();
  });

  it('stores the user’s own unit system from Account', async () => {
    const patches: unknown[] = [];
    mockApi({
      'GET /api/auth/me': me('viewer'),
      'GET /api/notifications': { body: { notifications: [], unread: 0 } },
      'GET /api/account/sessions': { body: { sessions: [] } },
      'PATCH /api/account/preferences': ({ body }) => {
        patches.push(body);
        return { body: { preferences: body } };
      },
    });
    renderApp('/account');
    const user = userEvent.setup();
    const select = await screen.findByLabelText('Units on your screens');
    expect(select).toHaveValue('team');
    await user.selectOptions(select, 'us');
    await user.click(screen.getByRole('button', { name: 'Save units' }));
    await waitFor(() => expect(patches).toEqual([{ unitSystem: 'us' }]));
    expect(await screen.findByText('Saved.')).toBeInTheDocument();
  });
});
