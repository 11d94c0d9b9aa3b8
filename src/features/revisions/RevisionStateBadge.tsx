/** A revision's review state as a word and a shape (never colour alone). */
import { REVISION_STATE_LABELS, type RevisionState } from '@shared/schemas/diagrams';

const TONE: Record<RevisionState, string> = {
  draft: 'border-graphite-300 bg-white text-graphite-700',
  in_review: 'border-note-200 bg-note-50 text-note-700',
  changes_requested: 'border-caution-200 bg-caution-50 text-caution-700',
  approved: 'border-ok-200 bg-ok-50 text-ok-700',
};

const DESCRIPTION: Record<RevisionState, string> = {
  draft: 'Saved, not yet sent for review',
  in_review: 'Waiting for a reviewer’s decision',
  changes_requested: 'A reviewer asked for changes; edit and save a new revision',
  approved: 'Approved by a reviewer and locked; editing continues in a new revision. A review is not approval to install.',
};

/** Shapes: draft ○ open circle, in review ◐ half, changes requested △ triangle, approved ✓ in a filled circle. */
function StateGlyph({ state }: { state: RevisionState }) {
  const common = { width: 11, height: 11, viewBox: '0 0 12 12', 'aria-hidden': true, focusable: false } as const;
  switch (state) {
    case 'draft':
      return <svg {...common}><circle cx="6" cy="6" r="4.5" fill="none" stroke="currentColor" strokeWidth="1.5" /></svg>;
    case 'in_review':
      return <svg {...common}><circle cx="6" cy="6" r="4.5" fill="none" stroke="currentColor" strokeWidth="1.5" /><path d="M6 1.5a4.5 4.5 0 0 1 0 9z" fill="currentColor" /></svg>;
    case 'changes_requested':
      return <svg {...common}><path d="M6 1.2 11 10.5H1z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" /><path d="M6 4.5v3" stroke="currentColor" strokeWidth="1.4" /></svg>;
    case 'approved':
      return <svg {...common}><circle cx="6" cy="6" r="5.5" fill="currentColor" /><path d="m3.5 6.2 1.8 1.8 3.3-3.6" fill="none" stroke="white" strokeWidth="1.5" strokeLinecap="round" /></svg>;
  }
}

export function RevisionStateBadge({ state, number, className = '' }: { state: RevisionState; number?: number; className?: string }) {
  return (
    <span
      title={DESCRIPTION[state]}
      data-state={state}
      className={`inline-flex h-5 shrink-0 items-center gap-1 rounded border px-1.5 text-[11px] font-semibold whitespace-nowrap ${TONE[state]} ${className}`}
    >
      <StateGlyph state={state} />
      {number !== undefined ? <span className="font-mono font-medium">r{number}</span> : null}
      <span>{REVISION_STATE_LABELS[state]}</span>
    </span>
  );
}
