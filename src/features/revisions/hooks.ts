/** TanStack Query hooks for revisions, reviews and comments. Mutations refresh what they change. */
import { useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { DiagramDocument } from '@shared/diagram';
import { diagramKeys } from '@/features/editor/api';
import { projectKeys } from '@/features/projects/hooks';
import {
  addComment, createDiagram, decide, duplicateDiagram, fetchComments, fetchDiagramInfo, fetchRevision, fetchRevisions,
  requestReview, restoreRevision, saveRevision, setCommentResolved, type ReviewDecision,
} from './api';

export const revisionKeys = {
  list: (diagramId: string) => ['diagrams', 'revisions', diagramId] as const,
  one: (diagramId: string, n: number) => ['diagrams', 'revisions', diagramId, n] as const,
  comments: (diagramId: string, n: number) => ['diagrams', 'revisions', diagramId, n, 'comments'] as const,
};

export const activityKeys = { project: (projectId: string) => ['projects', 'detail', projectId, 'activity'] as const };

/** The diagram and the caller's role (same cache entry as the editor's). */
export function useDiagramInfo(diagramId: string) {
  return useQuery({ queryKey: diagramKeys.detail(diagramId), queryFn: ({ signal }) => fetchDiagramInfo(diagramId, signal) });
}

export function useRevisions(diagramId: string, enabled = true) {
  return useQuery({ queryKey: revisionKeys.list(diagramId), queryFn: ({ signal }) => fetchRevisions(diagramId, signal), enabled });
}

/** One revision with its content. Saved revisions never change, but their review state does. */
export function useRevision(diagramId: string, n: number | null) {
  return useQuery({
    queryKey: revisionKeys.one(diagramId, n ?? 0),
    queryFn: ({ signal }) => fetchRevision(diagramId, n!, signal),
    enabled: n !== null && n > 0,
  });
}

export function useComments(diagramId: string, n: number | null) {
  return useQuery({
    queryKey: revisionKeys.comments(diagramId, n ?? 0),
    queryFn: ({ signal }) => fetchComments(diagramId, n!, signal),
    enabled: n !== null && n > 0,
  });
}

/** After a revision is added or its state moves: the history, the diagram, the project's list and log. */
export function refreshAfterRevisionChange(qc: QueryClient, diagramId: string, projectId?: string, n?: number) {
  const jobs = [
    qc.invalidateQueries({ queryKey: revisionKeys.list(diagramId), exact: true }),
    qc.invalidateQueries({ queryKey: diagramKeys.detail(diagramId) }),
  ];
  if (n !== undefined) jobs.push(qc.invalidateQueries({ queryKey: revisionKeys.one(diagramId, n), exact: true }));
  if (projectId) {
    jobs.push(qc.invalidateQueries({ queryKey: projectKeys.diagrams(projectId) }));
    jobs.push(qc.invalidateQueries({ queryKey: activityKeys.project(projectId) }));
  }
  return Promise.all(jobs);
}

export function useSaveRevision(diagramId: string, projectId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { baseRevision: number | null; message: string; content: DiagramDocument }) => saveRevision(diagramId, body),
    onSuccess: (r) => {
      qc.setQueryData(revisionKeys.one(diagramId, r.number), r);
      return refreshAfterRevisionChange(qc, diagramId, projectId);
    },
  });
}

export function useRestoreRevision(diagramId: string, projectId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ n, message }: { n: number; message?: string }) => restoreRevision(diagramId, n, message),
    onSuccess: () => refreshAfterRevisionChange(qc, diagramId, projectId),
  });
}

export function useDuplicateDiagram(diagramId: string, projectId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { name: string; revision?: number }) => duplicateDiagram(diagramId, body),
    onSuccess: () => (projectId ? refreshAfterRevisionChange(qc, diagramId, projectId) : undefined),
  });
}

/** Save content as a new diagram in the project, with that content as its first revision. */
export function useSaveAsCopy(projectId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async ({ name, content, message }: { name: string; content: DiagramDocument; message: string }) => {
      const diagram = await createDiagram(projectId, { name, content: { ...content, name } });
      const revision = await saveRevision(diagram.id, { baseRevision: null, message, content: { ...content, name } });
      return { diagram, revision };
    },
    onSuccess: () => Promise.all([
      qc.invalidateQueries({ queryKey: projectKeys.diagrams(projectId) }),
      qc.invalidateQueries({ queryKey: activityKeys.project(projectId) }),
    ]),
  });
}

export function useRequestReview(diagramId: string, n: number, projectId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (reviewerIds: string[]) => requestReview(diagramId, n, reviewerIds),
    onSuccess: () => refreshAfterRevisionChange(qc, diagramId, projectId, n),
  });
}

export function useDecide(diagramId: string, n: number, projectId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { decision: ReviewDecision; note: string }) => decide(diagramId, n, body),
    onSuccess: () => refreshAfterRevisionChange(qc, diagramId, projectId, n),
  });
}

export function useAddComment(diagramId: string, n: number, projectId?: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { body: string; partId?: string; parentId?: string }) => addComment(diagramId, n, body),
    onSuccess: () => Promise.all([
      qc.invalidateQueries({ queryKey: revisionKeys.comments(diagramId, n) }),
      projectId ? qc.invalidateQueries({ queryKey: activityKeys.project(projectId) }) : undefined,
    ]),
  });
}

export function useResolveComment(diagramId: string, n: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ commentId, resolved }: { commentId: string; resolved: boolean }) => setCommentResolved(diagramId, n, commentId, resolved),
    onSuccess: () => qc.invalidateQueries({ queryKey: revisionKeys.comments(diagramId, n) }),
  });
}
