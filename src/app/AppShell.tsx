import { Link, NavLink, Navigate, Outlet, useLocation, useNavigate } from 'react-router';
import { can } from '@shared/roles';
import { FolderIcon, InboxIcon, LogoMark, SignOutIcon, UserIcon, UsersIcon } from '@/components/icons';
import { Menu, MenuSeparator, menuItemClass } from '@/components/Menu';
import { SafetyCaution } from '@/components/SafetyCaution';
import { ErrorState, PageLoading } from '@/components/States';
import { SignedInMeContext, useMe, useSignOut, useSignedInMe } from '@/features/auth/hooks';
import { useCurrentTeam } from '@/features/teams/hooks';
import { TeamSwitcher } from '@/features/teams/TeamSwitcher';
import { CreateTeamForm } from '@/features/teams/CreateTeamForm';
import { NotificationsMenu } from '@/features/home/NotificationsMenu';
import { NotFoundPage } from './NotFound';

function LibraryIcon() {
  return (
    <svg width={14} height={14} viewBox="0 0 16 16" fill="none" stroke="currentColor" strokeWidth={1.5} strokeLinecap="round" aria-hidden="true" focusable="false">
      <rect x="2" y="2.5" width="3" height="11" rx="0.5" />
      <rect x="6.5" y="2.5" width="3" height="11" rx="0.5" />
      <path d="m11 3.2 2.8-.7 1.7 10.7-2.8.6z" />
    </svg>
  );
}

/** Everything behind sign-in: waits for /api/auth/me, sends signed-out visitors to /sign-in. */
export function RequireAuth() {
  const me = useMe();
  const location = useLocation();
  if (me.isPending) {
    return (
      <div className="min-h-screen bg-paper">
        <div className="h-12 bg-graphite-900" />
        <PageLoading label="Loading your workspace…" />
      </div>
    );
  }
  if (me.isError) {
    return (
      <div className="mx-auto max-w-lg px-4 pt-[15vh]">
        <ErrorState title="Could not reach Bankwright" error={me.error} onRetry={() => me.refetch()} retrying={me.isFetching} />
      </div>
    );
  }
  if (!me.data) {
    const next = location.pathname + location.search;
    return <Navigate to={next === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(next)}`} replace />;
  }
  return (
    <SignedInMeContext.Provider value={me.data}>
      <Outlet />
    </SignedInMeContext.Provider>
  );
}

const navClass = ({ isActive }: { isActive: boolean }) =>
  `flex h-8 items-center gap-1.5 rounded-md px-2.5 text-[13px] font-medium ${
    isActive ? 'bg-graphite-800 text-white shadow-[inset_0_-2px_0_var(--color-copper-400)]' : 'text-graphite-300 hover:bg-graphite-800 hover:text-white'
  }`;

function AccountMenu() {
  const me = useSignedInMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const initials = me.user.name
    .split(/\s+/)
    .filter(Boolean)
    .slice(0, 2)
    .map((w) => w[0]!.toUpperCase())
    .join('');
  return (
    <Menu
      label={`Account: ${me.user.name}`}
      align="right"
      buttonClassName="flex h-8 items-center gap-2 rounded-md pr-2 pl-1 text-[13px] text-graphite-200 hover:bg-graphite-800 aria-expanded:bg-graphite-800"
      button={
        <>
          {/* Initials drawn by CSS, so the button's visible text is the name its label carries. */}
          <span
            aria-hidden="true"
            data-initials={initials}
            className="flex size-6 items-center justify-center rounded bg-graphite-700 text-[11px] font-semibold text-copper-200 before:content-[attr(data-initials)]"
          >
            {initials ? null : <UserIcon size={14} />}
          </span>
          <span className="hidden max-w-40 truncate sm:inline">{me.user.name}</span>
        </>
      }
    >
      {({ close }) => (
        <>
          <div role="presentation" className="px-3 pt-1.5 pb-2">
            <div className="truncate text-[13px] font-medium">{me.user.name}</div>
            <div className="truncate font-mono text-xs text-graphite-500">{me.user.email}</div>
          </div>
          <MenuSeparator />
          <Link to="/account" role="menuitem" tabIndex={-1} className={menuItemClass} onClick={close}>
            <UserIcon size={14} className="text-graphite-500" /> Account and sessions
          </Link>
          <button
            type="button"
            role="menuitem"
            tabIndex={-1}
            className={menuItemClass}
            onClick={() => {
              close();
              signOut.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) });
            }}
          >
            <SignOutIcon size={14} className="text-graphite-500" /> Sign out
          </button>
        </>
      )}
    </Menu>
  );
}

/** Header, page and the standing safety caution. */
export function AppShell() {
  const me = useSignedInMe();
  const { team } = useCurrentTeam();
  const { pathname } = useLocation();
  // Without a mail server every member reads their own captured mail; owners also the team's whole outbox.
  const showOutbox = !!team && me.mailMode === 'outbox';
  const teamOutbox = !!team && can(team.role, 'outbox.read');
  return (
    <div className="flex min-h-screen flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:fixed focus:top-2 focus:left-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="on-dark sticky top-0 z-30 border-b border-graphite-950 bg-graphite-900 text-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-3 gap-y-1 px-4 py-2 md:h-12 md:flex-nowrap md:py-0">
          <Link to="/" className="flex items-center gap-2 rounded-md pr-1" aria-label="Bankwright home">
            <LogoMark size={26} />
            <span className="hidden text-[15px] font-semibold tracking-tight md:inline">Bankwright</span>
          </Link>
          <span className="hidden h-5 w-px bg-graphite-700 sm:block" aria-hidden="true" />
          <TeamSwitcher teams={me.teams} current={team} />
          {team ? (
            <nav aria-label="Team" className="order-last -mx-2 flex w-full items-center gap-1 overflow-x-auto md:order-none md:mx-0 md:ml-2 md:w-auto">
              <NavLink
                to={`/teams/${team.id}/projects`}
                className={({ isActive }) => navClass({ isActive: isActive || pathname.startsWith('/projects/') || pathname.startsWith('/diagrams/') })}
              >
                <FolderIcon size={14} /> Projects
              </NavLink>
              <NavLink to={`/teams/${team.id}/library`} className={navClass}>
                <LibraryIcon /> Parts library
              </NavLink>
              <NavLink to={`/teams/${team.id}/members`} className={navClass}>
                <UsersIcon size={14} /> Members
              </NavLink>
              {showOutbox ? (
                <NavLink to={`/teams/${team.id}/outbox`} className={navClass}>
                  <InboxIcon size={14} /> {teamOutbox ? 'Outbox' : 'Your mail'}
                </NavLink>
              ) : null}
            </nav>
          ) : null}
          <div className="ml-auto flex items-center gap-2">
            {me.demo ? (
              <span className="hidden rounded border border-caution-600/60 px-1.5 py-0.5 text-[11px] font-semibold tracking-wide text-caution-200 uppercase lg:inline">
                Demo data
              </span>
            ) : null}
            <NotificationsMenu />
            <AccountMenu />
          </div>
        </div>
      </header>
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-6">
        <Outlet />
      </main>
      <footer className="border-t border-graphite-200 bg-white/70">
        <div className="mx-auto max-w-7xl px-4 py-2.5">
          <SafetyCaution />
        </div>
      </footer>
    </div>
  );
}

/** `/`: the current team's projects (with the work waiting for the user on top), or the first-team screen. */
export function HomeRedirect() {
  const { team } = useCurrentTeam();
  if (team) return <Navigate to={`/teams/${team.id}/projects`} replace />;
  return <NoTeamScreen />;
}

function NoTeamScreen() {
  return (
    <div className="mx-auto max-w-md pt-6">
      <h1 className="text-xl font-semibold">Create your first team</h1>
      <p className="mt-1 text-sm text-graphite-600">
        Projects and diagrams belong to a team. Create one for your crew, or open the invite link someone sent you to join
        theirs.
      </p>
      <div className="mt-5 rounded-lg border border-graphite-200 bg-white p-5 shadow-xs">
        <CreateTeamForm />
      </div>
    </div>
  );
}

/** /teams/:teamId/*: only teams the user belongs to; anything else is "not found". */
export function TeamScope() {
  const { urlTeamUnknown } = useCurrentTeam();
  if (urlTeamUnknown) return <NotFoundPage what="team" />;
  return <Outlet />;
}


