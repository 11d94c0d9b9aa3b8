import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateLibraryItemInput, ImportMode, UpdateLibraryItemInput } from '@shared/schemas/library';
import { createLibraryItem, deleteLibraryItem, fetchLibrary, importLibrary, libraryKeys, updateLibraryItem } from './api';

export function useLibrary(teamId: string | undefined) {
  return useQuery({
    queryKey: libraryKeys.list(teamId ?? ''),
    queryFn: ({ signal }) => fetchLibrary(teamId!, signal),
    enabled: !!teamId,
  });
}

function useInvalidate(teamId: string) {
  const queryClient = useQueryClient();
  return () => queryClient.invalidateQueries({ queryKey: libraryKeys.list(teamId) });
}

export function useCreateLibraryItem(teamId: string) {
  const invalidate = useInvalidate(teamId);
  return useMutation({ mutationFn: (item: CreateLibraryItemInput) => createLibraryItem(teamId, item), onSuccess: invalidate });
}

export function useUpdateLibraryItem(teamId: string) {
  const invalidate = useInvalidate(teamId);
  return useMutation({ mutationFn: ({ id, patch }: { id: string; patch: UpdateLibraryItemInput }) => updateLibraryItem(teamId, id, patch), onSuccess: invalidate });
}

export function useDeleteLibraryItem(teamId: string) {
  const invalidate = useInvalidate(teamId);
  return useMutation({ mutationFn: (id: string) => deleteLibraryItem(teamId, id), onSuccess: invalidate });
}

export function useImportLibrary(teamId: string) {
  const invalidate = useInvalidate(teamId);
  return useMutation({ mutationFn: ({ csv, mode }: { csv: string; mode: ImportMode }) => importLibrary(teamId, csv, mode), onSuccess: invalidate });
}
