/** The diagram endpoints the editor calls (API contract: "Diagrams (editor working copy)"). */
import type { Role } from '@shared/roles';
import type { RevisionState } from '@shared/schemas/diagrams';
import { api } from '@/lib/api';

export interface DiagramRecord {
  id: string;
  projectId: string;
  teamId: string;
  projectName: string;
  name: string;
  description: string;
  content: unknown;
  workingCopyVersion: number;
  updatedAt: string;
  updatedBy: { id: string; name: string } | null;
  /** The newest saved revision, when there is one. */
  latestRevision?: { number: number; state: RevisionState } | null;
}

export interface DiagramResponse {
  diagram: DiagramRecord;
  role: Role;
}

export interface SavedWorkingCopy {
  workingCopyVersion: number;
  updatedAt: string;
}

/** details of a 409 working_copy_conflict */
export interface ConflictDetails {
  workingCopyVersion: number;
  updatedAt: string;
  updatedBy: { id: string; name: string } | null;
}

export const diagramKeys = { detail: (id: string) => ['diagrams', 'detail', id] as const };

export function fetchDiagram(id: string, signal?: AbortSignal) {
  return api<DiagramResponse>(`/api/diagrams/${encodeURIComponent(id)}`, { signal });
}

export function saveWorkingCopy(id: string, content: unknown, baseVersion: number) {
  return api<SavedWorkingCopy>(`/api/diagrams/${encodeURIComponent(id)}/working-copy`, { method: 'PUT', body: { content, baseVersion } });
}
