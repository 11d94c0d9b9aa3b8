/**
 * The working copy's safety nets, through workingCopy.ts's public hook and functions: autosave with the
 * base version, the 409 conflict path (edits kept, keep mine / reload theirs), offline (fetch rejects:
 * the copy stays on this device and is sent again), restoring a newer local copy on open, and the
 * warning when another tab has the same diagram open.
 */
import { act, renderHook } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import {
  KEEPALIVE_MAX_BYTES, localCopyToRestore, localKey, readLocalCopy, SAVE_DEBOUNCE_MS, useSaveState, useWorkingCopySync, workingCopyActions, writeLocalCopy,
} from '@/features/editor/workingCopy';
import { editor, resetEditor } from './flow-mocks';

const ID = 'd-test';

interface Call {
  method: string;
  url: string;
  body: { content: DiagramDocument; baseVersion: number } | null;
  keepalive: boolean;
}

/** A fetch stub answering from a queue; every call is recorded. */
function stubFetch(answer: (call: Call) => Response | Promise<Response>) {
  const calls: Call[] = [];
  const fn = vi.fn(async (url: string, init?: RequestInit) => {
    const call: Call = { method: init?.method ?? 'GET', url, body: init?.body ? JSON.parse(String(init.body)) : null, keepalive: init?.keepalive === true };
    calls.push(call);
    return answer(call);
  });
  vi.stubGlobal('fetch', fn);
  return calls;
}

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
const saved = (version: number) => json(200, { workingCopyVersion: version, updatedAt: '2031-05-02T10:00:00.000Z' });

function open(base = 3) {
  resetEditor(postToPostTemplate({ count: 2, takeOff: 'diagonal' }));
  useSaveState.getState().set({ status: 'saved', baseVersion: base, lastSavedAt: '2031-05-02T09:00:00.000Z', conflict: null, error: null, otherTab: false });
  return renderHook(() => useWorkingCopySync(ID, true, false));
}

const ambientEdit = (c: number) => act(() => editor().updateSettings({ ambient_C: c }));

beforeEach(() => {
  vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'Date'] });
  vi.setSystemTime(new Date('2031-05-02T10:00:00.000Z'));
});
afterEach(() => {
  vi.useRealTimers();
});

describe('working copy: autosave', () => {
  it('saves an edit after the pause with the base version, then takes the new version', async () => {
    const calls = stubFetch(() => saved(4));
    const hook = open(3);
    ambientEdit(41);
    expect(useSaveState.getState().status).toBe('pending');
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS - 100));
    expect(calls).toHaveLength(0);
    await act(() => vi.advanceTimersByTimeAsync(200));
    expect(calls).toHaveLength(1);
    expect(calls[0].method).toBe('PUT');
    expect(calls[0].url).toBe(`/api/diagrams/${ID}/working-copy`);
    expect(calls[0].body!.baseVersion).toBe(3);
    expect(calls[0].body!.content.settings.ambient_C).toBe(41);
    expect(useSaveState.getState()).toMatchObject({ status: 'saved', baseVersion: 4 });
    // Saved: nothing is left on this device.
    expect(readLocalCopy(ID)).toBeNull();
    hook.unmount();
  });
});

describe('working copy: 409 conflict', () => {
  const conflict = () =>
    json(409, {
      error: {
        code: 'working_copy_conflict', message: 'Someone else saved this working copy',
        details: { workingCopyVersion: 9, updatedAt: '2031-05-02T09:59:00.000Z', updatedBy: { id: 'u2', name: 'Ines Okafor' } },
      },
    });

  it('keeps my edits on this device, stops autosaving, and "keep mine" overwrites from their version', async () => {
    let answer: () => Response = conflict;
    const calls = stubFetch(() => answer());
    const hook = open(3);
    ambientEdit(42);
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS + 10));
    const st = useSaveState.getState();
    expect(st.status).toBe('conflict');
    expect(st.conflict).toMatchObject({ workingCopyVersion: 9, updatedBy: { name: 'Ines Okafor' } });
    expect(readLocalCopy(ID)?.doc.settings.ambient_C).toBe(42);

    // Further edits during the conflict are kept locally but not sent.
    ambientEdit(43);
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS * 3));
    expect(calls).toHaveLength(1);
    expect(useSaveState.getState().status).toBe('conflict');
    expect(readLocalCopy(ID)?.doc.settings.ambient_C).toBe(43);

    answer = () => saved(10);
    await act(async () => {
      workingCopyActions.keepMine();
      await vi.advanceTimersByTimeAsync(10);
    });
    expect(calls).toHaveLength(2);
    expect(calls[1].body!.baseVersion).toBe(9);
    expect(calls[1].body!.content.settings.ambient_C).toBe(43);
    expect(useSaveState.getState()).toMatchObject({ status: 'saved', baseVersion: 10, conflict: null });
    hook.unmount();
  });

  it('"reload theirs" replaces my copy with the server one and forgets the local copy', async () => {
    const theirs = postToPostTemplate({ count: 3, takeOff: 'same-end', name: 'Their bank' });
    stubFetch((call) =>
      call.method === 'PUT'
        ? conflict()
        : json(200, {
          diagram: {
            id: ID, projectId: 'p', teamId: 't', projectName: 'P', name: 'Their bank', description: '', content: theirs,
            workingCopyVersion: 9, updatedAt: '2031-05-02T09:59:00.000Z', updatedBy: { id: 'u2', name: 'Ines Okafor' },
          },
          role: 'designer',
        }),
    );
    const hook = open(3);
    ambientEdit(44);
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS + 10));
    expect(useSaveState.getState().status).toBe('conflict');
    await act(() => workingCopyActions.reloadTheirs());
    expect(editor().doc.parts.filter((p) => p.type === 'battery')).toHaveLength(3);
    expect(useSaveState.getState()).toMatchObject({ status: 'saved', baseVersion: 9, conflict: null });
    expect(window.localStorage.getItem(localKey(ID))).toBeNull();
    hook.unmount();
  });
});

describe('working copy: offline', () => {
  it('keeps the copy on this device when fetch rejects, and sends it when the server answers again', async () => {
    let online = false;
    const calls = stubFetch(() => (online ? saved(5) : Promise.reject(new TypeError('Failed to fetch'))));
    const hook = open(4);
    ambientEdit(45);
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS + 10));
    expect(useSaveState.getState().status).toBe('offline');
    const local = readLocalCopy(ID);
    expect(local?.doc.settings.ambient_C).toBe(45);
    expect(local?.baseVersion).toBe(4);

    // Still offline at the next retry; the edit made meanwhile is kept too.
    ambientEdit(46);
    await act(() => vi.advanceTimersByTimeAsync(5000));
    expect(useSaveState.getState().status).toBe('offline');
    expect(readLocalCopy(ID)?.doc.settings.ambient_C).toBe(46);

    online = true;
    await act(() => vi.advanceTimersByTimeAsync(5000));
    expect(useSaveState.getState()).toMatchObject({ status: 'saved', baseVersion: 5 });
    expect(calls.at(-1)!.body!.content.settings.ambient_C).toBe(46);
    expect(calls.at(-1)!.body!.baseVersion).toBe(4);
    expect(readLocalCopy(ID)).toBeNull();
    hook.unmount();
  });

  it('a local copy newer than the server copy and different from it is restored on open; older or equal ones are not', () => {
    const server = postToPostTemplate({ count: 2, takeOff: 'diagonal' });
    const mine = { ...server, settings: { ...server.settings, ambient_C: 47 } };
    writeLocalCopy(ID, { doc: mine, baseVersion: 6, savedAt: Date.parse('2031-05-02T10:00:00.000Z') });
    expect(localCopyToRestore(ID, '2031-05-02T09:30:00.000Z', server)?.doc.settings.ambient_C).toBe(47);
    // The server copy was saved after mine: theirs wins.
    expect(localCopyToRestore(ID, '2031-05-02T10:30:00.000Z', server)).toBeNull();
    // Same content: nothing to restore, and the copy here is dropped (the server has it).
    expect(readLocalCopy(ID)).not.toBeNull();
    expect(localCopyToRestore(ID, '2031-05-02T09:30:00.000Z', mine)).toBeNull();
    expect(readLocalCopy(ID)).toBeNull();
    // Unreadable storage is no copy.
    window.localStorage.setItem(localKey(ID), '{not json');
    expect(localCopyToRestore(ID, '2031-05-02T09:30:00.000Z', server)).toBeNull();
  });

  it('after a restore, the restored copy is saved at once against the base version it was made from', async () => {
    const calls = stubFetch(() => saved(7));
    const server = postToPostTemplate({ count: 2, takeOff: 'diagonal' });
    const mine = { ...server, settings: { ...server.settings, ambient_C: 48 } };
    writeLocalCopy(ID, { doc: mine, baseVersion: 6, savedAt: Date.now() });
    const local = localCopyToRestore(ID, '2031-05-02T09:30:00.000Z', server)!;
    resetEditor(local.doc);
    useSaveState.getState().set({ status: 'pending', baseVersion: local.baseVersion, conflict: null, error: null, otherTab: false });
    const hook = renderHook(() => useWorkingCopySync(ID, true, true));
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS + 10));
    expect(calls).toHaveLength(1);
    expect(calls[0].body).toMatchObject({ baseVersion: 6, content: { settings: { ambient_C: 48 } } });
    expect(useSaveState.getState().status).toBe('saved');
    hook.unmount();
  });
});

describe('working copy: closing the tab right after an edit', () => {
  const hide = () => {
    Object.defineProperty(document, 'visibilityState', { configurable: true, get: () => 'hidden' });
    document.dispatchEvent(new Event('visibilitychange'));
  };
  afterEach(() => {
    Object.defineProperty(document, 'visibilityState', { configurable: true, get: () => 'visible' });
  });

  it('writes the local copy in the edit itself, before any timer runs', () => {
    stubFetch(() => saved(4));
    window.localStorage.clear();
    const hook = open(3);
    ambientEdit(31);
    // No time has passed: the copy on this device already holds the edit and its base version.
    expect(readLocalCopy(ID)).toMatchObject({ baseVersion: 3, doc: { settings: { ambient_C: 31 } } });
    hook.unmount();
  });

  it('sends unsaved changes at once with keepalive when the page is hidden, and takes the new version', async () => {
    const calls = stubFetch(() => saved(4));
    const hook = open(3);
    ambientEdit(32);
    hide();
    expect(calls).toHaveLength(1);
    expect(calls[0]).toMatchObject({ method: 'PUT', keepalive: true, body: { baseVersion: 3, content: { settings: { ambient_C: 32 } } } });
    await act(() => vi.advanceTimersByTimeAsync(0));
    expect(useSaveState.getState()).toMatchObject({ status: 'saved', baseVersion: 4 });
    // The debounced save has nothing left to send.
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS + 10));
    expect(calls).toHaveLength(1);
    hook.unmount();
  });

  it('on pagehide with a save in flight, sends the newer copy on the version that save makes', async () => {
    let answer: (r: Response) => void = () => {};
    const calls = stubFetch((call) => (call.keepalive ? saved(6) : new Promise<Response>((resolve) => (answer = resolve))));
    const hook = open(4);
    ambientEdit(33);
    await act(() => vi.advanceTimersByTimeAsync(SAVE_DEBOUNCE_MS + 10));
    expect(calls).toHaveLength(1); // the autosave, not answered yet
    ambientEdit(34);
    window.dispatchEvent(new Event('pagehide'));
    expect(calls).toHaveLength(2);
    expect(calls[1]).toMatchObject({ keepalive: true, body: { baseVersion: 5, content: { settings: { ambient_C: 34 } } } });
    expect(readLocalCopy(ID)?.doc.settings.ambient_C).toBe(34);
    answer(saved(5));
    hook.unmount();
  });

  it('leaves a copy too large for keepalive to the local copy (nothing sent on hide)', async () => {
    const calls = stubFetch(() => saved(4));
    const hook = open(3);
    act(() => editor().updateSettings({ ambient_C: 35 }));
    act(() => editor().edit('Long name', (d) => { d.name = 'x'.repeat(KEEPALIVE_MAX_BYTES); }));
    hide();
    expect(calls).toHaveLength(0);
    expect(readLocalCopy(ID)?.doc.name).toHaveLength(KEEPALIVE_MAX_BYTES);
    hook.unmount();
  });
});

describe('working copy: a second tab', () => {
  it('warns when another tab of this browser opens the same diagram, and clears when it closes', async () => {
    stubFetch(() => saved(4));
    const other = new BroadcastChannel(`bankwright:diagram:${ID}`);
    const heard: { type: string }[] = [];
    other.onmessage = (e: MessageEvent<{ type: string }>) => heard.push(e.data);
    const hook = open(3);
    const delivered = () => new Promise((r) => setImmediate(r));
    await act(delivered);
    // This tab said hello on opening.
    expect(heard.map((m) => m.type)).toContain('hello');
    expect(useSaveState.getState().otherTab).toBe(false);

    other.postMessage({ type: 'hello', tabId: 'tab-2' });
    await act(delivered);
    expect(useSaveState.getState().otherTab).toBe(true);
    // …and answered so the other tab warns too.
    expect(heard.map((m) => m.type)).toContain('here');

    other.postMessage({ type: 'bye', tabId: 'tab-2' });
    await act(delivered);
    expect(useSaveState.getState().otherTab).toBe(false);

    // An edit in another tab warns as well.
    other.postMessage({ type: 'edited', tabId: 'tab-2' });
    await act(delivered);
    expect(useSaveState.getState().otherTab).toBe(true);
    hook.unmount();
    await act(delivered);
    expect(heard.map((m) => m.type).at(-1)).toBe('bye');
    other.close();
  });

  it('another diagram open in another tab is no warning', async () => {
    stubFetch(() => saved(4));
    const other = new BroadcastChannel('bankwright:diagram:some-other-diagram');
    const hook = open(3);
    other.postMessage({ type: 'hello', tabId: 'tab-2' });
    await act(() => new Promise((r) => setImmediate(r)));
    expect(useSaveState.getState().otherTab).toBe(false);
    hook.unmount();
    other.close();
  });
});
