import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { createProject, deleteProject, fetchDiagrams, fetchProject, fetchProjects, updateProject, type Project, type ProjectPatch } from './api';

export const projectKeys = {
  all: ['projects'] as const,
  list: (teamId: string) => ['projects', 'list', teamId] as const,
  detail: (projectId: string) => ['projects', 'detail', projectId] as const,
  diagrams: (projectId: string) => ['projects', 'detail', projectId, 'diagrams'] as const,
};

export function useProjects(teamId: string) {
  return useQuery({ queryKey: projectKeys.list(teamId), queryFn: ({ signal }) => fetchProjects(teamId, signal) });
}

export function useProject(projectId: string) {
  return useQuery({ queryKey: projectKeys.detail(projectId), queryFn: ({ signal }) => fetchProject(projectId, signal) });
}

export function useDiagrams(projectId: string, enabled = true) {
  return useQuery({ queryKey: projectKeys.diagrams(projectId), queryFn: ({ signal }) => fetchDiagrams(projectId, signal), enabled });
}

export function useCreateProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createProject,
    onSuccess: (project) => queryClient.invalidateQueries({ queryKey: projectKeys.list(project.teamId) }),
  });
}

export function useUpdateProject(projectId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (patch: ProjectPatch) => updateProject(projectId, patch),
    onSuccess: (project) => {
      queryClient.setQueryData<Project>(projectKeys.detail(projectId), project);
      return queryClient.invalidateQueries({ queryKey: projectKeys.list(project.teamId) });
    },
  });
}

export function useDeleteProject(project: Pick<Project, 'id' | 'teamId'>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => deleteProject(project.id),
    onSuccess: () => {
      queryClient.removeQueries({ queryKey: projectKeys.detail(project.id) });
      return queryClient.invalidateQueries({ queryKey: projectKeys.list(project.teamId) });
    },
  });
}
