/**
 * The project page's attachments: data sheets (PDF) and site photos (JPEG, PNG, WebP), listed with who
 * attached them and when. Photos show as thumbnails (scaled by the browser, loaded lazily) and open
 * full size; data sheets download. Owners, designers and trainers attach; the uploader, designers and
 * owners delete. The server checks every file's content; this screen only offers the right types.
 */
import { useRef, useState, type ChangeEvent } from 'react';
import { can, type Role } from '@shared/roles';
import { isImageType, UPLOAD_ACCEPT, type UploadRecord } from '@shared/schemas/uploads';
import { Button } from '@/components/Button';
import { ConfirmDialog } from '@/components/ConfirmDialog';
import { PlusIcon, TrashIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { EmptyState, ErrorState, LoadingRegion, Skeleton } from '@/components/States';
import { errorMessage } from '@/lib/api';
import { formatDateTime } from '@/lib/format';
import { useSignedInMe } from '@/features/auth/hooks';
import { useDeleteUpload, useUploadFile, useUploads } from './hooks';

/** "1.2 MB", "340 KB". */
export function formatBytes(n: number): string {
  if (n >= 1024 * 1024) return `${Math.round((n / (1024 * 1024)) * 10) / 10} MB`;
  if (n >= 1024) return `${Math.round(n / 1024)} KB`;
  return `${n} B`;
}

function PdfGlyph() {
  return (
    <svg viewBox="0 0 40 48" className="h-12 w-10" aria-hidden="true" focusable="false">
      <path d="M4 2h22l10 10v34H4z" fill="#fff" stroke="currentColor" strokeWidth="2" />
      <path d="M26 2v10h10" fill="none" stroke="currentColor" strokeWidth="2" />
      <text x="20" y="36" textAnchor="middle" fontSize="10" fontWeight="700" fill="currentColor">PDF</text>
    </svg>
  );
}

function UploadCard({ upload, mayDelete, onDelete }: { upload: UploadRecord; mayDelete: boolean; onDelete: () => void }) {
  const image = isImageType(upload.contentType);
  const who = upload.uploadedBy?.name ?? 'A former member';
  return (
    <li className="flex min-w-0 flex-col overflow-hidden rounded-lg border border-graphite-200 bg-white shadow-xs">
      <a
        href={upload.contentUrl}
        {...(image ? { target: '_blank', rel: 'noopener' } : { download: upload.fileName })}
        className="flex h-32 items-center justify-center bg-graphite-50 text-graphite-500 hover:text-copper-700"
        aria-label={image ? `Open photo ${upload.fileName}` : `Download data sheet ${upload.fileName}`}
      >
        {image ? (
          <img
            src={upload.contentUrl}
            alt={upload.fileName}
            loading="lazy"
            decoding="async"
            width={upload.width ?? undefined}
            height={upload.height ?? undefined}
            className="h-full w-full object-cover"
          />
        ) : (
          <PdfGlyph />
        )}
      </a>
      <div className="flex min-w-0 items-start gap-2 px-3 py-2">
        <div className="min-w-0 flex-1">
          <p className="truncate text-[13px] font-medium text-graphite-900" title={upload.fileName}>
            {upload.fileName}
          </p>
          <p className="truncate text-xs text-graphite-500">
            {image && upload.width && upload.height ? `${upload.width} × ${upload.height} · ` : 'PDF · '}
            {formatBytes(upload.size)}
          </p>
          <p className="truncate text-xs text-graphite-500" title={`Attached by ${who}`}>
            {who}
          </p>
          <p className="truncate text-xs text-graphite-500">
            <time dateTime={upload.createdAt}>{formatDateTime(upload.createdAt)}</time>
          </p>
        </div>
        {mayDelete ? (
          <Button size="sm" variant="ghost" onClick={onDelete} aria-label={`Delete ${upload.fileName}`} title="Delete">
            <TrashIcon size={14} />
          </Button>
        ) : null}
      </div>
    </li>
  );
}

export function UploadsSection({ projectId, teamId }: { projectId: string; teamId: string }) {
  const me = useSignedInMe();
  const role: Role | undefined = me.teams.find((t) => t.id === teamId)?.role as Role | undefined;
  const userId = me.user.id;
  const list = useUploads(projectId);
  const upload = useUploadFile(projectId);
  const remove = useDeleteUpload(projectId);
  const input = useRef<HTMLInputElement>(null);
  const [deleting, setDeleting] = useState<UploadRecord | null>(null);
  const [failures, setFailures] = useState<{ name: string; message: string }[]>([]);
  const mayUpload = can(role, 'diagram.annotate');
  const mayDelete = (u: UploadRecord) => can(role, 'project.edit') || (mayUpload && u.uploadedBy?.id === userId);

  async function onPick(e: ChangeEvent<HTMLInputElement>) {
    const files = Array.from(e.target.files ?? []);
    e.target.value = '';
    const failed: { name: string; message: string }[] = [];
    for (const file of files) {
      try {
        await upload.mutateAsync(file);
      } catch (err) {
        failed.push({ name: file.name, message: errorMessage(err) });
      }
    }
    setFailures(failed);
  }

  return (
    <section aria-labelledby="uploads-heading" className="mt-8">
      <div className="mb-2 flex items-center gap-3">
        <h2 id="uploads-heading" className="text-[13px] font-semibold tracking-wide text-graphite-600 uppercase">
          Data sheets and photos
        </h2>
        {mayUpload ? (
          <>
            <Button size="sm" onClick={() => input.current?.click()} pending={upload.isPending}>
              {upload.isPending ? null : <PlusIcon size={14} />} {upload.isPending ? 'Uploading…' : 'Attach files…'}
            </Button>
            <input ref={input} type="file" multiple accept={UPLOAD_ACCEPT} className="sr-only" tabIndex={-1} aria-label="Attach data sheets or photos" onChange={onPick} />
            {list.data ? <span className="text-xs text-graphite-500">PDF, JPEG, PNG or WebP, up to {formatBytes(list.data.maxBytes)} each</span> : null}
          </>
        ) : null}
      </div>
      {failures.length ? (
        <Notice signal="error" title="Not attached:" className="mb-3">
          <ul className="mt-1 space-y-0.5">
            {failures.map((f, i) => (
              <li key={i}>
                <span className="font-medium">{f.name}</span> — {f.message}
              </li>
            ))}
          </ul>
        </Notice>
      ) : null}
      {list.isPending ? (
        <LoadingRegion label="Loading attachments">
          <Skeleton className="h-32 w-48" />
        </LoadingRegion>
      ) : list.isError ? (
        <ErrorState title="Could not load attachments" error={list.error} onRetry={() => list.refetch()} retrying={list.isFetching} />
      ) : list.data.uploads.length === 0 ? (
        <EmptyState title="No data sheets or photos yet">
          {mayUpload ? 'Attach the data sheets of the parts and photos of the site: battery room, existing cabling, nameplates.' : 'Data sheets and site photos attached to this project will be listed here.'}
        </EmptyState>
      ) : (
        <ul aria-label="Data sheets and photos" className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-5">
          {list.data.uploads.map((u) => (
            <UploadCard key={u.id} upload={u} mayDelete={mayDelete(u)} onDelete={() => setDeleting(u)} />
          ))}
        </ul>
      )}
      <ConfirmDialog
        open={deleting !== null}
        onClose={() => {
          remove.reset();
          setDeleting(null);
        }}
        onConfirm={() => deleting && remove.mutate(deleting.id, { onSuccess: () => setDeleting(null) })}
        title="Delete attachment?"
        confirmLabel="Delete"
        pending={remove.isPending}
        error={remove.error}
      >
        <p>
          <strong className="font-semibold text-graphite-900">{deleting?.fileName}</strong> will be removed from this project for everyone in the team.
        </p>
      </ConfirmDialog>
    </section>
  );
}
