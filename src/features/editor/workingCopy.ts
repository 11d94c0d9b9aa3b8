/**
 * Keeping the working copy safe: autosave to the server (debounced, with the base version), a copy in
 * localStorage whenever there are changes the server has not confirmed, a restore of that copy on
 * load when it is newer, a warning when another tab edits the same diagram, and a conflict state that
 * never drops the user's edits.
 *
 * Closing the tab a moment after an edit loses nothing: the local copy is written synchronously in the
 * change itself (while that write stays cheap; a large diagram's is debounced and flushed when the page
 * hides), and when the page is hidden or left (`visibilitychange` to hidden, `pagehide`) the unsaved
 * copy is sent to the server at once with `fetch(…, { keepalive: true })`, which the browser finishes
 * after the page is gone.
 */
import { useEffect } from 'react';
import { create } from 'zustand';
import type { DiagramDocument } from '@shared/diagram';
import { ApiError, isApiError } from '@/lib/api';
import { fetchDiagram, saveWorkingCopy, type ConflictDetails, type SavedWorkingCopy } from './api';
import { parseStoredDiagram } from './loadDocument';
import { useEditorStore } from './store';

export type SaveStatus = 'saved' | 'pending' | 'saving' | 'offline' | 'conflict' | 'error';

interface SaveState {
  status: SaveStatus;
  baseVersion: number;
  lastSavedAt: string | null;
  conflict: ConflictDetails | null;
  error: string | null;
  otherTab: boolean;
  set: (patch: Partial<Omit<SaveState, 'set'>>) => void;
}

export const useSaveState = create<SaveState>()((set) => ({
  status: 'saved', baseVersion: 0, lastSavedAt: null, conflict: null, error: null, otherTab: false,
  set: (patch) => set(patch),
}));

/** Wait after the last change before saving to the server, ms. */
export const SAVE_DEBOUNCE_MS = 1000;
const LOCAL_DEBOUNCE_MS = 250;
/** A local write that took longer than this (a large diagram) is debounced from then on, ms. */
const SYNC_LOCAL_WRITE_BUDGET_MS = 4;
/**
 * Browsers cap the bodies of keepalive requests in flight at 64 KiB in all; a larger copy is left to
 * the local copy and the next open (restored with a notice).
 */
export const KEEPALIVE_MAX_BYTES = 60_000;
const RETRY_MS = 5000;
/** Tell other tabs about edits at most this often, ms. */
const EDITED_NOTICE_MS = 1000;

export interface LocalCopy {
  doc: DiagramDocument;
  baseVersion: number;
  savedAt: number;
}

export const localKey = (diagramId: string) => `bankwright:working-copy:${diagramId}`;

export function readLocalCopy(diagramId: string): LocalCopy | null {
  try {
    const raw = window.localStorage.getItem(localKey(diagramId));
    if (!raw) return null;
    const v = JSON.parse(raw) as LocalCopy;
    return v && typeof v === 'object' && v.doc && typeof v.savedAt === 'number' ? v : null;
  } catch {
    return null;
  }
}

export function writeLocalCopy(diagramId: string, copy: LocalCopy) {
  try {
    window.localStorage.setItem(localKey(diagramId), JSON.stringify(copy));
  } catch {
    /* storage full or blocked: the server copy is still the fallback */
  }
}

export function clearLocalCopy(diagramId: string) {
  try {
    window.localStorage.removeItem(localKey(diagramId));
  } catch {
    /* ignore */
  }
}

/**
 * Which copy to open: the local one when it holds unsaved changes newer than the server's copy.
 * Returns the local copy or null.
 */
export function localCopyToRestore(diagramId: string, serverUpdatedAt: string, serverContent: unknown): LocalCopy | null {
  const local = readLocalCopy(diagramId);
  if (!local) return null;
  const serverTime = Date.parse(serverUpdatedAt);
  if (Number.isFinite(serverTime) && local.savedAt <= serverTime) return null;
  if (JSON.stringify(local.doc) === JSON.stringify(serverContent)) {
    // The server has it (e.g. sent with keepalive as the tab closed): nothing left to keep here.
    clearLocalCopy(diagramId);
    return null;
  }
  return local;
}

/**
 * Send the working copy with `keepalive`, so the request outlives the page. Resolves with the saved
 * version, or rejects like the API client (ApiError for an error answer, status 0 when unreachable).
 * Returns null without sending when the body is over KEEPALIVE_MAX_BYTES.
 */
export function sendWorkingCopyKeepalive(diagramId: string, content: DiagramDocument, baseVersion: number): Promise<SavedWorkingCopy> | null {
  const body = JSON.stringify({ content, baseVersion });
  if (body.length > KEEPALIVE_MAX_BYTES) return null;
  return fetch(`/api/diagrams/${encodeURIComponent(diagramId)}/working-copy`, {
    method: 'PUT',
    headers: { Accept: 'application/json', 'Content-Type': 'application/json' },
    body,
    credentials: 'same-origin',
    keepalive: true,
  }).then(
    async (res) => {
      const data = (await res.json().catch(() => null)) as { error?: { code?: string; message?: string; details?: unknown } } | SavedWorkingCopy | null;
      if (res.ok && data && 'workingCopyVersion' in data) return data;
      const error = data && 'error' in data ? data.error : undefined;
      throw new ApiError(res.status, error?.code ?? 'http_error', error?.message ?? `The server answered ${res.status}.`, error?.details);
    },
    () => {
      throw new ApiError(0, 'network', 'The server could not be reached. Check the connection and try again.');
    },
  );
}

interface Controller {
  saveNow: () => void;
  keepMine: () => void;
  reloadTheirs: () => Promise<void>;
}

let controller: Controller | null = null;
/** Conflict choices and "save now" for the banner and toolbar. */
export const workingCopyActions = {
  saveNow: () => controller?.saveNow(),
  keepMine: () => controller?.keepMine(),
  reloadTheirs: () => controller?.reloadTheirs() ?? Promise.resolve(),
};

/**
 * Runs while the editor is open on `diagramId`. `initialDirty` starts with a save pending (after a
 * local copy was restored).
 */
export function useWorkingCopySync(diagramId: string, enabled: boolean, initialDirty: boolean) {
  useEffect(() => {
    if (!enabled) return;
    const saveState = useSaveState.getState();
    let saveTimer: ReturnType<typeof setTimeout> | undefined;
    let localTimer: ReturnType<typeof setTimeout> | undefined;
    let inFlight = false;
    /** The document the request in flight carries. */
    let inFlightDoc: DiagramDocument | null = null;
    let dirty = initialDirty;
    let lastLocalWriteMs = 0;
    let disposed = false;
    let loading = false;
    const tabId = Math.random().toString(36).slice(2);
    const channel = typeof BroadcastChannel !== 'undefined' ? new BroadcastChannel(`bankwright:diagram:${diagramId}`) : null;

    const writeLocal = () => {
      clearTimeout(localTimer);
      if (!dirty) return;
      const started = performance.now();
      writeLocalCopy(diagramId, { doc: useEditorStore.getState().doc, baseVersion: useSaveState.getState().baseVersion, savedAt: Date.now() });
      lastLocalWriteMs = performance.now() - started;
    };

    const save = async (opts: { keepalive?: boolean } = {}) => {
      clearTimeout(saveTimer);
      if (disposed || inFlight || !dirty) return;
      const st = useSaveState.getState();
      if (st.status === 'conflict') return;
      const doc = useEditorStore.getState().doc;
      const request = opts.keepalive ? sendWorkingCopyKeepalive(diagramId, doc, st.baseVersion) : saveWorkingCopy(diagramId, doc, st.baseVersion);
      if (!request) return; // too large for keepalive: the local copy holds it
      inFlight = true;
      inFlightDoc = doc;
      st.set({ status: 'saving' });
      try {
        const res = await request;
        if (disposed) return;
        const changedSince = useEditorStore.getState().doc !== doc;
        dirty = changedSince;
        useSaveState.getState().set({ baseVersion: res.workingCopyVersion, lastSavedAt: res.updatedAt, status: changedSince ? 'pending' : 'saved', error: null });
        channel?.postMessage({ type: 'saved', tabId, version: res.workingCopyVersion });
        if (changedSince) schedule();
        else clearLocalCopy(diagramId);
      } catch (err) {
        if (disposed) return;
        writeLocal();
        if (isApiError(err) && err.code === 'working_copy_conflict') {
          useSaveState.getState().set({ status: 'conflict', conflict: (err.details as ConflictDetails) ?? null });
        } else if (isApiError(err) && (err.status === 0 || err.status >= 500)) {
          useSaveState.getState().set({ status: 'offline', error: err.message });
          saveTimer = setTimeout(save, RETRY_MS);
        } else {
          useSaveState.getState().set({ status: 'error', error: isApiError(err) ? err.message : String(err) });
        }
      } finally {
        inFlight = false;
        inFlightDoc = null;
      }
    };

    /**
     * The page is being hidden or left: write the local copy now and send unsaved changes to the server
     * with keepalive. While a save is in flight, a newer copy is sent on the version that save will
     * make (when it fails, this one is refused with 409 and stores nothing; the local copy still has it).
     */
    const flush = (leaving: boolean) => {
      writeLocal();
      if (!dirty || useSaveState.getState().status === 'conflict') return;
      if (!inFlight) {
        void save({ keepalive: true });
        return;
      }
      const doc = useEditorStore.getState().doc;
      if (leaving && doc !== inFlightDoc) void sendWorkingCopyKeepalive(diagramId, doc, useSaveState.getState().baseVersion + 1)?.catch(() => {});
    };

    const schedule = () => {
      clearTimeout(saveTimer);
      saveTimer = setTimeout(save, SAVE_DEBOUNCE_MS);
    };

    let lastEditedNotice = 0;
    // Runs on every document change, each frame of a drag included: keep it to timers and flags.
    const onDocChange = () => {
      dirty = true;
      const st = useSaveState.getState();
      if (st.status !== 'conflict' && st.status !== 'offline' && st.status !== 'pending') st.set({ status: 'pending' });
      // Written in the change itself, so a tab closed a moment later keeps it; debounced only when a
      // write has become slow (a large diagram), and then flushed when the page hides.
      if (lastLocalWriteMs <= SYNC_LOCAL_WRITE_BUDGET_MS) writeLocal();
      else {
        clearTimeout(localTimer);
        localTimer = setTimeout(writeLocal, LOCAL_DEBOUNCE_MS);
      }
      const now = Date.now();
      if (now - lastEditedNotice >= EDITED_NOTICE_MS) {
        lastEditedNotice = now;
        channel?.postMessage({ type: 'edited', tabId });
      }
      if (st.status !== 'conflict') schedule();
    };

    const unsubscribe = useEditorStore.subscribe((s, prev) => {
      if (!loading && s.doc !== prev.doc && s.diagramId === diagramId && prev.diagramId === diagramId) onDocChange();
    });

    if (channel) {
      channel.onmessage = (e: MessageEvent<{ type: string; tabId: string }>) => {
        if (e.data.tabId === tabId) return;
        if (e.data.type === 'hello') channel.postMessage({ type: 'here', tabId });
        if (e.data.type === 'bye') useSaveState.getState().set({ otherTab: false });
        else useSaveState.getState().set({ otherTab: true });
      };
      channel.postMessage({ type: 'hello', tabId });
    }

    const onOnline = () => {
      if (useSaveState.getState().status === 'offline') void save();
    };
    const onUnload = () => {
      flush(true);
      channel?.postMessage({ type: 'bye', tabId });
    };
    const onVisibility = () => {
      if (document.visibilityState === 'hidden') flush(false);
    };
    window.addEventListener('online', onOnline);
    window.addEventListener('pagehide', onUnload);
    window.addEventListener('beforeunload', onUnload);
    document.addEventListener('visibilitychange', onVisibility);

    controller = {
      saveNow: () => void save(),
      keepMine: () => {
        const c = useSaveState.getState().conflict;
        useSaveState.getState().set({ status: 'pending', baseVersion: c?.workingCopyVersion ?? useSaveState.getState().baseVersion, conflict: null });
        dirty = true;
        void save();
      },
      reloadTheirs: async () => {
        const res = await fetchDiagram(diagramId);
        const parsed = parseStoredDiagram(res.diagram.content);
        clearTimeout(saveTimer);
        clearTimeout(localTimer);
        // Loading their copy is not an edit of mine: no save, no local copy.
        if (parsed.ok) {
          loading = true;
          try {
            useEditorStore.getState().load(parsed.doc, { diagramId });
          } finally {
            loading = false;
          }
        }
        dirty = false;
        clearLocalCopy(diagramId);
        useSaveState.getState().set({ status: 'saved', conflict: null, baseVersion: res.diagram.workingCopyVersion, lastSavedAt: res.diagram.updatedAt });
      },
    };

    if (initialDirty) {
      writeLocal();
      schedule();
    }
    void saveState;

    return () => {
      disposed = true;
      writeLocal();
      unsubscribe();
      clearTimeout(saveTimer);
      clearTimeout(localTimer);
      window.removeEventListener('online', onOnline);
      window.removeEventListener('pagehide', onUnload);
      window.removeEventListener('beforeunload', onUnload);
      document.removeEventListener('visibilitychange', onVisibility);
      channel?.postMessage({ type: 'bye', tabId });
      channel?.close();
      controller = null;
    };
  }, [diagramId, enabled, initialDirty]);
}
