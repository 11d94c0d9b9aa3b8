/** Bank figures: nominal voltage and capacity, C-rate, inverter DC input current. */
import { inverterDcPower_W } from '../parts/loads';
import type { AnalysisContext } from './context';
import type { BankFigures, OperatingPoint } from './types';

/** Inverter DC input current, A: I_dc = P_ac / (V_dc × efficiency) (first principles). */
export function inverterDcCurrent_A(power_W: number, dc_V: number, efficiency: number): number {
  if (!(dc_V > 0) || !(efficiency > 0)) return 0;
  return power_W / (dc_V * efficiency);
}

/**
 * Nominal voltage across the load (series adds volts) and the energy-equivalent capacity at that
 * voltage: Σ C·V_nom / V_bank over the units (parallel adds amp-hours).
 */
export function bankFigures(ctx: AnalysisContext, load: OperatingPoint | null): BankFigures {
  const nominal_V = ctx.bankNominal_V;
  const energy_Wh = ctx.units.reduce((s, u) => s + u.capacity_Ah * u.nominal_V, 0);
  const capacity_Ah = nominal_V > 0 ? energy_Wh / nominal_V : 0;
  const inverters: BankFigures['inverters'] = {};
  for (const p of ctx.topo.loads) {
    if (p.type !== 'inverter') continue;
    inverters[p.id] = {
      power_W: p.props.power_W,
      efficiency: p.props.efficiency,
      dcCurrentAtNominal_A: inverterDcCurrent_A(p.props.power_W, nominal_V, p.props.efficiency),
      dcCurrentAtSystemVoltage_A: inverterDcCurrent_A(p.props.power_W, ctx.settings.systemVoltage_V, p.props.efficiency),
    };
  }
  return {
    nominal_V,
    capacity_Ah,
    energy_Wh,
    units: ctx.units.length,
    systemVoltage_V: ctx.settings.systemVoltage_V,
    inverters,
    cRate: load && capacity_Ah > 0 ? Math.abs(load.bankCurrent_A) / capacity_Ah : null,
  };
}

/** DC input power of every inverter, W (for sizing at full power). */
export function inverterDcPowers_W(ctx: AnalysisContext): { id: string; actual_W: number; rated_W: number }[] {
  return ctx.topo.loads.flatMap((p) =>
    p.type === 'inverter'
      ? [{ id: p.id, actual_W: inverterDcPower_W(p.props), rated_W: (p.props.rated_W ?? p.props.power_W) / p.props.efficiency }]
      : [],
  );
}
