/** Small hand-built diagrams for the analysis tests (invented values, SI). */
import { type DiagramDocument, type DiagramDocumentInput, diagramSchema } from '../../../shared/diagram';
import { batteryDefaults, type BatteryProps, type CableRunProps } from '../../../shared/electrical/parts';

export const end = (part: string, terminal: string) => ({ part, terminal });

/** Solid copper run of `mm2` and `length_m` (resistance by hand: 0.017241 Ω·mm²/m × (1 + 0.00393 (T − 20)) × L / A, IEC 60028). */
export const run = (mm2: number, length_m: number, extra: Partial<CableRunProps> = {}) =>
  ({ conductor: { system: 'mm2', size: mm2 }, length_m, stranding: 'solid', ...extra }) as CableRunProps;

/** Hand-computed resistance of `run(mm2, L)` at `temp_C` (IEC 60028 annealed copper). */
export const runOhm = (mm2: number, length_m: number, temp_C = 30) => (0.017241 * (1 + 0.00393 * (temp_C - 20)) * length_m) / mm2;

export const battery = (id: string, x: number, props: Partial<BatteryProps> = {}) => ({
  id, type: 'battery' as const, position: { x, y: 0 }, props: { ...batteryDefaults(), ...props },
});
export const currentLoad = (id: string, amps: number) => ({ id, type: 'dc_load' as const, position: { x: 900, y: 0 }, props: { mode: 'current' as const, current_A: amps } });

export function diagram(parts: DiagramDocumentInput['parts'], cables: DiagramDocumentInput['cables'], settings: Record<string, unknown> = {}): DiagramDocument {
  return diagramSchema.parse({ formatVersion: 1, settings: { systemVoltage_V: 12, ...settings }, parts, cables });
}

/**
 * N batteries post to post with `jumper` runs between neighbouring posts, main leads from battery
 * `posTap` / `negTap` to a constant-current load.
 */
export function ladder(n: number, o: { r_ohm?: number; jumperMm2?: number; jumper_m?: number; posTap?: number; negTap?: number; load_A?: number } = {}) {
  const parts: DiagramDocumentInput['parts'] = [];
  const cables: DiagramDocumentInput['cables'] = [];
  for (let k = 1; k <= n; k++) parts.push(battery(`b${k}`, k * 200, { r_internal_ohm: o.r_ohm ?? 0.004 }));
  for (let k = 1; k < n; k++) {
    cables.push({ id: `jp${k}`, from: end(`b${k}`, 'pos'), to: end(`b${k + 1}`, 'pos'), props: run(o.jumperMm2 ?? 50, o.jumper_m ?? 0.3, { role: 'jumper' }) });
    cables.push({ id: `jn${k}`, from: end(`b${k}`, 'neg'), to: end(`b${k + 1}`, 'neg'), props: run(o.jumperMm2 ?? 50, o.jumper_m ?? 0.3, { role: 'jumper' }) });
  }
  parts.push(currentLoad('load', o.load_A ?? 100));
  cables.push({ id: 'lead-pos', from: end(`b${o.posTap ?? 1}`, 'pos'), to: end('load', 'pos'), props: run(70, 2) });
  cables.push({ id: 'lead-neg', from: end(`b${o.negTap ?? 1}`, 'neg'), to: end('load', 'neg'), props: run(70, 2) });
  return diagram(parts, cables);
}
