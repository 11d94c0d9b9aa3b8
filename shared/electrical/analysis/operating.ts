/**
 * A solved network read back onto the diagram: each unit's current and share, each cable's and part's
 * current, drop and loss, the losses by kind, the bank's imbalance, and the loads' voltages and drops.
 */
import type { SolveResult } from '../network/types';
import type { AnalysisContext } from './context';
import type { CableFigures, LossKind, OperatingPoint, PartFigures, SourceFigures } from './types';

const LOSS_KINDS: LossKind[] = ['battery', 'cable', 'lug', 'fuse', 'busbar', 'switch', 'shunt', 'charger', 'other'];

function lossKind(role: string | undefined, kind: string): LossKind {
  if (kind === 'battery') return 'battery';
  if (kind === 'voltage_source') return 'charger';
  switch (role) {
    case 'cable':
    case 'jumper':
      return 'cable';
    case 'lug':
      return 'lug';
    case 'fuse':
      return 'fuse';
    case 'busbar':
      return 'busbar';
    case 'switch':
    case 'switch_open':
      return 'switch';
    case 'shunt':
      return 'shunt';
    default:
      return 'other';
  }
}

/** The wiring loss: conductors, lug joints, fuses, busbars, switches and shunts — not batteries, chargers or loads. */
export function wiringLoss_W(k: Record<LossKind, number>): number {
  return k.cable + k.lug + k.fuse + k.busbar + k.switch + k.shunt;
}

/** Finite or zero: results never carry NaN. */
const fin = (x: number) => (Number.isFinite(x) ? x : 0);

/** Current magnitude below which a bank is taken as carrying no current, A. */
const NO_CURRENT_A = 1e-6;

/**
 * Bank imbalance from each unit's current: (max − min) / mean of share / ideal share, % (see
 * OperatingPoint.imbalance_pct), and the bank current Σ I·V_nom / V_bank.
 */
export function shareImbalance(ctx: AnalysisContext, currentOf: (elementId: string) => number): { imbalance_pct: number; bankCurrent_A: number } {
  const vBank = ctx.bankNominal_V > 0 ? ctx.bankNominal_V : ctx.settings.systemVoltage_V;
  let sumIV = 0;
  let sumCV = 0;
  for (const u of ctx.units) {
    sumIV += currentOf(u.elements[0]) * u.nominal_V;
    sumCV += u.capacity_Ah * u.nominal_V;
  }
  if (!(Math.abs(sumIV) / vBank > NO_CURRENT_A) || !(sumCV > 0) || ctx.units.length < 2) return { imbalance_pct: 0, bankCurrent_A: fin(sumIV / vBank) };
  let lo = Infinity;
  let hi = -Infinity;
  let sum = 0;
  for (const u of ctx.units) {
    const r = (currentOf(u.elements[0]) * sumCV) / (sumIV * u.capacity_Ah);
    lo = Math.min(lo, r);
    hi = Math.max(hi, r);
    sum += r;
  }
  const mean = sum / ctx.units.length;
  return { imbalance_pct: mean > 0 ? fin(((hi - lo) / mean) * 100) : 0, bankCurrent_A: fin(sumIV / vBank) };
}

export function operatingPoint(ctx: AnalysisContext, sol: SolveResult): OperatingPoint {
  const I = sol.element_currents_A;
  const loss = sol.element_losses_W;
  const V = (node: string) => sol.node_voltages_V[node] ?? 0;
  const vBank = ctx.bankNominal_V > 0 ? ctx.bankNominal_V : ctx.settings.systemVoltage_V;

  const elements: OperatingPoint['elements'] = {};
  const byKind = Object.fromEntries(LOSS_KINDS.map((k) => [k, 0])) as Record<LossKind, number>;
  let total = 0;
  for (const el of ctx.network.elements) {
    if (!(el.id in I)) continue;
    const w = loss[el.id] ?? 0;
    elements[el.id] = { current_A: I[el.id], loss_W: w };
    // A load's own power is the work it does, not a loss (a resistive load's element reports it as one).
    if (ctx.loadElements.has(el.id)) continue;
    byKind[lossKind(el.role, el.kind)] += w;
    total += w;
  }

  // Units: current (all members of a string carry the same), share against the capacity-weighted ideal.
  const sources: Record<string, SourceFigures> = {};
  let sumIV = 0;
  let sumCV = 0;
  for (const u of ctx.units) {
    sumIV += (I[u.elements[0]] ?? 0) * u.nominal_V;
    sumCV += u.capacity_Ah * u.nominal_V;
  }
  const flowing = Math.abs(sumIV) / vBank > NO_CURRENT_A;
  const ratios: number[] = [];
  let referenceVoltage_V = 0;
  for (const u of ctx.units) {
    const i = I[u.elements[0]] ?? 0;
    const share = flowing ? ((i * u.nominal_V) / sumIV) * 100 : 0;
    const ideal = sumCV > 0 ? ((u.capacity_Ah * u.nominal_V) / sumCV) * 100 : 0;
    if (flowing && ideal > 0) ratios.push(share / ideal);
    const terminal = V(u.posNode) - V(u.negNode);
    if (u.nominal_V >= 0.75 * vBank) referenceVoltage_V = Math.max(referenceVoltage_V, terminal);
    sources[u.id] = {
      type: u.type,
      current_A: fin(i),
      share_pct: fin(share),
      idealShare_pct: fin(ideal),
      deviation_pp: flowing ? fin(share - ideal) : 0,
      deviation_pct: flowing && ideal > 0 ? fin(((share - ideal) / ideal) * 100) : 0,
      terminal_V: fin(terminal),
      ocv_V: u.ocv_V,
      loss_W: u.elements.reduce((s, e) => s + (loss[e] ?? 0), 0),
      nominal_V: u.nominal_V,
      capacity_Ah: u.capacity_Ah,
      cRate: fin(Math.abs(i) / u.capacity_Ah),
      maxContinuous_A: u.maxContinuous_A,
      fuses: u.fuses,
    };
  }
  if (referenceVoltage_V === 0) referenceVoltage_V = Math.max(0, ...ctx.units.map((u) => u.ocv_V));
  let imbalance_pct = 0;
  if (ratios.length >= 2) {
    const mean = ratios.reduce((s, r) => s + r, 0) / ratios.length;
    if (mean > 0) imbalance_pct = ((Math.max(...ratios) - Math.min(...ratios)) / mean) * 100;
  }

  const cables: Record<string, CableFigures> = {};
  for (const c of ctx.doc.cables) {
    const m = ctx.map.cables[c.id];
    if (!m) continue;
    const i = I[c.id] ?? 0; // the conductor element; 0 when a zero-length joint merged its ends
    const amp = ctx.ampacity_A.get(c.id) ?? null;
    const basis = ctx.ampacity.get(c.id);
    cables[c.id] = {
      current_A: fin(i),
      drop_V: fin(V(m.from_node) - V(m.to_node)),
      loss_W: m.elements.reduce((s, e) => s + (loss[e] ?? 0), 0),
      r_ohm: m.r_ohm,
      ampacity_A: amp,
      utilisation_pct: amp ? fin((Math.abs(i) / amp) * 100) : null,
      ...(basis?.limitedBy === 'insulation' ? { ampacityLimitedBy: 'insulation' as const } : {}),
      ...(basis?.note ? { ampacityColumn_C: basis.column_C, ampacityNote: basis.note } : {}),
      ...(basis ? { ampacityDerating: basis.derating } : {}),
    };
  }

  const parts: Record<string, PartFigures> = {};
  const modes = new Map<string, 'cc'>();
  for (const n of sol.notes) if (n.code === 'current_limit') for (const e of n.elements) modes.set(e, 'cc');
  for (const p of ctx.doc.parts) {
    if (p.type === 'battery' || p.type === 'series_string' || p.type === 'note') continue;
    const m = ctx.map.parts[p.id];
    if (!m) continue;
    const partLoss = m.elements.reduce((s, e) => s + (loss[e] ?? 0), 0);
    const f: PartFigures = { type: p.type, loss_W: partLoss };
    switch (p.type) {
      case 'fuse':
      case 'switch':
      case 'shunt':
      case 'lug': {
        const i = I[m.elements[0]] ?? 0;
        f.current_A = fin(i);
        if (p.type !== 'lug') {
          f.rating_A = p.props.rating_A;
          f.utilisation_pct = fin((Math.abs(i) / p.props.rating_A) * 100);
        }
        break;
      }
      case 'busbar': {
        const seg = m.elements.map((e) => Math.abs(I[e] ?? 0));
        f.maxSegmentCurrent_A = seg.length ? Math.max(...seg) : 0;
        f.rating_A = p.props.rating_A;
        f.utilisation_pct = fin((f.maxSegmentCurrent_A / p.props.rating_A) * 100);
        break;
      }
      case 'inverter':
      case 'dc_load':
      case 'charger': {
        const el = m.elements[0];
        const v = V(m.nodes.pos) - V(m.nodes.neg);
        const i = el ? I[el] ?? 0 : 0;
        f.voltage_V = fin(v);
        f.current_A = fin(i);
        f.power_W = fin(el ? sol.load_power_W?.[el] ?? sol.source_power_W[el] ?? v * i : 0);
        if (p.type === 'charger') f.chargerMode = modes.has(el) ? 'cc' : 'cv';
        else {
          f.drop_V = fin(referenceVoltage_V - v);
          f.drop_pct = fin(((referenceVoltage_V - v) / ctx.settings.systemVoltage_V) * 100);
        }
        break;
      }
    }
    parts[p.id] = f;
  }

  return {
    sources,
    parts,
    cables,
    elements,
    losses: { total_W: total, wiring_W: wiringLoss_W(byKind), byKind },
    bankCurrent_A: fin(sumIV / vBank),
    imbalance_pct: fin(imbalance_pct),
    referenceVoltage_V,
    solverNotes: sol.notes,
  };
}
