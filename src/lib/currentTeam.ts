import { useSyncExternalStore } from 'react';

/** The team the user last worked in, remembered across visits in localStorage. */
const KEY = 'bankwright.currentTeam';
const listeners = new Set<() => void>();

function read(): string | null {
  try {
    return window.localStorage.getItem(KEY);
  } catch {
    return null;
  }
}

export function rememberTeam(teamId: string | null): void {
  try {
    if (teamId === read()) return;
    if (teamId) window.localStorage.setItem(KEY, teamId);
    else window.localStorage.removeItem(KEY);
  } catch {
    // Storage can be unavailable (private mode); the URL still carries the team.
  }
  for (const listener of listeners) listener();
}

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  const onStorage = (e: StorageEvent) => {
    if (e.key === KEY) listener();
  };
  window.addEventListener('storage', onStorage);
  return () => {
    listeners.delete(listener);
    window.removeEventListener('storage', onStorage);
  };
}

export function useRememberedTeamId(): string | null {
  return useSyncExternalStore(subscribe, read, () => null);
}

export function getRememberedTeamId(): string | null {
  return read();
}
