/** The editor's screen: toolbar, banners, palette | canvas | side panel, status bar. */
import { useCallback, useId, useRef, useState, type KeyboardEvent } from 'react';
import { Link } from 'react-router';
import { useShallow } from 'zustand/react/shallow';
import type { Role } from '@shared/roles';
import { ROLE_LABELS } from '@shared/roles';
import { Button } from '@/components/Button';
import { ChevronRightIcon, CloseIcon, ErrorIcon, FaultIcon, NoteIcon, WarningIcon } from '@/components/icons';
import { Menu, menuItemClass } from '@/components/Menu';
import { Notice } from '@/components/Notice';
import { formatDateTime } from '@/lib/format';
import { AnnotationsPanel } from '@/features/annotations/AnnotationsPanel';
import { BriefingToolbar } from '@/features/export/BriefingToolbar';
import { DiagramMenu } from '@/features/projects/DiagramMenu';
import { HowToDialog } from '@/features/help/HowToDialog';
import { RevisionStateBadge, SaveRevisionButton } from '@/features/revisions';
import { AnalysisPanel, FindingsPanel } from './analysis';
import type { DiagramRecord } from './api';
import { Canvas } from './canvas/Canvas';
import { Palette, usePartDragActive } from './Palette';
import { PropertiesPanel } from './properties/PropertiesPanel';
import { FindingCounts, ModeStatus } from './results/ModeStatus';
import { useLiveResults } from './results/useLiveResults';
import { SHORTCUTS, useEditorShortcuts } from './shortcuts';
import { selectCanRedo, selectCanUndo, useEditorStore } from './store';
import { TemplateDialog } from './TemplateDialog';
import { RequestReviewButton } from '@/features/review/RequestReviewButton';
import { useToasts } from './toasts';
import { useSaveState, workingCopyActions } from './workingCopy';
import { fmtPct, fmtVolts, fmtWatts } from './units';

const SAFETY_KEY = 'bankwright:editor-safety-dismissed';

function SafetyNote() {
  const [dismissed, setDismissed] = useState(() => {
    try {
      return window.localStorage.getItem(SAFETY_KEY) === '1';
    } catch {
      return false;
    }
  });
  if (dismissed) return null;
  return (
    <div role="note" aria-label="Safety" className="flex items-start gap-2 border-b border-caution-200 bg-caution-50 px-3 py-1.5 text-xs text-caution-700">
      <FaultIcon size={16} className="mt-px shrink-0" />
      <p className="min-w-0 flex-1">
        <strong>Safety:</strong> a battery bank can deliver thousands of amperes into a short. Put a fuse close to each battery,
        de-energize before work and use insulated tools, and follow local codes and licensed practice. Results here inform a
        design; they are not approval to install.
      </p>
      <button
        type="button"
        className="rounded p-0.5 hover:bg-caution-200/50"
        aria-label="Dismiss the safety note"
        onClick={() => {
          try {
            window.localStorage.setItem(SAFETY_KEY, '1');
          } catch {
            /* ignore */
          }
          setDismissed(true);
        }}
      >
        <CloseIcon size={14} />
      </button>
    </div>
  );
}

const SAVE_TEXT: Record<string, string> = {
  saved: 'Saved',
  pending: 'Unsaved changes',
  saving: 'Saving…',
  offline: 'Offline — kept on this device',
  conflict: 'Conflict',
  error: 'Not saved',
};

function SaveIndicator() {
  const { status, error } = useSaveState(useShallow((s) => ({ status: s.status, error: s.error })));
  const readOnly = useEditorStore((s) => s.readOnly);
  if (readOnly) return <span className="text-xs text-graphite-500">Read only</span>;
  const Icon = status === 'conflict' || status === 'error' ? ErrorIcon : status === 'offline' ? WarningIcon : null;
  return (
    <span role="status" aria-live="polite" className={`bw-save bw-save-${status}`} title={error ?? undefined}>
      {Icon ? <Icon size={13} /> : null}
      {SAVE_TEXT[status]}
    </span>
  );
}

function Banners({ restoredFrom, filledDefaults, onDismissRestored }: { restoredFrom: number | null; filledDefaults: boolean; onDismissRestored: () => void }) {
  const { status, conflict, otherTab, error } = useSaveState(useShallow((s) => ({ status: s.status, conflict: s.conflict, otherTab: s.otherTab, error: s.error })));
  const [busy, setBusy] = useState(false);
  return (
    <div className="space-y-1 empty:hidden">
      {status === 'conflict' ? (
        <div role="alert" className="flex flex-wrap items-center gap-2 border-b border-fault-200 bg-fault-50 px-3 py-2 text-[13px] text-fault-700">
          <ErrorIcon size={16} />
          <span className="min-w-0 flex-1">
            <strong>Conflict:</strong> someone else saved this working copy
            {conflict?.updatedBy ? ` (${conflict.updatedBy.name}` : ' ('}
            {conflict?.updatedAt ? `${conflict?.updatedBy ? ', ' : ''}${formatDateTime(conflict.updatedAt)})` : ')'} since you opened it. Your edits are
            kept on this device until you choose.
          </span>
          <Button
            size="sm"
            pending={busy}
            onClick={async () => {
              setBusy(true);
              try {
                await workingCopyActions.reloadTheirs();
              } finally {
                setBusy(false);
              }
            }}
          >
            Reload theirs (discard mine)
          </Button>
          <Button size="sm" variant="danger" onClick={() => workingCopyActions.keepMine()}>
            Keep mine and overwrite
          </Button>
        </div>
      ) : null}
      {status === 'error' ? (
        <Notice signal="error" className="mx-3 mt-1">
          The working copy was not saved: {error} Your edits are kept on this device.{' '}
          <button type="button" className="underline" onClick={() => workingCopyActions.saveNow()}>
            Try again
          </button>
        </Notice>
      ) : null}
      {otherTab ? (
        <Notice signal="warning" className="mx-3 mt-1">
          This diagram is also open in another tab or window of this browser. Edit in one place only; saving from both makes a conflict.
        </Notice>
      ) : null}
      {restoredFrom ? (
        <div className="mx-3 mt-1 flex items-start gap-2">
          <Notice signal="note" className="flex-1">
            Restored changes kept on this device at {formatDateTime(restoredFrom)}; they were newer than the server's copy and are being
            saved now.
          </Notice>
          <Button size="sm" variant="ghost" onClick={onDismissRestored} aria-label="Dismiss the restore notice">
            <CloseIcon size={14} />
          </Button>
        </div>
      ) : null}
      {filledDefaults && !restoredFrom ? (
        <Notice signal="note" className="mx-3 mt-1">
          This copy had no bank settings; defaults are filled in (Bank settings, with nothing selected).
        </Notice>
      ) : null}
    </div>
  );
}

function StatusBar() {
  const { results, status, nParts, nCables } = useEditorStore(
    useShallow((s) => ({ results: s.results, status: s.resultsStatus, nParts: s.doc.parts.length, nCables: s.doc.cables.length })),
  );
  const c = results?.canvas;
  const load = c ? Object.values(c.loads)[0] : undefined;
  return (
    <div className="bw-statusbar" aria-label="Results summary">
      <ModeStatus />
      <span>
        {nParts} parts · {nCables} cables
      </span>
      {status === 'computing' ? <span className="text-graphite-500">Computing…</span> : null}
      {c && c.solved ? (
        <>
          {load ? (
            <span>
              Load: <strong>{fmtVolts(load.voltage_V)}</strong>, drop {fmtPct(load.drop_pct, 2)}
            </span>
          ) : null}
          {c.imbalance_pct !== null ? (
            <span data-testid="imbalance">
              Imbalance: <strong>{fmtPct(c.imbalance_pct, 1)}</strong>
            </span>
          ) : null}
          <span>
            Loss: <strong>{fmtWatts(c.wiringLoss_W + c.internalLoss_W)}</strong> ({fmtWatts(c.wiringLoss_W)} wiring, {fmtWatts(c.internalLoss_W)} in batteries)
          </span>
        </>
      ) : null}
      {c && !c.solved && nParts > 0 ? <span className="text-graphite-600">Not solved yet: see Findings</span> : null}
      <FindingCounts />
    </div>
  );
}

type Tab = 'properties' | 'findings' | 'analysis';
const TABS: { id: Tab; label: string }[] = [
  { id: 'properties', label: 'Properties' },
  { id: 'findings', label: 'Findings' },
  { id: 'analysis', label: 'Analysis' },
];

function SidePanel() {
  const [tab, setTab] = useState<Tab>('properties');
  const base = useId();
  const refs = useRef<Record<string, HTMLButtonElement | null>>({});
  const onKeyDown = (e: KeyboardEvent) => {
    const i = TABS.findIndex((t) => t.id === tab);
    let next = -1;
    if (e.key === 'ArrowRight') next = (i + 1) % TABS.length;
    if (e.key === 'ArrowLeft') next = (i + TABS.length - 1) % TABS.length;
    if (e.key === 'Home') next = 0;
    if (e.key === 'End') next = TABS.length - 1;
    if (next >= 0) {
      e.preventDefault();
      setTab(TABS[next].id);
      refs.current[TABS[next].id]?.focus();
    }
  };
  return (
    <aside className="bw-side" aria-label="Side panel">
      <div role="tablist" aria-label="Side panel" className="bw-tabs" onKeyDown={onKeyDown}>
        {TABS.map((t) => (
          <button
            key={t.id}
            ref={(el) => {
              refs.current[t.id] = el;
            }}
            type="button"
            role="tab"
            id={`${base}-${t.id}`}
            aria-selected={tab === t.id}
            aria-controls={`${base}-${t.id}-panel`}
            tabIndex={tab === t.id ? 0 : -1}
            className="bw-tab"
            onClick={() => setTab(t.id)}
          >
            {t.label}
          </button>
        ))}
      </div>
      <div role="tabpanel" id={`${base}-${tab}-panel`} aria-labelledby={`${base}-${tab}`} className="bw-side-body" tabIndex={0}>
        {tab === 'properties' ? <PropertiesPanel /> : tab === 'findings' ? <FindingsPanel /> : <AnalysisPanel />}
      </div>
    </aside>
  );
}

function EmptyCanvas({ onTemplate }: { onTemplate: () => void }) {
  const empty = useEditorStore((s) => s.doc.parts.length === 0);
  const readOnly = useEditorStore((s) => s.readOnly);
  // Only the card's button takes the pointer, and not during a part drag: a drop anywhere reaches the canvas.
  const dragging = usePartDragActive();
  if (!empty) return null;
  return (
    <div className="pointer-events-none absolute inset-0 z-10 flex items-center justify-center">
      <div className={`pointer-events-none max-w-sm rounded-lg border border-graphite-200 bg-white/95 p-5 text-center shadow-md ${dragging ? 'opacity-40' : '[&_button]:pointer-events-auto'}`} data-testid="empty-canvas">
        <h2 className="text-[15px] font-semibold">An empty bank</h2>
        {readOnly ? (
          <p className="mt-1 text-[13px] text-graphite-600">Nothing has been drawn in this diagram yet.</p>
        ) : (
          <>
            <p className="mt-1 text-[13px] text-graphite-600">Start from a common layout, or click a part in the palette to place it here (or drag it onto the canvas).</p>
            <Button variant="primary" className="mt-3" onClick={onTemplate}>
              New from template…
            </Button>
          </>
        )}
      </div>
    </div>
  );
}

function Toasts() {
  const { toasts, dismiss } = useToasts(useShallow((s) => ({ toasts: s.toasts, dismiss: s.dismiss })));
  return (
    <div className="pointer-events-none absolute right-3 bottom-10 z-20 flex w-96 max-w-[90%] flex-col gap-2" aria-live="assertive">
      {toasts.map((t) => (
        <div key={t.id} className="pointer-events-auto flex items-start gap-1 rounded-md bg-white shadow-lg">
          <Notice signal={t.signal} className="flex-1">
            {t.text}
          </Notice>
          <button type="button" className="p-1 text-graphite-500" aria-label="Dismiss" onClick={() => dismiss(t.id)}>
            <CloseIcon size={13} />
          </button>
        </div>
      ))}
    </div>
  );
}

async function runArrange(which: 'all' | 'new') {
  const store = useEditorStore.getState();
  const ids = which === 'new' ? store.freshParts : undefined;
  if (which === 'new' && (!ids || ids.length === 0)) return;
  const { arrange } = await import('./layout');
  const positions = await arrange(store.doc, ids);
  useEditorStore.getState().edit(which === 'all' ? 'Arrange all' : 'Arrange new parts', (d) => {
    for (const p of d.parts) {
      const at = positions.get(p.id);
      if (at) p.position = at;
    }
  });
  useEditorStore.getState().clearFresh(ids);
  useEditorStore.getState().requestFit();
}

export function EditorLayout({ diagram, role, restoredFrom, filledDefaults, onDismissRestored }: {
  diagram: DiagramRecord; role: Role; restoredFrom: number | null; filledDefaults: boolean; onDismissRestored: () => void;
}) {
  const readOnly = useEditorStore((s) => s.readOnly);
  const canUndo = useEditorStore(selectCanUndo);
  const canRedo = useEditorStore(selectCanRedo);
  const freshCount = useEditorStore((s) => s.freshParts.length);
  const [templateOpen, setTemplateOpen] = useState(false);
  const [helpOpen, setHelpOpen] = useState(false);
  const [arranging, setArranging] = useState(false);
  const [baseRevision, setBaseRevision] = useState<number | null>(diagram.latestRevision?.number ?? null);
  const getContent = useCallback(() => useEditorStore.getState().doc, []);
  const toggleHelp = useCallback(() => setHelpOpen((o) => !o), []);
  useEditorShortcuts(toggleHelp);
  useLiveResults(true);
  const arrangeWith = (which: 'all' | 'new') => {
    setArranging(true);
    runArrange(which).finally(() => setArranging(false));
  };

  return (
    <div className="bw-editor">
      <div className="bw-toolbar">
        <nav aria-label="Breadcrumb" className="flex min-w-0 items-center gap-1 text-[13px]">
          <Link to={`/projects/${diagram.projectId}`} className="truncate text-graphite-600 hover:text-graphite-900 hover:underline">
            {diagram.projectName}
          </Link>
          <ChevronRightIcon size={13} className="shrink-0 text-graphite-400" />
          <h1 className="truncate font-semibold text-graphite-900">{diagram.name}</h1>
        </nav>
        {readOnly ? (
          <span className="rounded border border-graphite-300 px-1.5 py-0.5 text-[11px] font-medium text-graphite-600">
            Read only ({ROLE_LABELS[role]})
          </span>
        ) : null}
        <div className="ml-auto flex items-center gap-1">
          {!readOnly ? (
            <>
              <Button size="sm" variant="ghost" disabled={!canUndo} onClick={() => useEditorStore.getState().undo()} title="Undo (Ctrl+Z)">
                Undo
              </Button>
              <Button size="sm" variant="ghost" disabled={!canRedo} onClick={() => useEditorStore.getState().redo()} title="Redo (Ctrl+Shift+Z)">
                Redo
              </Button>
              <span className="mx-1 h-5 w-px bg-graphite-200" aria-hidden="true" />
              <Button size="sm" onClick={() => setTemplateOpen(true)}>
                New from template…
              </Button>
              <Menu label="Arrange" button={<>Arrange{arranging ? '…' : ''}</>} buttonClassName="inline-flex h-7 items-center rounded-md border border-graphite-200 bg-white px-2.5 text-[13px] font-medium hover:bg-graphite-50" align="right">
                {({ close }) => (
                  <>
                    <button type="button" role="menuitem" tabIndex={-1} className={menuItemClass} onClick={() => { close(); arrangeWith('all'); }}>
                      Arrange all
                    </button>
                    <button
                      type="button"
                      role="menuitem"
                      tabIndex={-1}
                      aria-disabled={freshCount === 0}
                      className={`${menuItemClass} aria-disabled:opacity-50`}
                      onClick={() => { close(); arrangeWith('new'); }}
                    >
                      Arrange new parts ({freshCount})
                    </button>
                  </>
                )}
              </Menu>
              <DiagramMenu diagram={diagram} />
            </>
          ) : null}
          <BriefingToolbar diagram={diagram} role={role} />
          <span className="mx-1 h-5 w-px bg-graphite-200" aria-hidden="true" />
          {diagram.latestRevision ? <RevisionStateBadge state={diagram.latestRevision.state} number={diagram.latestRevision.number} /> : null}
          <Link to={`/diagrams/${diagram.id}/history`} className="inline-flex h-7 items-center rounded-md px-2 text-[13px] font-medium text-graphite-700 hover:bg-graphite-100">
            History
          </Link>
          {!readOnly ? (
            <SaveRevisionButton diagramId={diagram.id} getContent={getContent} baseRevision={baseRevision} onSaved={(r) => setBaseRevision(r.number)} />
          ) : null}
          <RequestReviewButton diagram={diagram} role={role} />
          <Button size="sm" variant="ghost" onClick={() => useEditorStore.getState().requestFit()} title="Zoom to fit (F)">
            Fit
          </Button>
          <Button size="sm" variant="ghost" onClick={toggleHelp} title="Help: how-to and keyboard shortcuts (?)" aria-label="Help: how-to and keyboard shortcuts">
            ?
          </Button>
          <span className="mx-1 h-5 w-px bg-graphite-200" aria-hidden="true" />
          <SaveIndicator />
        </div>
      </div>
      <SafetyNote />
      <Banners restoredFrom={restoredFrom} filledDefaults={filledDefaults} onDismissRestored={onDismissRestored} />
      {readOnly ? (
        <p className="flex items-center gap-1.5 border-b border-graphite-200 bg-graphite-50 px-3 py-1 text-xs text-graphite-600">
          <NoteIcon size={13} /> Your role ({ROLE_LABELS[role]}) can view and export this diagram but not change it.
        </p>
      ) : null}
      <div className="bw-body">
        {!readOnly ? <Palette /> : null}
        <div className="relative min-w-0 flex-1">
          <Canvas />
          <AnnotationsPanel />
          <EmptyCanvas onTemplate={() => setTemplateOpen(true)} />
          <Toasts />
        </div>
        <SidePanel />
      </div>
      <StatusBar />
      <TemplateDialog open={templateOpen} onClose={() => setTemplateOpen(false)} />
      <HowToDialog open={helpOpen} onClose={() => setHelpOpen(false)} shortcuts={SHORTCUTS} />
    </div>
  );
}
