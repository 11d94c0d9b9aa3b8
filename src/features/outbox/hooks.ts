import { useQuery } from '@tanstack/react-query';
import { fetchOutbox } from './api';

export const outboxKeys = {
  list: (teamId: string) => ['outbox', teamId] as const,
};

export function useOutbox(teamId: string, enabled: boolean) {
  return useQuery({ queryKey: outboxKeys.list(teamId), queryFn: ({ signal }) => fetchOutbox(teamId, signal), enabled });
}
