import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { deleteUpload, fetchUploads, uploadFile, uploadKeys } from './api';

export function useUploads(projectId: string) {
  return useQuery({ queryKey: uploadKeys.list(projectId), queryFn: ({ signal }) => fetchUploads(projectId, signal) });
}

export function useUploadFile(projectId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (file: File) => uploadFile(projectId, file),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['projects', 'detail', projectId] }),
  });
}

export function useDeleteUpload(projectId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteUpload,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['projects', 'detail', projectId] }),
  });
}
