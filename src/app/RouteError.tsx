import { Fragment } from 'react';
import { isRouteErrorResponse, useRouteError } from 'react-router';
import { buttonClass } from '@/components/Button';
import { ErrorIcon, LogoMark } from '@/components/icons';
import { SafetyCaution } from '@/components/SafetyCaution';
import { NotFoundPage } from './NotFound';

/** errorElement for the router: a crash or a failed lazy load shows this, never a blank screen. */
export function RouteError({ inShell = false }: { inShell?: boolean }) {
  const error = useRouteError();
  const Wrap = inShell ? Fragment : Frame;
  if (isRouteErrorResponse(error) && error.status === 404) {
    return (
      <Wrap>
        <NotFoundPage />
      </Wrap>
    );
  }
  const detail = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : error instanceof Error ? error.message : String(error);
  return (
    <Wrap>
      <div role="alert" className="mx-auto max-w-lg py-16">
        <div className="flex items-center gap-2 text-fault-700">
          <ErrorIcon size={22} />
          <h1 className="text-lg font-semibold">Error: this screen stopped working</h1>
        </div>
        <p className="mt-2 text-sm text-graphite-700">
          Nothing you saved is lost. Reload the page to try again; if it keeps happening, tell whoever runs this Bankwright
          server what you were doing.
        </p>
        <pre className="mt-4 overflow-x-auto rounded-md border border-graphite-200 bg-white p-3 font-mono text-xs text-graphite-700">{detail}</pre>
        <div className="mt-5 flex gap-2">
          <button type="button" className={buttonClass('primary')} onClick={() => window.location.reload()}>
            Reload
          </button>
          <a href="/" className={buttonClass('secondary')}>
            Go to your projects
          </a>
        </div>
      </div>
    </Wrap>
  );
}

function Frame({ children }: { children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="flex h-12 items-center gap-2 bg-graphite-900 px-4 text-white">
        <LogoMark size={26} />
        <span className="text-[15px] font-semibold">Bankwright</span>
      </header>
      <main className="flex-1 px-4">{children}</main>
      <footer className="border-t border-graphite-200 px-4 py-2.5">
        <SafetyCaution />
      </footer>
    </div>
  );
}
