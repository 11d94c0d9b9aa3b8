/**
 * Revision, review and duplicate endpoints (docs/api.md, "Revisions and review"). Types follow the
 * server's answers; the results summary is the shared `ResultsSummary` plus the server's status fields.
 */
import type { DiagramDocument } from '@shared/diagram';
import type { ResultsSummary } from '@shared/diagram/diff';
import type { Role } from '@shared/roles';
import type { RevisionState } from '@shared/schemas/diagrams';
import type { ReviewDecision } from '@shared/schemas/reviews';
import { api } from '@/lib/api';

export type { RevisionState, ReviewDecision };

export interface Person {
  id: string;
  name: string;
}

export interface RevisionMeta {
  number: number;
  author: Person | null;
  createdAt: string;
  message: string;
  contentHash: string;
  state: RevisionState;
  restoredFrom?: number | null;
  approvedBy?: Person | null;
  approvedAt?: string | null;
  /** Short results status kept in the list (the full summary comes with one revision). */
  results?: { status: 'solved' | 'compile_failed' | 'solve_failed'; findingCounts: Record<string, number> | null };
}

/** The summary stored with a revision (shared/diagram/summary.ts); status and issues are optional for older rows. */
export type StoredResultsSummary = ResultsSummary & {
  status?: 'solved' | 'compile_failed' | 'solve_failed';
  issues?: { code: string; message: string; parts: string[] }[];
};

export interface ReviewInfo {
  reviewers: (Person & { requestedAt: string })[];
  decisions: { reviewer: Person | null; decision: ReviewDecision; note: string; createdAt: string }[];
}

export interface Revision extends RevisionMeta {
  content: DiagramDocument;
  resultsSummary: StoredResultsSummary;
  review: ReviewInfo;
}

export interface DiagramInfo {
  id: string;
  projectId: string;
  teamId: string;
  projectName: string;
  name: string;
  description: string;
  content: unknown;
  workingCopyVersion: number;
  updatedAt: string;
  latestRevision?: RevisionMeta | null;
}

export interface ReviewComment {
  id: string;
  parentId: string | null;
  partId: string | null;
  body: string;
  author: Person | null;
  createdAt: string;
  resolved: boolean;
  resolvedAt: string | null;
  resolvedBy: Person | null;
}

/** details of 409 revision_conflict */
export interface RevisionConflict {
  latest: { number: number; author: Person | null; createdAt: string; message: string; contentHash: string; state?: RevisionState } | null;
}

const d = (id: string) => `/api/diagrams/${encodeURIComponent(id)}`;
const rev = (id: string, n: number) => `${d(id)}/revisions/${n}`;

export const fetchDiagramInfo = (id: string, signal?: AbortSignal) => api<{ diagram: DiagramInfo; role: Role }>(d(id), { signal });
export const fetchRevisions = (id: string, signal?: AbortSignal) =>
  api<{ revisions: RevisionMeta[] }>(`${d(id)}/revisions`, { signal }).then((r) => r.revisions);
export const fetchRevision = (id: string, n: number, signal?: AbortSignal) =>
  api<{ revision: Revision }>(rev(id, n), { signal }).then((r) => r.revision);
export const saveRevision = (id: string, body: { baseRevision: number | null; message: string; content: DiagramDocument }) =>
  api<{ revision: Revision }>(`${d(id)}/revisions`, { method: 'POST', body }).then((r) => r.revision);
export const restoreRevision = (id: string, n: number, message?: string) =>
  api<{ revision: Revision }>(`${rev(id, n)}/restore`, { method: 'POST', body: message ? { message } : {} }).then((r) => r.revision);
export const duplicateDiagram = (id: string, body: { name: string; revision?: number }) =>
  api<{ diagram: DiagramInfo }>(`${d(id)}/duplicate`, { method: 'POST', body }).then((r) => r.diagram);
/** A new diagram in a project holding the given content (used to save a user's version as a copy). */
export const createDiagram = (projectId: string, body: { name: string; description?: string; content: DiagramDocument }) =>
  api<{ diagram: DiagramInfo }>(`/api/projects/${encodeURIComponent(projectId)}/diagrams`, { method: 'POST', body }).then((r) => r.diagram);

export const requestReview = (id: string, n: number, reviewerIds: string[]) =>
  api<{ review: unknown }>(`${rev(id, n)}/review-requests`, { method: 'POST', body: { reviewerIds } });
export const fetchComments = (id: string, n: number, signal?: AbortSignal) =>
  api<{ comments: ReviewComment[] }>(`${rev(id, n)}/comments`, { signal }).then((r) => r.comments);
export const addComment = (id: string, n: number, body: { body: string; partId?: string; parentId?: string }) =>
  api<{ comment: ReviewComment }>(`${rev(id, n)}/comments`, { method: 'POST', body }).then((r) => r.comment);
export const setCommentResolved = (id: string, n: number, commentId: string, resolved: boolean) =>
  api<{ comment: ReviewComment }>(`${rev(id, n)}/comments/${encodeURIComponent(commentId)}`, { method: 'PATCH', body: { resolved } }).then((r) => r.comment);
export const decide = (id: string, n: number, body: { decision: ReviewDecision; note: string }) =>
  api<{ review: unknown }>(`${rev(id, n)}/decision`, { method: 'POST', body });
