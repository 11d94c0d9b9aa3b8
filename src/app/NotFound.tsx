import { ButtonLink } from '@/components/Button';
import { ArrowLeftIcon } from '@/components/icons';

export function NotFoundPage({ what = 'page' }: { what?: string }) {
  return (
    <div className="mx-auto max-w-md py-16 text-center">
      <p className="font-mono text-xs font-medium tracking-widest text-copper-600">404</p>
      <h1 className="mt-2 text-xl font-semibold">This {what} was not found</h1>
      <p className="mt-2 text-sm text-balance text-graphite-600">
        The link may be mistyped, or it belongs to a team you are not a member of.
      </p>
      <ButtonLink to="/" className="mt-6">
        <ArrowLeftIcon size={14} /> Back to your projects
      </ButtonLink>
    </div>
  );
}
