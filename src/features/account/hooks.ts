import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Me } from '../auth/api';
import { authKeys } from '../auth/hooks';
import { changeEmail, changePassword, fetchSessions, revokeSession, updateAccount, updatePreferences } from './api';

export const accountKeys = {
  sessions: ['account', 'sessions'] as const,
};

export function useUpdateAccount() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateAccount,
    onSuccess: (user) => queryClient.setQueryData<Me | null>(authKeys.me, (me) => (me ? { ...me, user } : me)),
  });
}

export function useChangeEmail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changeEmail,
    onSuccess: (user) => queryClient.setQueryData<Me | null>(authKeys.me, (me) => (me ? { ...me, user } : me)),
  });
}

export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changePassword,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: accountKeys.sessions }),
  });
}

export function useSessions() {
  return useQuery({ queryKey: accountKeys.sessions, queryFn: ({ signal }) => fetchSessions(signal) });
}

export function useRevokeSession() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeSession,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: accountKeys.sessions }),
  });
}

/** The user's own unit system (null: follow each team's); /me carries it, so the screens follow at once. */
export function useUpdatePreferences() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePreferences,
    onSuccess: (preferences) => queryClient.setQueryData<Me | null>(authKeys.me, (me) => (me ? { ...me, preferences } : me)),
  });
}
