/** Team settings on the Members page: the team's unit system (owners change it; others see it). */
import { useState } from 'react';
import type { UnitSystem } from '@shared/schemas/auth';
import { Button } from '@/components/Button';
import { SelectField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { errorMessage } from '@/lib/api';
import { UNIT_SYSTEM_LABELS } from '../account/units';
import { useSignedInMe } from '../auth/hooks';
import type { MembershipSummary } from '../auth/api';
import { useUpdateTeam } from './hooks';

export function TeamSettings({ team, manage }: { team: MembershipSummary; manage: boolean }) {
  const me = useSignedInMe();
  const update = useUpdateTeam(team.id);
  const [choice, setChoice] = useState<UnitSystem>(team.unitSystem);
  const own = me.preferences?.unitSystem ?? null;
  const ownNote = own && own !== team.unitSystem ? (
    <p className="mt-2 text-xs text-graphite-600">Your own screens use {own === 'us' ? 'US customary' : 'metric'} units (set in Account).</p>
  ) : null;
  if (!manage) {
    return (
      <div className="text-[13px] text-graphite-700">
        <p>
          Units: <strong>{UNIT_SYSTEM_LABELS[team.unitSystem]}</strong>. Owners change this; you may set your own in Account.
        </p>
        {ownNote}
      </div>
    );
  }
  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        update.mutate({ unitSystem: choice });
      }}
    >
      <SelectField
        label="Units"
        name="unitSystem"
        value={choice}
        onChange={(e) => setChoice(e.target.value as UnitSystem)}
        hint="Canvas labels, properties, findings, bills of materials and exports use these units for every member who has not chosen their own."
      >
        <option value="metric">{UNIT_SYSTEM_LABELS.metric}</option>
        <option value="us">{UNIT_SYSTEM_LABELS.us}</option>
      </SelectField>
      {update.isError ? <Notice signal="error">{errorMessage(update.error)}</Notice> : null}
      {update.isSuccess && !update.isPending && choice === team.unitSystem ? (
        <p role="status" className="text-xs text-graphite-600">
          Saved: the team works in {team.unitSystem === 'us' ? 'US customary' : 'metric'} units.
        </p>
      ) : null}
      <Button type="submit" size="sm" pending={update.isPending} disabled={choice === team.unitSystem}>
        Save team units
      </Button>
      {ownNote}
    </form>
  );
}
