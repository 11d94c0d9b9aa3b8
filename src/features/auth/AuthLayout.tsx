import type { ReactNode } from 'react';
import { LogoMark } from '@/components/icons';
import { SafetyCaution } from '@/components/SafetyCaution';

export function AuthLayout({ title, subtitle, children, footer }: { title: string; subtitle?: ReactNode; children: ReactNode; footer?: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col bg-graphite-900 bg-[radial-gradient(circle_at_30%_0%,var(--color-graphite-700),transparent_60%)]">
      <main className="flex flex-1 items-start justify-center px-4 pt-[10vh] pb-10">
        <div className="w-full max-w-sm">
          <div className="mb-6 flex items-center gap-2.5 text-white">
            <LogoMark size={34} />
            <span className="text-lg font-semibold tracking-tight">Bankwright</span>
          </div>
          <div className="rounded-lg border border-graphite-700 bg-white p-6 shadow-2xl">
            <h1 className="text-lg font-semibold text-graphite-950">{title}</h1>
            {subtitle ? <p className="mt-1 text-[13px] text-graphite-600">{subtitle}</p> : null}
            <div className="mt-5">{children}</div>
          </div>
          {footer ? <div className="mt-4 text-center text-[13px] text-graphite-300">{footer}</div> : null}
        </div>
      </main>
      <footer className="border-t border-graphite-800 px-4 py-3">
        <SafetyCaution onDark className="mx-auto max-w-3xl justify-center" />
      </footer>
    </div>
  );
}

/** Only same-site paths are followed after sign-in. */
export function safeNext(next: string | null): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return '/';
  return next;
}
