import { api } from '@/lib/api';

export interface OutboxMessage {
  id: string;
  to: string;
  subject: string;
  text: string;
  html: string | null;
  createdAt: string;
}

export const fetchOutbox = (teamId: string, signal?: AbortSignal) =>
  api<{ messages: OutboxMessage[] }>(`/api/teams/${encodeURIComponent(teamId)}/outbox`, { signal }).then((r) => r.messages);
