import type { RevisionState } from '@shared/schemas/diagrams';
import type { CreateProjectInput } from '@shared/schemas/projects';
import { api } from '@/lib/api';

export interface Project {
  id: string;
  teamId: string;
  name: string;
  site: string;
  description: string;
  createdAt: string;
  updatedAt: string;
  diagramCount?: number;
}

export interface DiagramSummary {
  id: string;
  projectId: string;
  name: string;
  description: string;
  updatedAt: string;
  partCount: number;
  /** The newest saved revision and its review state; null before the first revision. */
  latestRevision?: { number: number; state: RevisionState } | null;
}

export type ProjectPatch = Partial<Pick<Project, 'name' | 'site' | 'description'>>;

const p = (projectId: string) => `/api/projects/${encodeURIComponent(projectId)}`;

export const fetchProjects = (teamId: string, signal?: AbortSignal) =>
  api<{ projects: Project[] }>(`/api/projects?teamId=${encodeURIComponent(teamId)}`, { signal }).then((r) => r.projects);
export const fetchProject = (projectId: string, signal?: AbortSignal) =>
  api<{ project: Project }>(p(projectId), { signal }).then((r) => r.project);
export const createProject = (body: CreateProjectInput) =>
  api<{ project: Project }>('/api/projects', { method: 'POST', body }).then((r) => r.project);
export const updateProject = (projectId: string, body: ProjectPatch) =>
  api<{ project: Project }>(p(projectId), { method: 'PATCH', body }).then((r) => r.project);
export const deleteProject = (projectId: string) => api<void>(p(projectId), { method: 'DELETE' });
export const fetchDiagrams = (projectId: string, signal?: AbortSignal) =>
  api<{ diagrams: DiagramSummary[] }>(`${p(projectId)}/diagrams`, { signal }).then((r) => r.diagrams);

/** A diagram as the create, move and copy routes answer it (the fields the client uses). */
export interface CreatedDiagram {
  id: string;
  projectId: string;
  name: string;
}

export const createDiagramIn = (projectId: string, body: { name: string; content?: unknown }) =>
  api<{ diagram: CreatedDiagram }>(`${p(projectId)}/diagrams`, { method: 'POST', body }).then((r) => r.diagram);
export const moveDiagram = (diagramId: string, projectId: string) =>
  api<{ diagram: CreatedDiagram }>(`/api/diagrams/${encodeURIComponent(diagramId)}/move`, { method: 'POST', body: { projectId } }).then((r) => r.diagram);
export const copyDiagram = (diagramId: string, projectId: string) =>
  api<{ diagram: CreatedDiagram }>(`/api/diagrams/${encodeURIComponent(diagramId)}/copy`, { method: 'POST', body: { projectId } }).then((r) => r.diagram);
