/**
 * The annotations-only save, for roles that may annotate but not edit the electrical model (trainers).
 * `PUT /api/diagrams/:id/annotations {annotations, baseVersion}` (diagram.annotate) replaces only the
 * working copy's `annotations` and answers like the working-copy route: `200 {workingCopyVersion,
 * updatedAt}`, `409 working_copy_conflict` when `baseVersion` is not current.
 */
import type { DiagramAnnotation } from '@shared/diagram';
import { api } from '@/lib/api';

export interface SavedAnnotations {
  workingCopyVersion: number;
  updatedAt: string;
}

export function saveAnnotations(diagramId: string, annotations: DiagramAnnotation[], baseVersion: number) {
  return api<SavedAnnotations>(`/api/diagrams/${encodeURIComponent(diagramId)}/annotations`, {
    method: 'PUT',
    body: { annotations, baseVersion },
  });
}
