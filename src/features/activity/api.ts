/** The project activity log: GET /api/projects/:id/activity (newest first). */
import { api } from '@/lib/api';

export interface ActivityEntry {
  id: string;
  action: string;
  detail: Record<string, unknown> | null;
  createdAt: string;
  user: { id: string; name: string } | null;
}

export const fetchActivity = (projectId: string, signal?: AbortSignal, limit = 50) =>
  api<{ activity: ActivityEntry[] }>(`/api/projects/${encodeURIComponent(projectId)}/activity?limit=${limit}`, { signal }).then((r) => r.activity);
