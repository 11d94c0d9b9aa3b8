/** Editor keyboard shortcuts (listed in the help overlay). Ignored while typing in a field or inside a dialog. */
import { useEffect } from 'react';
import { useEditorStore } from './store';

export const SHORTCUTS: { keys: string; what: string }[] = [
  { keys: 'Click or Enter on a palette item', what: 'Place the part at the centre of the view' },
  { keys: 'Click, Shift+click', what: 'Select, add to the selection' },
  { keys: 'Shift+drag on the canvas', what: 'Select with a box' },
  { keys: 'Arrow keys', what: 'Move the selected parts' },
  { keys: 'Delete or Backspace', what: 'Delete the selection (and cables on deleted parts)' },
  { keys: 'Ctrl+D', what: 'Duplicate the selection' },
  { keys: 'Ctrl+C / Ctrl+V', what: 'Copy / paste (pasted parts get fresh ids)' },
  { keys: 'R', what: 'Rotate the selected parts 90°' },
  { keys: 'Ctrl+Z', what: 'Undo' },
  { keys: 'Ctrl+Shift+Z or Ctrl+Y', what: 'Redo' },
  { keys: 'Ctrl+A', what: 'Select everything' },
  { keys: 'F', what: 'Zoom to fit' },
  { keys: 'Escape', what: 'Clear the selection, close this help' },
  { keys: '?', what: 'Show or hide this help' },
];

function isTyping(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  if (!el || !el.tagName) return false;
  if (el.isContentEditable) return true;
  const tag = el.tagName;
  if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
  if (tag === 'INPUT') {
    const type = (el as HTMLInputElement).type;
    return !['checkbox', 'radio', 'button', 'submit'].includes(type);
  }
  return !!el.closest('[role="dialog"]');
}

export function useEditorShortcuts(onHelp: () => void) {
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.defaultPrevented || isTyping(e.target)) return;
      const s = useEditorStore.getState();
      const mod = e.ctrlKey || e.metaKey;
      const key = e.key.toLowerCase();
      const run = (f: () => void) => {
        e.preventDefault();
        f();
      };
      if (e.key === '?') return run(onHelp);
      if (mod && key === 'z' && !e.shiftKey) return run(s.undo);
      if ((mod && key === 'z' && e.shiftKey) || (mod && key === 'y')) return run(s.redo);
      if (mod && key === 'c') return s.selection.length ? run(s.copySelection) : undefined;
      if (mod && key === 'v') return s.clipboard ? run(() => void s.paste()) : undefined;
      if (mod && key === 'd') return run(() => void s.duplicateSelection());
      if (mod && key === 'a') return run(() => s.select([...s.doc.parts.map((p) => p.id), ...s.doc.cables.map((c) => c.id)]));
      if (mod || e.altKey) return;
      if ((e.key === 'Delete' || e.key === 'Backspace') && s.selection.length) return run(s.deleteSelection);
      if (key === 'r' && s.selection.length) return run(s.rotateSelection);
      if (key === 'f') return run(s.requestFit);
      if (e.key === 'Escape' && s.selection.length) return run(s.clearSelection);
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [onHelp]);
}
