/**
 * /teams/:teamId/library — the team parts library: presets of batteries, cables, fuses and busbars
 * offered in the editor's palette. Every member reads; owners and designers add, edit, delete and
 * import. CSV export for everyone. Lazy-loaded by the router (default export).
 */
import { useState } from 'react';
import { useParams } from 'react-router';
import { can } from '@shared/roles';
import { LIBRARY_KINDS, type LibraryKind } from '@shared/library';
import { LIBRARY_KIND_LABELS, type LibraryRecord } from '@shared/schemas/library';
import { Button, buttonClass } from '@/components/Button';
import { ConfirmDialog } from '@/components/ConfirmDialog';
import { PencilIcon, PlusIcon, TrashIcon } from '@/components/icons';
import { PageHeader } from '@/components/PageHeader';
import { EmptyState, ErrorState, LoadingRegion, Skeleton } from '@/components/States';
import { formatDate, plural } from '@/lib/format';
import { useCurrentTeam } from '@/features/teams/hooks';
import { exportUrl } from './api';
import { useDeleteLibraryItem, useLibrary } from './hooks';
import { ImportDialog } from './ImportDialog';
import { ItemDialog } from './ItemDialog';
import { itemSummary } from './summary';

const KIND_PLURALS: Record<LibraryKind, string> = { battery: 'Batteries', cable: 'Cables', fuse: 'Fuses', busbar: 'Busbars' };

function KindTable({ kind, items, mayEdit, onEdit, onDelete }: { kind: LibraryKind; items: LibraryRecord[]; mayEdit: boolean; onEdit: (i: LibraryRecord) => void; onDelete: (i: LibraryRecord) => void }) {
  const headingId = `library-${kind}`;
  return (
    <section aria-labelledby={headingId} className="mb-6">
      <h2 id={headingId} className="mb-2 text-[13px] font-semibold tracking-wide text-graphite-600 uppercase">
        {KIND_PLURALS[kind]} <span className="font-normal text-graphite-600">({items.length})</span>
      </h2>
      <div className="overflow-x-auto rounded-lg border border-graphite-200 bg-white shadow-xs">
        <table className="w-full min-w-3xl table-fixed text-left text-[13px]" aria-labelledby={headingId}>
          <thead className="border-b border-graphite-200 bg-graphite-50 text-xs text-graphite-600">
            <tr>
              <th scope="col" className="w-[22%] px-3 py-2 font-semibold">Name</th>
              <th scope="col" className="w-[20%] px-3 py-2 font-semibold">Maker / part number</th>
              <th scope="col" className="px-3 py-2 font-semibold">Ratings</th>
              <th scope="col" className="w-44 px-3 py-2 font-semibold">Updated</th>
              {mayEdit ? <th scope="col" className="w-20 px-3 py-2"><span className="sr-only">Actions</span></th> : null}
            </tr>
          </thead>
          <tbody>
            {items.map((item) => (
              <tr key={item.id} className="border-t border-graphite-100 first:border-t-0">
                <td className="truncate px-3 py-2 font-medium text-graphite-900" title={item.name}>{item.name}</td>
                <td className="truncate px-3 py-2 text-graphite-600">
                  {item.manufacturer || '—'}
                  {item.partNumber ? <span className="ml-1 font-mono text-xs text-graphite-500">{item.partNumber}</span> : null}
                </td>
                <td className="px-3 py-2 font-mono text-xs text-graphite-700">{itemSummary(item)}</td>
                <td className="truncate px-3 py-2 text-xs text-graphite-500">
                  {formatDate(item.updatedAt)}
                  {item.updatedBy ? `, ${item.updatedBy.name}` : ''}
                </td>
                {mayEdit ? (
                  <td className="px-2 py-1 text-right whitespace-nowrap">
                    <Button size="sm" variant="ghost" onClick={() => onEdit(item)} aria-label={`Edit ${item.name}`} title="Edit">
                      <PencilIcon size={14} />
                    </Button>
                    <Button size="sm" variant="ghost" onClick={() => onDelete(item)} aria-label={`Delete ${item.name}`} title="Delete">
                      <TrashIcon size={14} />
                    </Button>
                  </td>
                ) : null}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}

export default function LibraryPage() {
  const { teamId = '' } = useParams();
  const { team } = useCurrentTeam();
  const library = useLibrary(teamId);
  const remove = useDeleteLibraryItem(teamId);
  const mayEdit = can(team?.role, 'project.edit');
  const [editing, setEditing] = useState<LibraryRecord | 'new' | null>(null);
  const [importing, setImporting] = useState(false);
  const [deleting, setDeleting] = useState<LibraryRecord | null>(null);
  const items = library.data ?? [];

  return (
    <>
      <PageHeader
        eyebrow={team?.name}
        title="Parts library"
        description="Team presets of batteries, cables, fuses and busbars, offered in the editor's palette. Check each preset against the part's own marked ratings."
        actions={
          <>
            <a href={exportUrl(teamId)} download className={buttonClass('secondary')}>
              Export CSV
            </a>
            {mayEdit ? (
              <>
                <Button onClick={() => setImporting(true)}>Import CSV…</Button>
                <Button variant="primary" onClick={() => setEditing('new')}>
                  <PlusIcon size={14} /> Add part
                </Button>
              </>
            ) : null}
          </>
        }
      />
      {library.isPending ? (
        <LoadingRegion label="Loading the parts library">
          <Skeleton className="h-40 w-full" />
        </LoadingRegion>
      ) : library.isError ? (
        <ErrorState title="Could not load the parts library" error={library.error} onRetry={() => library.refetch()} retrying={library.isFetching} />
      ) : items.length === 0 ? (
        <EmptyState title="The library is empty">
          {mayEdit ? 'Add the batteries, cables, fuses and busbars your crew fits, or import them from a CSV file.' : 'Owners and designers add the team’s presets here.'}
        </EmptyState>
      ) : (
        <>
          <p className="mb-3 text-xs text-graphite-500">{plural(items.length, 'preset')}</p>
          {LIBRARY_KINDS.map((kind) => {
            const ofKind = items.filter((i) => i.kind === kind);
            return ofKind.length ? <KindTable key={kind} kind={kind} items={ofKind} mayEdit={mayEdit} onEdit={setEditing} onDelete={setDeleting} /> : null;
          })}
        </>
      )}
      {editing ? <ItemDialog key={editing === 'new' ? 'new' : editing.id} teamId={teamId} item={editing === 'new' ? null : editing} open onClose={() => setEditing(null)} /> : null}
      {mayEdit ? <ImportDialog teamId={teamId} open={importing} onClose={() => setImporting(false)} /> : null}
      <ConfirmDialog
        open={deleting !== null}
        onClose={() => {
          remove.reset();
          setDeleting(null);
        }}
        onConfirm={() => deleting && remove.mutate(deleting.id, { onSuccess: () => setDeleting(null) })}
        title="Delete from the library?"
        confirmLabel="Delete"
        pending={remove.isPending}
        error={remove.error}
      >
        <p>
          <strong className="font-semibold text-graphite-900">{deleting?.name}</strong> ({deleting ? LIBRARY_KIND_LABELS[deleting.kind].toLowerCase() : ''}) will be removed from the
          team library. Diagrams that already use it keep their copy.
        </p>
      </ConfirmDialog>
    </>
  );
}
