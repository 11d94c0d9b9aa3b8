import { useEffect } from 'react';
import { useParams } from 'react-router';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@shared/roles';
import type { InviteInput } from '@shared/schemas/teams';
import { rememberTeam, useRememberedTeamId } from '@/lib/currentTeam';
import type { MembershipSummary } from '../auth/api';
import { authKeys, useSignedInMe } from '../auth/hooks';
import {
  acceptInvite,
  changeMemberRole,
  createTeam,
  fetchInvite,
  fetchMembers,
  removeMember,
  revokeInvite,
  sendInvite,
  updateTeam,
} from './api';
import type { UnitSystem } from '@shared/schemas/auth';

export const teamKeys = {
  all: ['teams'] as const,
  members: (teamId: string) => ['teams', teamId, 'members'] as const,
  invite: (token: string) => ['invites', token] as const,
};

export interface CurrentTeam {
  /** The team in use: from the URL, else the remembered one, else the first. Null when the user has none. */
  team: MembershipSummary | null;
  /** True when the URL names a team the user is not a member of (show "not found", never its data). */
  urlTeamUnknown: boolean;
}

export function useCurrentTeam(): CurrentTeam {
  const { teamId } = useParams();
  const remembered = useRememberedTeamId();
  const me = useSignedInMe();
  const fromUrl = teamId ? me.teams.find((t) => t.id === teamId) : undefined;

  useEffect(() => {
    if (fromUrl) rememberTeam(fromUrl.id);
  }, [fromUrl]);

  if (teamId) return { team: fromUrl ?? null, urlTeamUnknown: !fromUrl };
  const team = me.teams.find((t) => t.id === remembered) ?? me.teams[0] ?? null;
  return { team, urlTeamUnknown: false };
}

export function useCreateTeam() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createTeam,
    onSuccess: async (team) => {
      rememberTeam(team.id);
      await queryClient.invalidateQueries({ queryKey: authKeys.me });
      await queryClient.invalidateQueries({ queryKey: teamKeys.all });
    },
  });
}

export function useMembers(teamId: string) {
  return useQuery({ queryKey: teamKeys.members(teamId), queryFn: ({ signal }) => fetchMembers(teamId, signal) });
}

function useTeamMutation<TVars, TResult>(teamId: string, fn: (vars: TVars) => Promise<TResult>, refreshMe = false) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: teamKeys.members(teamId) });
      if (refreshMe) await queryClient.invalidateQueries({ queryKey: authKeys.me });
    },
  });
}

export const useSendInvite = (teamId: string) => useTeamMutation(teamId, (body: InviteInput) => sendInvite(teamId, body));
export const useRevokeInvite = (teamId: string) => useTeamMutation(teamId, (inviteId: string) => revokeInvite(teamId, inviteId));
export const useChangeRole = (teamId: string) =>
  useTeamMutation(teamId, ({ userId, role }: { userId: string; role: Role }) => changeMemberRole(teamId, userId, role), true);
export const useRemoveMember = (teamId: string) => useTeamMutation(teamId, (userId: string) => removeMember(teamId, userId), true);

export function useInvite(token: string, enabled: boolean) {
  return useQuery({ queryKey: teamKeys.invite(token), queryFn: ({ signal }) => fetchInvite(token, signal), enabled });
}

export function useAcceptInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvite,
    onSuccess: async (team) => {
      rememberTeam(team.id);
      await queryClient.invalidateQueries({ queryKey: authKeys.me });
    },
  });
}

/** Owners: the team's settings (its unit system). Every member's screens follow it unless they set their own. */
export function useUpdateTeam(teamId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { unitSystem: UnitSystem }) => updateTeam(teamId, body),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: authKeys.me });
      await queryClient.invalidateQueries({ queryKey: teamKeys.all });
    },
  });
}
