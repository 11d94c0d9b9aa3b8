/** What each side of a compare view shows: a revision number, the server working copy, or the user's unsaved version. */
import { useMemo } from 'react';
import { parseDiagram, type DiagramDocument } from '@shared/diagram';
import type { Revision, StoredResultsSummary } from '@/features/revisions/api';
import { useDiagramInfo, useRevision } from '@/features/revisions/hooks';
import { readUnsaved } from '@/features/revisions/stash';

export type SideSpec = { kind: 'revision'; n: number } | { kind: 'working' } | { kind: 'unsaved' };

export function parseSide(raw: string | null): SideSpec | null {
  if (!raw) return null;
  if (raw === 'working') return { kind: 'working' };
  if (raw === 'unsaved') return { kind: 'unsaved' };
  return /^[1-9][0-9]{0,8}$/.test(raw) ? { kind: 'revision', n: Number(raw) } : null;
}

export const sideParam = (s: SideSpec) => (s.kind === 'revision' ? String(s.n) : s.kind);

export function sideLabel(s: SideSpec): string {
  if (s.kind === 'revision') return `r${s.n}`;
  return s.kind === 'working' ? 'Working copy' : 'Your unsaved version';
}

export interface SideData {
  spec: SideSpec;
  label: string;
  status: 'loading' | 'error' | 'ready';
  error?: unknown;
  doc?: DiagramDocument;
  revision?: Revision;
  /** The summary stored with a revision (absent for other sides). */
  stored?: StoredResultsSummary;
}

export function useSide(diagramId: string, spec: SideSpec): SideData {
  const info = useDiagramInfo(diagramId);
  const rev = useRevision(diagramId, spec.kind === 'revision' ? spec.n : null);
  const label = sideLabel(spec);
  const unsaved = useMemo(() => (spec.kind === 'unsaved' ? readUnsaved(diagramId) : null), [diagramId, spec.kind]);
  const working = useMemo(() => {
    if (spec.kind !== 'working' || !info.data) return null;
    const parsed = parseDiagram(info.data.diagram.content);
    return parsed.ok ? parsed.doc : null;
  }, [spec.kind, info.data]);

  if (spec.kind === 'revision') {
    if (rev.isPending) return { spec, label, status: 'loading' };
    if (rev.isError) return { spec, label, status: 'error', error: rev.error };
    return { spec, label, status: 'ready', doc: rev.data.content, revision: rev.data, stored: rev.data.resultsSummary };
  }
  if (spec.kind === 'unsaved') {
    if (!unsaved) return { spec, label, status: 'error', error: new Error('No unsaved version of this diagram is kept in this browser.') };
    return { spec, label, status: 'ready', doc: unsaved.content };
  }
  if (info.isPending) return { spec, label, status: 'loading' };
  if (info.isError) return { spec, label, status: 'error', error: info.error };
  if (!working) return { spec, label, status: 'error', error: new Error('The working copy is not a valid diagram document.') };
  return { spec, label, status: 'ready', doc: working };
}
