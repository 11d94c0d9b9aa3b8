/** Display helpers for the editor: figures and the team's unit system (shared/units does the conversions). */
import { formatArea, formatConductor, formatLengthForDrawing, conductorArea_mm2, parseConductorSize, parseLength, type ConductorSize, type UnitSystem } from '@shared/units';

export const fmtAmps = (a: number) => `${Math.abs(a) >= 100 ? a.toFixed(0) : a.toFixed(1)} A`;
export const fmtVolts = (v: number) => `${v.toFixed(2)} V`;
export const fmtPct = (p: number, digits = 0) => `${p.toFixed(digits)} %`;
export const fmtWatts = (w: number) => `${w >= 100 ? w.toFixed(0) : w.toFixed(1)} W`;

/** A conductor size short enough for a canvas label, in the team's system. */
export function shortConductor(c: ConductorSize, system: UnitSystem): string {
  if (system === 'metric') return c.system === 'mm2' ? formatConductor(c, 'metric').text : formatArea(conductorArea_mm2(c), 'metric').text;
  return c.system === 'mm2' ? formatArea(c.size, 'us').text : formatConductor(c, 'us').text;
}

export const lengthText = (m: number, system: UnitSystem) => formatLengthForDrawing(m, system);

/** Parse a typed length; a bare number is in the team's unit (m or ft). */
export const parseLengthInput = (text: string, system: UnitSystem) => parseLength(text, system === 'metric' ? 'm' : 'ft');

/** Parse a typed conductor size; a bare number is mm² for metric teams and AWG for US teams. */
export const parseConductorInput = (text: string, system: UnitSystem) => parseConductorSize(text, system === 'metric' ? 'mm2' : 'awg');
