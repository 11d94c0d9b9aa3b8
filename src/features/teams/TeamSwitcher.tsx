import { useState } from 'react';
import { useNavigate } from 'react-router';
import { Dialog } from '@/components/Dialog';
import { CheckIcon, ChevronDownIcon, PlusIcon } from '@/components/icons';
import { Menu, MenuLabel, MenuSeparator, menuItemClass } from '@/components/Menu';
import { RoleBadge } from '@/components/RoleBadge';
import type { MembershipSummary } from '../auth/api';
import { CreateTeamForm } from './CreateTeamForm';

/** Lists the user's teams with their role; choosing one opens its project list. */
export function TeamSwitcher({ teams, current }: { teams: MembershipSummary[]; current: MembershipSummary | null }) {
  const navigate = useNavigate();
  const [creating, setCreating] = useState(false);

  return (
    <div className="flex min-w-0 items-center gap-2">
      <Menu
        label={current ? `Team: ${current.name}. Switch team` : 'Choose a team'}
        buttonClassName="flex h-8 max-w-full items-center sm:max-w-64 gap-1.5 rounded-md px-2 text-sm font-medium text-graphite-50 hover:bg-graphite-800 aria-expanded:bg-graphite-800"
        button={
          <>
            <span className="truncate">{current ? current.name : 'No team'}</span>
            <ChevronDownIcon size={14} className="shrink-0 text-graphite-400" />
          </>
        }
      >
        {({ close }) => (
          <>
            <MenuLabel>Your teams</MenuLabel>
            {teams.length === 0 ? <div className="px-3 py-1.5 text-[13px] text-graphite-500">You are not in a team yet.</div> : null}
            {teams.map((team) => {
              const selected = team.id === current?.id;
              return (
                <button
                  key={team.id}
                  type="button"
                  role="menuitemradio"
                  aria-checked={selected}
                  tabIndex={-1}
                  className={menuItemClass}
                  onClick={() => {
                    close();
                    navigate(`/teams/${team.id}/projects`);
                  }}
                >
                  <span className="flex w-4 justify-center text-copper-600">{selected ? <CheckIcon size={14} /> : null}</span>
                  <span className="min-w-0 flex-1 truncate">{team.name}</span>
                  <RoleBadge role={team.role} />
                </button>
              );
            })}
            <MenuSeparator />
            <button
              type="button"
              role="menuitem"
              tabIndex={-1}
              className={menuItemClass}
              onClick={() => {
                close();
                setCreating(true);
              }}
            >
              <span className="flex w-4 justify-center text-graphite-500">
                <PlusIcon size={14} />
              </span>
              Create team…
            </button>
          </>
        )}
      </Menu>
      {current ? <RoleBadge role={current.role} onDark /> : null}
      <Dialog open={creating} onClose={() => setCreating(false)} title="Create team" description="You will be its owner and can invite your crew.">
        <CreateTeamForm onCancel={() => setCreating(false)} onCreated={() => setCreating(false)} />
      </Dialog>
    </div>
  );
}
