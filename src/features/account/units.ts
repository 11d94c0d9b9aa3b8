/**
 * The unit system a user's screens use: their own preference when they set one (Account), else the team's
 * (owners set it in team settings), else metric.
 */
import type { UnitSystem } from '@shared/schemas/auth';
import type { Me } from '@/features/auth/api';

export function effectiveUnitSystem(me: Pick<Me, 'teams' | 'preferences'>, teamId: string | null | undefined): UnitSystem {
  return me.preferences?.unitSystem ?? me.teams.find((t) => t.id === teamId)?.unitSystem ?? 'metric';
}

export const UNIT_SYSTEM_LABELS: Record<UnitSystem, string> = {
  metric: 'Metric (m, mm², °C)',
  us: 'US customary (ft and in, AWG and kcmil, °F)',
};
