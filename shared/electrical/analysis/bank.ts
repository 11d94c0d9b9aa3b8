/** Bank figures: nominal voltage and capacity, C-rate, inverter DC input current. */
import { batteryCells, stringMembers, type BatteryProps } from '../parts/battery';
import { inverterDcPower_W } from '../parts/loads';
import { CHEMISTRIES } from '../tables/batteries';
import type { AnalysisContext } from './context';
import type { DiagramTopology } from './topology';
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

/**
 * The bank's highest voltage in normal use, which a DC fuse must be rated for: the highest setpoint of the
 * enabled chargers, else the full-charge (absorption) voltage of its chemistry × cells at the bank's
 * voltage (units drawn in series add up: the unit's full/nominal ratio is scaled to the bank's nominal).
 * Null without batteries. One definition for the fuse-voltage rule and for sizing.
 */
export function bankChargeVoltage(topo: DiagramTopology, bankNominal_V: number | undefined, nameOf: (id: string) => string): { volts: number; how: string } | null {
  const chargers = topo.chargers.filter((c) => c.props.enabled);
  if (chargers.length) {
    const top = chargers.reduce((a, b) => (b.props.voltage_setpoint_V > a.props.voltage_setpoint_V ? b : a));
    return { volts: top.props.voltage_setpoint_V, how: `the setpoint of ${nameOf(top.id)}` };
  }
  let best: { ratio: number; full_V: number; chem: (typeof CHEMISTRIES)[keyof typeof CHEMISTRIES] } | null = null;
  for (const s of topo.sources) {
    const members: BatteryProps[] = s.type === 'battery' ? [s.props] : stringMembers(s.props);
    if (!members.length) continue;
    const nominal_V = members.reduce((t, b) => t + b.nominal_V, 0);
    const full_V = members.reduce((t, b) => t + CHEMISTRIES[b.chemistry].cellFull_V * batteryCells(b), 0);
    const ratio = full_V / nominal_V;
    if (!best || ratio > best.ratio) best = { ratio, full_V, chem: CHEMISTRIES[members[0].chemistry] };
  }
  if (!best) return null;
  const volts = bankNominal_V && bankNominal_V > 0 ? bankNominal_V * best.ratio : best.full_V;
  const cells = Math.round(volts / best.chem.cellFull_V);
  return { volts, how: `${best.chem.name} full charge, ${best.chem.cellFull_V} V per cell × ${cells} cells` };
}
