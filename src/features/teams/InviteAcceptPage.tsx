import { Link, useNavigate, useParams } from 'react-router';
import { ROLE_DESCRIPTIONS } from '@shared/roles';
import { Button, ButtonLink, buttonClass } from '@/components/Button';
import { Notice } from '@/components/Notice';
import { RoleBadge } from '@/components/RoleBadge';
import { ErrorState, PageLoading } from '@/components/States';
import { isApiError } from '@/lib/api';
import { formatDate } from '@/lib/format';
import { AuthLayout } from '../auth/AuthLayout';
import { useMe } from '../auth/hooks';
import { useAcceptInvite, useInvite } from './hooks';

export function InviteAcceptPage() {
  const { token = '' } = useParams();
  const me = useMe();
  const signedIn = !!me.data;
  const invite = useInvite(token, signedIn);
  const accept = useAcceptInvite();
  const navigate = useNavigate();
  const here = encodeURIComponent(`/invites/${token}`);

  if (me.isPending) return <PageLoading />;

  if (!signedIn) {
    return (
      <AuthLayout title="You have been invited" subtitle="Sign in, or create an account with the e-mail address the invite was sent to.">
        <div className="flex gap-2">
          <Link to={`/sign-in?next=${here}`} className={buttonClass('primary', 'md', 'flex-1')}>
            Sign in
          </Link>
          <Link to={`/sign-up?next=${here}`} className={buttonClass('secondary', 'md', 'flex-1')}>
            Create account
          </Link>
        </div>
      </AuthLayout>
    );
  }

  if (invite.isPending) {
    return (
      <AuthLayout title="Team invite">
        <PageLoading label="Checking the invite…" />
      </AuthLayout>
    );
  }

  if (invite.isError) {
    const gone = isApiError(invite.error) && invite.error.status === 404;
    return (
      <AuthLayout title="Team invite">
        {gone ? (
          <Notice signal="warning">This invite is unknown, has expired or was already used. Ask the team’s owner for a new one.</Notice>
        ) : (
          <ErrorState title="Could not check the invite" error={invite.error} onRetry={() => invite.refetch()} retrying={invite.isFetching} />
        )}
        <ButtonLink to="/" className="mt-4 w-full">
          Go to your projects
        </ButtonLink>
      </AuthLayout>
    );
  }

  const inv = invite.data;
  const emailMatches = inv.email.toLowerCase() === me.data!.user.email.toLowerCase();
  return (
    <AuthLayout title={`Join ${inv.teamName}`} subtitle={`Invite for ${inv.email}, valid until ${formatDate(inv.expiresAt)}.`}>
      <div className="space-y-4">
        <div className="flex items-start gap-3 rounded-md border border-graphite-200 bg-graphite-50 p-3">
          <RoleBadge role={inv.role} />
          <p className="text-[13px] text-graphite-700">{ROLE_DESCRIPTIONS[inv.role]}</p>
        </div>
        {!emailMatches ? (
          <Notice signal="warning">
            You are signed in as <span className="font-mono">{me.data!.user.email}</span>. Only {inv.email} can accept this invite.
          </Notice>
        ) : null}
        <div aria-live="assertive">{accept.error ? <Notice signal="error">{accept.error.message}</Notice> : null}</div>
        <div className="flex gap-2">
          <ButtonLink to="/" className="flex-1">
            Not now
          </ButtonLink>
          <Button
            variant="primary"
            className="flex-1"
            disabled={!emailMatches}
            pending={accept.isPending}
            onClick={() => accept.mutate(token, { onSuccess: (team) => navigate(`/teams/${team.id}/projects`, { replace: true }) })}
          >
            Accept invite
          </Button>
        </div>
      </div>
    </AuthLayout>
  );
}
