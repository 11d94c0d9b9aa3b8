import type { Role } from '@shared/roles';
import type { UnitSystem } from '@shared/schemas/auth';
import type { CreateTeamInput, InviteInput } from '@shared/schemas/teams';
import { api } from '@/lib/api';

export interface Team {
  id: string;
  name: string;
  role: Role;
  unitSystem: UnitSystem;
  memberCount?: number;
}

export interface Member {
  userId: string;
  email: string;
  name: string;
  role: Role;
  joinedAt: string;
}

export interface Invite {
  id: string;
  email: string;
  role: Role;
  createdAt: string;
  expiresAt: string;
}

export interface InvitePreview {
  teamName: string;
  role: Role;
  email: string;
  expiresAt: string;
}

const t = (teamId: string) => `/api/teams/${encodeURIComponent(teamId)}`;

export const fetchTeams = (signal?: AbortSignal) => api<{ teams: Team[] }>('/api/teams', { signal }).then((r) => r.teams);
export const fetchTeam = (teamId: string, signal?: AbortSignal) => api<{ team: Team }>(t(teamId), { signal }).then((r) => r.team);
export const createTeam = (body: CreateTeamInput) => api<{ team: Team }>('/api/teams', { method: 'POST', body }).then((r) => r.team);

export const fetchMembers = (teamId: string, signal?: AbortSignal) =>
  api<{ members: Member[]; invites: Invite[] }>(`${t(teamId)}/members`, { signal });
export const sendInvite = (teamId: string, body: InviteInput) =>
  api<{ invite: Invite }>(`${t(teamId)}/invites`, { method: 'POST', body }).then((r) => r.invite);
export const revokeInvite = (teamId: string, inviteId: string) =>
  api<void>(`${t(teamId)}/invites/${encodeURIComponent(inviteId)}`, { method: 'DELETE' });
export const changeMemberRole = (teamId: string, userId: string, role: Role) =>
  api<{ member: Member }>(`${t(teamId)}/members/${encodeURIComponent(userId)}`, { method: 'PATCH', body: { role } }).then((r) => r.member);
export const removeMember = (teamId: string, userId: string) =>
  api<void>(`${t(teamId)}/members/${encodeURIComponent(userId)}`, { method: 'DELETE' });

export const fetchInvite = (token: string, signal?: AbortSignal) =>
  api<{ invite: InvitePreview }>(`/api/invites/${encodeURIComponent(token)}`, { signal }).then((r) => r.invite);
export const acceptInvite = (token: string) =>
  api<{ team: Team }>('/api/invites/accept', { method: 'POST', body: { token } }).then((r) => r.team);

export const updateTeam = (teamId: string, body: { name?: string; unitSystem?: UnitSystem }) =>
  api<{ team: Team }>(t(teamId), { method: 'PATCH', body }).then((r) => r.team);
