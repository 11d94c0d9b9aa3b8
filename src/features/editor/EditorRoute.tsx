/**
 * /diagrams/:diagramId — the diagram editor: palette, canvas, properties and analysis tabs, live
 * results, autosaved working copy. Lazy-loaded by the router (default export).
 */
import '@xyflow/react/dist/style.css';
import './editor.css';
import { useCallback, useEffect, useState } from 'react';
import { useParams } from 'react-router';
import { useQuery } from '@tanstack/react-query';
import { ReactFlowProvider } from '@xyflow/react';
import { can, type Role } from '@shared/roles';
import type { UnitSystem } from '@shared/units';
import { ErrorState, PageLoading } from '@/components/States';
import { Notice } from '@/components/Notice';
import { isApiError } from '@/lib/api';
import { useSignedInMe } from '@/features/auth/hooks';
import { NotFoundPage } from '@/app/NotFound';
import { diagramKeys, fetchDiagram, type DiagramResponse } from './api';
import { parseStoredDiagram } from './loadDocument';
import { useEditorStore } from './store';
import { localCopyToRestore, useSaveState, useWorkingCopySync } from './workingCopy';
import { EditorLayout } from './EditorLayout';
import { effectiveUnitSystem } from '@/features/account/units';

interface Opened {
  id: string;
  restoredFrom: number | null;
  filledDefaults: boolean;
}

export default function EditorRoute() {
  const { diagramId = '' } = useParams();
  const me = useSignedInMe();
  const query = useQuery({
    queryKey: diagramKeys.detail(diagramId),
    queryFn: ({ signal }) => fetchDiagram(diagramId, signal),
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    refetchOnReconnect: false,
    retry: (n, err) => !(isApiError(err) && err.status >= 400 && err.status < 500) && n < 2,
  });
  const [opened, setOpened] = useState<Opened | null>(null);
  const [parseErrors, setParseErrors] = useState<string[] | null>(null);

  useEffect(() => {
    const data: DiagramResponse | undefined = query.data;
    if (!data || opened?.id === diagramId) return;
    const { diagram, role } = data;
    const unitSystem: UnitSystem = effectiveUnitSystem(me, diagram.teamId);
    const readOnly = !can(role as Role, 'diagram.edit');
    const local = readOnly ? null : localCopyToRestore(diagramId, diagram.updatedAt, diagram.content);
    const parsed = parseStoredDiagram(local ? local.doc : diagram.content);
    if (!parsed.ok) {
      setParseErrors(parsed.errors.map((e) => `${e.path}: ${e.message}`));
      return;
    }
    setParseErrors(null);
    useEditorStore.getState().load(parsed.doc, { diagramId, readOnly, unitSystem });
    useSaveState.getState().set({
      status: local ? 'pending' : 'saved',
      baseVersion: local ? local.baseVersion : diagram.workingCopyVersion,
      lastSavedAt: diagram.updatedAt,
      conflict: null,
      error: null,
      otherTab: false,
    });
    setOpened({ id: diagramId, restoredFrom: local ? local.savedAt : null, filledDefaults: parsed.filledDefaults });
  }, [query.data, diagramId, opened?.id, me.teams]);

  // The unit system follows a change made while the diagram is open (the user's preference or the team's).
  const liveUnits = query.data ? effectiveUnitSystem(me, query.data.diagram.teamId) : null;
  useEffect(() => {
    if (liveUnits && opened?.id === diagramId) useEditorStore.getState().setUnitSystem(liveUnits);
  }, [liveUnits, opened?.id, diagramId]);

  const ready = opened?.id === diagramId && !!query.data;
  const readOnly = useEditorStore((s) => s.readOnly);
  useWorkingCopySync(diagramId, ready && !readOnly, ready && !!opened?.restoredFrom);

  const dismissRestored = useCallback(() => setOpened((o) => (o ? { ...o, restoredFrom: null, filledDefaults: false } : o)), []);

  if (query.isError) {
    if (isApiError(query.error) && query.error.status === 404) return <NotFoundPage what="diagram" />;
    return <ErrorState title="Could not open this diagram" error={query.error} onRetry={() => query.refetch()} retrying={query.isFetching} />;
  }
  if (parseErrors) {
    return (
      <div className="max-w-2xl space-y-3">
        <h1 className="text-xl font-semibold">This diagram could not be read</h1>
        <Notice signal="error">The stored working copy is not a valid diagram document:</Notice>
        <ul className="list-disc pl-6 font-mono text-xs">
          {parseErrors.map((e) => (
            <li key={e}>{e}</li>
          ))}
        </ul>
      </div>
    );
  }
  if (!ready || !query.data) return <PageLoading label="Opening the diagram…" />;
  return (
    <ReactFlowProvider>
      <EditorLayout diagram={query.data.diagram} role={query.data.role} restoredFrom={opened!.restoredFrom} filledDefaults={opened!.filledDefaults} onDismissRestored={dismissRestored} />
    </ReactFlowProvider>
  );
}
