import { api } from '@/lib/api';
import type { User } from '../auth/api';

export interface SessionInfo {
  id: string;
  createdAt: string;
  expiresAt: string;
  current: boolean;
  userAgent: string | null;
}

export const updateAccount = (body: { name: string }) =>
  api<{ user: User }>('/api/account', { method: 'PATCH', body }).then((r) => r.user);
export const changeEmail = (body: { email: string; currentPassword: string }) =>
  api<{ user: User }>('/api/account/email', { method: 'PATCH', body }).then((r) => r.user);
export const changePassword = (body: { currentPassword: string; newPassword: string; endOtherSessions: boolean }) =>
  api<void>('/api/account/password', { method: 'POST', body });
export const fetchSessions = (signal?: AbortSignal) =>
  api<{ sessions: SessionInfo[] }>('/api/account/sessions', { signal }).then((r) => r.sessions);
export const revokeSession = (id: string) => api<void>(`/api/account/sessions/${encodeURIComponent(id)}`, { method: 'DELETE' });

export interface Preferences {
  unitSystem: 'metric' | 'us' | null;
}
export const updatePreferences = (body: Preferences) =>
  api<{ preferences: Preferences }>('/api/account/preferences', { method: 'PATCH', body }).then((r) => r.preferences);
