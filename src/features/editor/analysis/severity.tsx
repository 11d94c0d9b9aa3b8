/** Severity shown three ways at once: its own icon shape, a word, and a colour that only repeats them. */
import type { Severity } from '@shared/electrical';
import { ErrorIcon, NoteIcon, WarningIcon } from '@/components/icons';

export const SEVERITIES: Severity[] = ['error', 'warning', 'note'];

export const SEVERITY: Record<Severity, { word: string; plural: string; Icon: typeof ErrorIcon; text: string; box: string }> = {
  error: { word: 'Error', plural: 'Errors', Icon: ErrorIcon, text: 'text-fault-700', box: 'border-fault-200 bg-fault-50' },
  warning: { word: 'Warning', plural: 'Warnings', Icon: WarningIcon, text: 'text-caution-700', box: 'border-caution-200 bg-caution-50' },
  note: { word: 'Note', plural: 'Notes', Icon: NoteIcon, text: 'text-note-700', box: 'border-note-200 bg-note-50' },
};

export function SeverityTag({ severity, className = '' }: { severity: Severity; className?: string }) {
  const s = SEVERITY[severity];
  return (
    <span className={`inline-flex items-center gap-1 text-[11px] font-semibold ${s.text} ${className}`}>
      <s.Icon size={13} />
      {s.word}
    </span>
  );
}
