/** The team parts library (API: "Parts library"). */
import type { CreateLibraryItemInput, ImportMode, ImportResult, LibraryRecord, UpdateLibraryItemInput } from '@shared/schemas/library';
import { api } from '@/lib/api';

export type { ImportResult, LibraryRecord };

export const libraryKeys = { list: (teamId: string) => ['teams', teamId, 'library'] as const };

const base = (teamId: string) => `/api/teams/${encodeURIComponent(teamId)}/library`;

export async function fetchLibrary(teamId: string, signal?: AbortSignal): Promise<LibraryRecord[]> {
  return (await api<{ items: LibraryRecord[] }>(base(teamId), { signal })).items;
}

export async function createLibraryItem(teamId: string, item: CreateLibraryItemInput): Promise<LibraryRecord> {
  return (await api<{ item: LibraryRecord }>(base(teamId), { method: 'POST', body: item })).item;
}

export async function updateLibraryItem(teamId: string, id: string, patch: UpdateLibraryItemInput): Promise<LibraryRecord> {
  return (await api<{ item: LibraryRecord }>(`${base(teamId)}/${encodeURIComponent(id)}`, { method: 'PATCH', body: patch })).item;
}

export function deleteLibraryItem(teamId: string, id: string) {
  return api<void>(`${base(teamId)}/${encodeURIComponent(id)}`, { method: 'DELETE' });
}

export function importLibrary(teamId: string, csv: string, mode: ImportMode) {
  return api<ImportResult>(`${base(teamId)}/import`, { method: 'POST', body: { csv, mode } });
}

export const exportUrl = (teamId: string) => `${base(teamId)}/export`;
