import type { ReactNode } from 'react';

export function PageHeader({ title, eyebrow, description, actions }: { title: ReactNode; eyebrow?: ReactNode; description?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-5 flex flex-wrap items-end justify-between gap-3">
      <div className="min-w-0">
        {eyebrow ? <div className="mb-1 text-xs font-medium text-graphite-500">{eyebrow}</div> : null}
        <h1 className="truncate text-xl font-semibold tracking-tight text-graphite-950">{title}</h1>
        {description ? <div className="mt-1 text-sm text-graphite-600">{description}</div> : null}
      </div>
      {actions ? <div className="flex items-center gap-2">{actions}</div> : null}
    </div>
  );
}
