import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { designer, meWith, mockApi, renderApp } from './helpers';

const members = [
  { userId: 'u-ines', email: 'ines@fieldcrew.test', name: 'Ines Okafor', role: 'owner', joinedAt: '2025-01-10T09:00:00Z' },
  { userId: 'u-dana', email: 'dana@fieldcrew.test', name: 'Dana Whitlock', role: 'designer', joinedAt: '2025-02-11T09:00:00Z' },
  { userId: 'u-theo', email: 'theo@fieldcrew.test', name: 'Theo Brandt', role: 'viewer', joinedAt: '2025-03-12T09:00:00Z' },
];
const invite = { id: 'i-1', email: 'sam@fieldcrew.test', role: 'trainer', createdAt: '2025-04-01T09:00:00Z', expiresAt: '2025-04-08T09:00:00Z' };

function setup(role: string, userId: string) {
  const user = { ...designer.user, id: userId };
  return mockApi({
    'GET /api/auth/me': { body: meWith([{ id: 't-north', name: 'North Shore Off-Grid', role }], user) },
    'GET /api/teams/t-north/members': { body: { members, invites: role === 'owner' ? [invite] : [] } },
    'PATCH /api/teams/t-north/members/u-theo': ({ body }) => ({ body: { member: { ...members[2], ...(body as object) } } }),
    'POST /api/teams/t-north/invites': ({ body }) => ({ status: 201, body: { invite: { ...invite, id: 'i-2', ...(body as object) } } }),
  });
}

describe('members page', () => {
  it('gives an owner invite, role, remove and revoke controls; invites and role changes reach the API', async () => {
    const fetchMock = setup('owner', 'u-ines');
    renderApp('/teams/t-north/members');
    const user = userEvent.setup();

    expect(await screen.findByRole('form', { name: 'Invite member' })).toBeInTheDocument();
    expect(await screen.findByRole('combobox', { name: 'Role of Theo Brandt' })).toHaveValue('viewer');
    expect(screen.getByRole('button', { name: 'Remove Theo Brandt' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Revoke invite for sam@fieldcrew.test' })).toBeInTheDocument();

    await user.selectOptions(screen.getByRole('combobox', { name: 'Role of Theo Brandt' }), 'reviewer');
    await waitFor(() =>
      expect(fetchMock).toHaveBeenCalledWith('/api/teams/t-north/members/u-theo', expect.objectContaining({ method: 'PATCH', body: JSON.stringify({ role: 'reviewer' }) })),
    );

    const form = screen.getByRole('form', { name: 'Invite member' });
    await user.click(within(form).getByRole('button', { name: 'Send invite' }));
    expect(await within(form).findByText('E-mail is required')).toBeInTheDocument();
    await user.type(within(form).getByLabelText('E-mail'), 'kai@fieldcrew.test');
    await user.selectOptions(within(form).getByLabelText('Role'), 'reviewer');
    await user.click(within(form).getByRole('button', { name: 'Send invite' }));
    expect(await within(form).findByText(/Invite sent to kai@fieldcrew.test/)).toBeInTheDocument();
    const post = fetchMock.mock.calls.find(([url, init]) => url === '/api/teams/t-north/invites' && init?.method === 'POST')!;
    expect(JSON.parse(String(post[1]!.body))).toEqual({ email: 'kai@fieldcrew.test', role: 'reviewer' });
  });

  it.each([
    ['designer', 'u-dana'],
    ['viewer', 'u-theo'],
  ])('shows the list read-only to a %s', async (role, userId) => {
    setup(role, userId);
    renderApp('/teams/t-north/members');
    const table = await screen.findByRole('table');
    expect(within(table).getAllByRole('row')).toHaveLength(4);
    expect(within(table).getByText('ines@fieldcrew.test')).toBeInTheDocument();
    expect(screen.queryByRole('form', { name: 'Invite member' })).not.toBeInTheDocument();
    expect(screen.queryByRole('combobox')).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /^Remove / })).not.toBeInTheDocument();
    expect(screen.queryByText('Pending invites')).not.toBeInTheDocument();
    // Roles are shown as words; the member may still leave the team themself.
    expect(within(table).getAllByText('Owner').length).toBeGreaterThan(0);
    expect(screen.getByRole('button', { name: 'Leave team' })).toBeInTheDocument();
  });
});
