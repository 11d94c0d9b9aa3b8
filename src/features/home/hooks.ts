import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { fetchNotifications, fetchOwnOutbox, fetchWork, markNotificationsRead } from './api';

export const homeKeys = {
  notifications: ['notifications'] as const,
  work: ['work'] as const,
  ownOutbox: ['outbox', 'own'] as const,
};

/** Notices with the unread count; checked again every minute and when the window regains focus. */
export function useNotifications() {
  return useQuery({ queryKey: homeKeys.notifications, queryFn: ({ signal }) => fetchNotifications(signal), refetchInterval: 60_000 });
}

export function useMarkRead() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: markNotificationsRead,
    onSuccess: () => qc.invalidateQueries({ queryKey: homeKeys.notifications }),
  });
}

export function useWork() {
  return useQuery({ queryKey: homeKeys.work, queryFn: ({ signal }) => fetchWork(signal) });
}

export function useOwnOutbox(enabled: boolean) {
  return useQuery({ queryKey: homeKeys.ownOutbox, queryFn: ({ signal }) => fetchOwnOutbox(signal), enabled });
}
