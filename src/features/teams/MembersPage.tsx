import { useState } from 'react';
import { useNavigate } from 'react-router';
import { ROLES, ROLE_DESCRIPTIONS, ROLE_LABELS, can, type Role } from '@shared/roles';
import { Button } from '@/components/Button';
import { ConfirmDialog } from '@/components/ConfirmDialog';
import { MailIcon, TrashIcon, UsersIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { RoleBadge } from '@/components/RoleBadge';
import { EmptyState, ErrorState, LoadingRegion, Skeleton } from '@/components/States';
import { errorMessage } from '@/lib/api';
import { formatDate } from '@/lib/format';
import { useSignedInMe } from '../auth/hooks';
import type { Invite, Member } from './api';
import { useChangeRole, useCurrentTeam, useMembers, useRemoveMember, useRevokeInvite } from './hooks';
import { InviteForm } from './InviteForm';
import { TeamSettings } from './TeamSettings';

export function MembersPage() {
  const { team } = useCurrentTeam();
  const current = team!;
  const me = useSignedInMe();
  const members = useMembers(current.id);
  const manage = can(current.role, 'team.manage');

  return (
    <>
      <PageHeader
        eyebrow={current.name}
        title="Members"
        description={manage ? 'Invite people by e-mail, set what each may do, or remove them.' : 'Who is in this team and what each may do. Owners manage members.'}
      />
      <div className={manage ? 'grid items-start gap-6 lg:grid-cols-[1fr_20rem]' : ''}>
        <div className="min-w-0 space-y-6">
          {members.isPending ? (
            <LoadingRegion label="Loading members">
              <div className="space-y-px overflow-hidden rounded-lg border border-graphite-200 bg-white">
                {[0, 1, 2].map((i) => (
                  <div key={i} className="flex items-center gap-4 px-4 py-3">
                    <Skeleton className="h-3.5 w-40" />
                    <Skeleton className="h-3 w-48" />
                    <Skeleton className="ml-auto h-5 w-16" />
                  </div>
                ))}
              </div>
            </LoadingRegion>
          ) : members.isError ? (
            <ErrorState title="Could not load members" error={members.error} onRetry={() => members.refetch()} retrying={members.isFetching} />
          ) : (
            <>
              <MemberTable teamId={current.id} members={members.data.members} manage={manage} myUserId={me.user.id} />
              {manage ? <InviteTable teamId={current.id} invites={members.data.invites} /> : null}
            </>
          )}
        </div>
        {manage ? (
          <div className="space-y-6">
            <aside aria-labelledby="invite-heading" className="rounded-lg border border-graphite-200 bg-white p-4 shadow-xs">
              <h2 id="invite-heading" className="mb-3 flex items-center gap-2 text-sm font-semibold">
                <MailIcon size={16} className="text-copper-600" /> Invite by e-mail
              </h2>
              <InviteForm teamId={current.id} />
            </aside>
            <section aria-labelledby="team-settings-heading" className="rounded-lg border border-graphite-200 bg-white p-4 shadow-xs">
              <h2 id="team-settings-heading" className="mb-3 text-sm font-semibold">
                Team settings
              </h2>
              <TeamSettings key={current.id} team={current} manage />
            </section>
          </div>
        ) : null}
      </div>
      {!manage ? (
        <section aria-label="Team settings" className="mt-6">
          <TeamSettings team={current} manage={false} />
        </section>
      ) : null}
      {!manage ? <RoleLegend /> : null}
    </>
  );
}

function RoleLegend() {
  return (
    <dl className="mt-6 grid gap-x-6 gap-y-2 text-[13px] sm:grid-cols-2">
      {ROLES.map((role) => (
        <div key={role} className="flex items-baseline gap-2">
          <dt className="w-20 shrink-0">
            <RoleBadge role={role} />
          </dt>
          <dd className="text-graphite-600">{ROLE_DESCRIPTIONS[role]}</dd>
        </div>
      ))}
    </dl>
  );
}

function MemberTable({ teamId, members, manage, myUserId }: { teamId: string; members: Member[]; manage: boolean; myUserId: string }) {
  const changeRole = useChangeRole(teamId);
  const remove = useRemoveMember(teamId);
  const navigate = useNavigate();
  const [removing, setRemoving] = useState<Member | null>(null);
  const leaving = removing?.userId === myUserId;

  return (
    <section aria-labelledby="members-heading">
      <h2 id="members-heading" className="mb-2 text-[13px] font-semibold tracking-wide text-graphite-600 uppercase">
        {members.length} {members.length === 1 ? 'member' : 'members'}
      </h2>
      {changeRole.error ? (
        <Notice signal="error" className="mb-3">
          {errorMessage(changeRole.error)}
        </Notice>
      ) : null}
      <div className="overflow-x-auto rounded-lg border border-graphite-200 bg-white shadow-xs">
        <table className="w-full text-left text-[13px]">
          <thead className="border-b border-graphite-200 bg-graphite-50 text-xs text-graphite-600">
            <tr>
              <th scope="col" className="px-4 py-2 font-medium">Name</th>
              <th scope="col" className="px-4 py-2 font-medium">E-mail</th>
              <th scope="col" className="px-4 py-2 font-medium">Joined</th>
              <th scope="col" className="px-4 py-2 font-medium">Role</th>
              <th scope="col" className="px-4 py-2"><span className="sr-only">Actions</span></th>
            </tr>
          </thead>
          <tbody className="divide-y divide-graphite-100">
            {members.map((m) => (
              <tr key={m.userId}>
                <td className="px-4 py-2.5 font-medium text-graphite-950">
                  {m.name}
                  {m.userId === myUserId ? <span className="ml-1.5 text-xs font-normal text-graphite-500">(you)</span> : null}
                </td>
                <td className="px-4 py-2.5 font-mono text-xs text-graphite-600">{m.email}</td>
                <td className="px-4 py-2.5 text-graphite-600">{formatDate(m.joinedAt)}</td>
                <td className="px-4 py-2">
                  {manage ? (
                    <select
                      aria-label={`Role of ${m.name}`}
                      value={m.role}
                      disabled={changeRole.isPending}
                      onChange={(e) => changeRole.mutate({ userId: m.userId, role: e.target.value as Role })}
                      className="h-7 rounded-md border border-graphite-300 bg-white px-1.5 text-[13px]"
                    >
                      {ROLES.map((r) => (
                        <option key={r} value={r}>
                          {ROLE_LABELS[r]}
                        </option>
                      ))}
                    </select>
                  ) : (
                    <RoleBadge role={m.role} />
                  )}
                </td>
                <td className="px-4 py-2 text-right">
                  {manage || m.userId === myUserId ? (
                    <Button size="sm" variant="ghost" onClick={() => setRemoving(m)} aria-label={m.userId === myUserId ? 'Leave team' : `Remove ${m.name}`}>
                      {m.userId === myUserId ? 'Leave' : <TrashIcon size={14} />}
                    </Button>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <ConfirmDialog
        open={!!removing}
        onClose={() => {
          remove.reset();
          setRemoving(null);
        }}
        onConfirm={() =>
          removing &&
          remove.mutate(removing.userId, {
            onSuccess: () => {
              setRemoving(null);
              if (leaving) navigate('/', { replace: true });
            },
          })
        }
        title={leaving ? 'Leave this team?' : `Remove ${removing?.name ?? ''}?`}
        confirmLabel={leaving ? 'Leave team' : 'Remove member'}
        pending={remove.isPending}
        error={remove.error}
      >
        <p>
          {leaving
            ? 'You will lose access to this team’s projects until an owner invites you again.'
            : `${removing?.name ?? ''} will lose access to this team’s projects. Their past work stays.`}
        </p>
      </ConfirmDialog>
    </section>
  );
}

function InviteTable({ teamId, invites }: { teamId: string; invites: Invite[] }) {
  const revoke = useRevokeInvite(teamId);
  return (
    <section aria-labelledby="invites-heading">
      <h2 id="invites-heading" className="mb-2 text-[13px] font-semibold tracking-wide text-graphite-600 uppercase">
        Pending invites
      </h2>
      {revoke.error ? (
        <Notice signal="error" className="mb-3">
          {errorMessage(revoke.error)}
        </Notice>
      ) : null}
      {invites.length === 0 ? (
        <EmptyState icon={<UsersIcon size={24} />} title="No pending invites">
          Invites you send appear here until they are accepted or expire.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-graphite-100 rounded-lg border border-graphite-200 bg-white shadow-xs">
          {invites.map((inv) => (
            <li key={inv.id} className="flex flex-wrap items-center gap-3 px-4 py-2.5 text-[13px]">
              <span className="min-w-0 flex-1 truncate font-mono text-xs">{inv.email}</span>
              <RoleBadge role={inv.role} />
              <span className="text-xs text-graphite-500">Expires {formatDate(inv.expiresAt)}</span>
              <Button size="sm" variant="ghost" onClick={() => revoke.mutate(inv.id)} disabled={revoke.isPending} aria-label={`Revoke invite for ${inv.email}`}>
                Revoke
              </Button>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

