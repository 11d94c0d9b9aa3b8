import { ROLE_DESCRIPTIONS, ROLE_LABELS, type Role } from '@shared/roles';

const tone: Record<Role, string> = {
  owner: 'border-copper-300 bg-copper-50 text-copper-800',
  designer: 'border-graphite-300 bg-white text-graphite-800',
  reviewer: 'border-note-200 bg-note-50 text-note-700',
  trainer: 'border-ok-200 bg-ok-50 text-ok-700',
  viewer: 'border-graphite-200 bg-graphite-50 text-graphite-600',
};

const darkTone: Record<Role, string> = {
  owner: 'border-copper-500 bg-copper-800/40 text-copper-200',
  designer: 'border-graphite-500 bg-graphite-800 text-graphite-100',
  reviewer: 'border-graphite-500 bg-graphite-800 text-note-200',
  trainer: 'border-graphite-500 bg-graphite-800 text-ok-200',
  viewer: 'border-graphite-600 bg-graphite-800 text-graphite-300',
};

/** The role as a word (never colour alone), with its description as a tooltip. */
export function RoleBadge({ role, onDark = false, className = '' }: { role: Role; onDark?: boolean; className?: string }) {
  return (
    <span
      title={ROLE_DESCRIPTIONS[role]}
      className={`inline-flex h-5 items-center rounded border px-1.5 text-[11px] font-semibold tracking-wide uppercase ${(onDark ? darkTone : tone)[role]} ${className}`}
    >
      {ROLE_LABELS[role]}
    </span>
  );
}
