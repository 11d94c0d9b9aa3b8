import type { ReactNode } from 'react';
import { errorMessage } from '@/lib/api';
import { Button, Spinner } from './Button';
import { ErrorIcon, RefreshIcon } from './icons';

export function Skeleton({ className = '' }: { className?: string }) {
  return <div aria-hidden="true" className={`animate-shimmer rounded bg-graphite-200/70 ${className}`} />;
}

/** A labelled loading region: screen readers hear the label, sighted users see placeholders. */
export function LoadingRegion({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div role="status" aria-live="polite" aria-label={label}>
      <span className="sr-only">{label}</span>
      {children}
    </div>
  );
}

export function PageLoading({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" aria-live="polite" className="flex min-h-48 items-center justify-center gap-2 text-sm text-graphite-600">
      <Spinner />
      <span>{label}</span>
    </div>
  );
}

export function EmptyState({
  icon,
  title,
  children,
  action,
}: {
  icon?: ReactNode;
  title: string;
  children?: ReactNode;
  action?: ReactNode;
}) {
  return (
    <div className="flex flex-col items-center rounded-lg border border-dashed border-graphite-300 bg-white/60 px-6 py-12 text-center">
      {icon ? <div className="mb-3 text-graphite-400">{icon}</div> : null}
      <h2 className="text-[15px] font-semibold text-graphite-900">{title}</h2>
      {children ? <div className="mt-1 max-w-md text-sm text-graphite-600">{children}</div> : null}
      {action ? <div className="mt-4">{action}</div> : null}
    </div>
  );
}

export function ErrorState({
  title = 'Could not load this',
  error,
  onRetry,
  retrying = false,
}: {
  title?: string;
  error: unknown;
  onRetry?: () => void;
  retrying?: boolean;
}) {
  return (
    <div role="alert" className="flex items-start gap-3 rounded-lg border border-fault-200 bg-fault-50 px-4 py-4">
      <ErrorIcon size={20} className="mt-0.5 shrink-0 text-fault-600" />
      <div className="min-w-0 flex-1">
        <h2 className="text-sm font-semibold text-fault-700">Error: {title}</h2>
        <p className="mt-0.5 text-sm text-graphite-700">{errorMessage(error)}</p>
        {onRetry ? (
          <Button size="sm" className="mt-3" onClick={onRetry} pending={retrying}>
            {retrying ? null : <RefreshIcon size={14} />}
            Try again
          </Button>
        ) : null}
      </div>
    </div>
  );
}
