/**
 * What the sheet's title block says: project, diagram, which revision the drawing is (or that it is a
 * working copy), its review state and approver, the date and the author.
 *
 * The drawing is "revision n" only when the document on screen equals revision n's content (compared
 * as canonical JSON); anything else is a working copy and carries the "not reviewed" mark, as does any
 * revision that is not approved.
 */
import { useQuery } from '@tanstack/react-query';
import type { DiagramDocument } from '@shared/diagram';
import { REVISION_STATE_LABELS, type RevisionState } from '@shared/schemas/diagrams';
import { fetchRevision, fetchRevisions, type Person, type RevisionMeta } from '@/features/revisions/api';
import { revisionKeys } from '@/features/revisions/hooks';

export interface SheetMeta {
  projectName: string;
  diagramName: string;
  /** The revision the drawing is, or null for a working copy. */
  revision: { number: number; state: RevisionState; approvedBy: Person | null; approvedAt: string | null } | null;
  /** For a working copy: the latest saved revision, if any. */
  latestRevision: number | null;
  author: string;
  /** ISO date-time the drawing is dated by (the revision's, or now for a working copy). */
  date: string;
  /** True unless the drawing is an approved revision. */
  notReviewed: boolean;
}

/** JSON with object keys sorted, so equal documents give equal text whatever the key order. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj).filter((k) => obj[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(obj[k])}`).join(',')}}`;
}

export const reviewStateText = (m: SheetMeta): string => {
  if (!m.revision) return 'Working copy — not reviewed';
  const s = REVISION_STATE_LABELS[m.revision.state];
  return m.revision.state === 'approved' && m.revision.approvedBy ? `${s} by ${m.revision.approvedBy.name}` : s;
};

export const revisionText = (m: SheetMeta): string =>
  m.revision ? `r${m.revision.number}` : m.latestRevision ? `Working copy (changed since r${m.latestRevision})` : 'Working copy (no revision saved)';

export interface MetaInput {
  diagramId: string;
  projectName: string;
  diagramName: string;
  doc: DiagramDocument;
  /** Who last saved the working copy, or the signed-in user. */
  workingCopyAuthor: string;
}

/** The revisions list and the latest revision's content; both cached with the revision feature's keys. */
export function useSheetMeta(input: MetaInput, enabled = true): { meta: SheetMeta | null; loading: boolean } {
  const list = useQuery({
    queryKey: revisionKeys.list(input.diagramId),
    queryFn: ({ signal }) => fetchRevisions(input.diagramId, signal),
    enabled,
  });
  const latest: RevisionMeta | undefined = list.data?.reduce<RevisionMeta | undefined>((a, r) => (!a || r.number > a.number ? r : a), undefined);
  const content = useQuery({
    queryKey: revisionKeys.one(input.diagramId, latest?.number ?? 0),
    queryFn: ({ signal }) => fetchRevision(input.diagramId, latest!.number, signal),
    enabled: enabled && !!latest,
  });
  // Without revision history (an error or none yet), the drawing is a working copy.
  const loading = list.isPending && enabled || (!!latest && content.isPending);
  if (loading) return { meta: null, loading: true };
  const isLatest = !!latest && !!content.data && canonicalJson(content.data.content) === canonicalJson(input.doc);
  const base = { projectName: input.projectName, diagramName: input.diagramName };
  if (isLatest && latest) {
    return {
      loading: false,
      meta: {
        ...base,
        revision: { number: latest.number, state: latest.state, approvedBy: latest.approvedBy ?? null, approvedAt: latest.approvedAt ?? null },
        latestRevision: latest.number,
        author: latest.author?.name ?? '—',
        date: latest.createdAt,
        notReviewed: latest.state !== 'approved',
      },
    };
  }
  return {
    loading: false,
    meta: { ...base, revision: null, latestRevision: latest?.number ?? null, author: input.workingCopyAuthor, date: new Date().toISOString(), notReviewed: true },
  };
}
