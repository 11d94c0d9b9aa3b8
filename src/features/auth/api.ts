import type { Role } from '@shared/roles';
import type { SignInInput, SignUpInput, UnitSystem } from '@shared/schemas/auth';
import { api, isApiError } from '@/lib/api';

export interface User {
  id: string;
  email: string;
  name: string;
  createdAt: string;
}

export interface MembershipSummary {
  id: string;
  name: string;
  role: Role;
  unitSystem: UnitSystem;
}

export interface Me {
  user: User;
  /** The user's own settings; unitSystem null follows each team's. */
  preferences?: { unitSystem: UnitSystem | null };
  teams: MembershipSummary[];
  demo: boolean;
  mailMode: 'smtp' | 'outbox';
}

/** The signed-in user, or null when signed out (401 on /api/auth/me). */
export async function fetchMe(signal?: AbortSignal): Promise<Me | null> {
  try {
    return await api<Me>('/api/auth/me', { signal });
  } catch (error) {
    if (isApiError(error) && error.status === 401) return null;
    throw error;
  }
}

export const signIn = (body: SignInInput) => api<{ user: User }>('/api/auth/sign-in', { method: 'POST', body });
export const signUp = (body: SignUpInput) => api<{ user: User }>('/api/auth/sign-up', { method: 'POST', body });
export const signOut = () => api<void>('/api/auth/sign-out', { method: 'POST' });
