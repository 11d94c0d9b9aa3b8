import type { ReactNode } from 'react';
import { CheckIcon, ErrorIcon, NoteIcon, WarningIcon } from './icons';

export type Signal = 'error' | 'warning' | 'note' | 'success';

const styles: Record<Signal, { box: string; icon: typeof ErrorIcon; word: string }> = {
  error: { box: 'border-fault-200 bg-fault-50 text-fault-700', icon: ErrorIcon, word: 'Error' },
  warning: { box: 'border-caution-200 bg-caution-50 text-caution-700', icon: WarningIcon, word: 'Warning' },
  note: { box: 'border-note-200 bg-note-50 text-note-700', icon: NoteIcon, word: 'Note' },
  success: { box: 'border-ok-200 bg-ok-50 text-ok-700', icon: CheckIcon, word: 'Done' },
};

/**
 * A signal message: its own icon shape and a leading word carry the meaning; colour only repeats it.
 * Errors are announced with role="alert", the rest politely.
 */
export function Notice({ signal, title, children, className = '' }: { signal: Signal; title?: ReactNode; children?: ReactNode; className?: string }) {
  const s = styles[signal];
  const Icon = s.icon;
  return (
    <div
      role={signal === 'error' ? 'alert' : 'status'}
      className={`flex items-start gap-2 rounded-md border px-3 py-2 text-[13px] ${s.box} ${className}`}
    >
      <Icon size={16} className="mt-0.5 shrink-0" />
      <div className="min-w-0">
        <span className="font-semibold">{title ?? `${s.word}:`}</span> {children}
      </div>
    </div>
  );
}
