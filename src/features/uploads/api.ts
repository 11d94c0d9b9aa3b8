/** Project uploads: data sheets and site photos (API: "Uploads"). */
import type { UploadRecord } from '@shared/schemas/uploads';
import { api, ApiError } from '@/lib/api';

export type { UploadRecord };

export interface UploadList {
  uploads: UploadRecord[];
  maxBytes: number;
}

export const uploadKeys = { list: (projectId: string) => ['projects', 'detail', projectId, 'uploads'] as const };

export function fetchUploads(projectId: string, signal?: AbortSignal) {
  return api<UploadList>(`/api/projects/${encodeURIComponent(projectId)}/uploads`, { signal });
}

/** POST one file as multipart/form-data (field "file"); errors come back as ApiError like every other call. */
export async function uploadFile(projectId: string, file: File): Promise<UploadRecord> {
  const form = new FormData();
  form.append('file', file, file.name);
  let response: Response;
  try {
    response = await fetch(`/api/projects/${encodeURIComponent(projectId)}/uploads`, {
      method: 'POST',
      body: form,
      headers: { Accept: 'application/json' },
      credentials: 'same-origin',
    });
  } catch {
    throw new ApiError(0, 'network', 'The server could not be reached. Check the connection and try again.');
  }
  const data = (await response.json().catch(() => undefined)) as { upload?: UploadRecord; error?: { code?: string; message?: string; details?: unknown } } | undefined;
  if (!response.ok || !data?.upload) {
    throw new ApiError(response.status, data?.error?.code ?? 'error', data?.error?.message ?? `The server answered ${response.status}.`, data?.error?.details);
  }
  return data.upload;
}

export function deleteUpload(id: string) {
  return api<void>(`/api/uploads/${encodeURIComponent(id)}`, { method: 'DELETE' });
}
