/** The signed-in user's notices, the work waiting for them and their own captured mail (docs/api.md). */
import { api } from '@/lib/api';
import type { OutboxMessage } from '@/features/outbox/api';

export type NotificationKind = 'review_requested' | 'changes_requested' | 'approved' | 'comment' | 'reply';
type Ref = { id: string; name: string };

export interface AppNotification {
  id: string;
  kind: NotificationKind;
  team: Ref;
  actor: Ref | null;
  diagram: Ref;
  project: Ref;
  revision: number;
  commentId: string | null;
  excerpt: string;
  read: boolean;
  createdAt: string;
  path: string;
}

export interface WorkItem {
  diagram: Ref;
  project: Ref;
  team: Ref;
  revision: number;
  state: string;
  message: string;
  createdAt: string;
  path: string;
}

export interface Work {
  waitingForReview: (WorkItem & { requestedAt: string })[];
  changesRequested: (WorkItem & { historyPath: string })[];
  recentApprovals: (WorkItem & { approvedAt: string | null; approvedBy: string | null })[];
}

export const fetchNotifications = (signal?: AbortSignal) =>
  api<{ notifications: AppNotification[]; unread: number }>('/api/notifications?limit=30', { signal });
export const markNotificationsRead = (body: { ids: string[] } | { all: true }) =>
  api<{ unread: number }>('/api/notifications/read', { method: 'POST', body });
export const fetchWork = (signal?: AbortSignal) => api<Work>('/api/work', { signal });
export const fetchOwnOutbox = (signal?: AbortSignal) =>
  api<{ messages: OutboxMessage[] }>('/api/account/outbox', { signal }).then((r) => r.messages);
