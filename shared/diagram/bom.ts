/**
 * Bill of materials of a diagram: what to order and cut, in the team's units (docs/bill-of-materials.md).
 *
 * Counting rules, in short:
 * - Cables are grouped by conductor size, material and insulation rating. The total is the sum of cut
 *   lengths: each cable's terminal-to-terminal length plus a cut allowance at each end (default
 *   0.05 m — a choice, common practice: a lug barrel plus trimming). A cable of length 0 is a bolted
 *   joint (e.g. a terminal fuse on a post): no conductor, no lugs. Series-string interconnects count
 *   as cables (count − 1 jumpers per string).
 * - Lugs: one crimp lug on each end of every cable longer than 0, so two per cable, of the cable's
 *   conductor size and material. An end that lands on a `lug` part is that lug (it gives the stud
 *   size); a lug part no cable end reaches is counted on its own.
 * - Fuses by class, rating, voltage and interrupting rating; one holder per fuse, its type from the
 *   class (a DC breaker needs none).
 * - Batteries by chemistry, nominal voltage, capacity and model; series strings expanded to members.
 *
 * A bill of materials is a list to check, not a design approved to install.
 */
import { CHEMISTRIES } from '../electrical/tables/batteries';
import { FUSE_CLASSES, type FuseClassId } from '../electrical/tables/fuses';
import { type BatteryProps, busbarArea_mm2, PART_TYPES, stringMembers } from '../electrical/parts';
import type { ConductorSize } from '../units/conductor';
import { type UnitSystem, formatConductor } from '../units/format';
import { mToFt, mToIn } from '../units/length';
import type { DiagramDocument, DiagramPart } from '../electrical/document/schema';

export const BOM_CATEGORIES = [
  'batteries', 'cables', 'lugs', 'fuses', 'fuse_holders', 'busbars', 'switches', 'shunts', 'chargers', 'inverters',
] as const;
export type BomCategory = (typeof BOM_CATEGORIES)[number];
export type BomUnit = 'pcs' | 'm' | 'ft';

/** The name of each category as the screen, the print view and the CSV show it. */
export const BOM_CATEGORY_LABELS: Record<BomCategory, string> = {
  batteries: 'Batteries',
  cables: 'Cables',
  lugs: 'Lugs',
  fuses: 'Fuses',
  fuse_holders: 'Fuse holders',
  busbars: 'Busbars',
  switches: 'Switches / disconnects',
  shunts: 'Shunts',
  chargers: 'Chargers',
  inverters: 'Inverters',
};

/** A diagram part or cable a line counts: its id and the label a reader knows it by. */
export interface BomPartRef {
  id: string;
  label: string;
}

/** Cut allowance added at each end of a cable by default, m (common practice: lug barrel plus trimming). */
export const DEFAULT_CUT_ALLOWANCE_PER_END_M = 0.05;

export const BOM_CAUTION =
  'Check every quantity and rating against the installed parts, the equipment makers\' instructions and local codes; ' +
  'fit a fuse close to each battery; battery banks deliver very high fault currents. This list is not an approval to install.';

export interface BomCut {
  /** Cable id (a series-string interconnect is "<string id>/j<n>"). */
  id: string;
  /** The cable's label, or where it runs ("Battery 1 (+) to Main fuse (a)") when it has none. */
  label: string;
  /** Terminal-to-terminal length and the length to cut (with the end allowances), m. */
  length_m: number;
  cut_m: number;
  /** The same in the line's unit (m or ft), rounded to 0.01 m / 0.1 ft; the cut length rounded up. */
  length: number;
  cutLength: number;
}

export interface BomLine {
  category: BomCategory;
  /** What to order, in trade terms and the team's units. */
  description: string;
  quantity: number;
  unit: BomUnit;
  /** Diagram ids (parts and cables) this line counts, in document order, each once. */
  partIds: string[];
  /** The same parts and cables with their labels (partLabels), in the same order. */
  parts: BomPartRef[];
  /** Cables only: one entry per cable, longest first. */
  cuts?: BomCut[];
}

export interface BomTotal {
  category: BomCategory;
  lines: number;
  /** Sum of the lines' quantities (pcs, or length in m / ft for cables). */
  quantity: number;
  unit: BomUnit;
}

export interface BillOfMaterials {
  unitSystem: UnitSystem;
  cutAllowancePerEnd_m: number;
  lines: BomLine[];
  totals: BomTotal[];
  caution: string;
}

export interface BomOptions {
  unitSystem: UnitSystem;
  /** Added at each end of each cable, m (default 0.05). */
  cutAllowancePerEnd_m?: number;
}

// Formatting helpers -----------------------------------------------------------------------------------

const num = (x: number) => String(Number(x.toPrecision(6)));
const roundUp = (x: number, step: number) => Math.ceil(x / step - 1e-9) * step;
const round = (x: number, step: number) => Math.round(x / step) * step;
const clean = (x: number) => Math.round(x * 1e6) / 1e6;

function smallLength(mm: number, us: UnitSystem) {
  return us === 'metric' ? `${num(mm)} mm` : `${(mToIn(mm / 1000)).toFixed(2)} in`;
}

const conductorKey = (c: ConductorSize) => `${c.system}:${c.size}`;
const materialName = (m: string) => (m === 'aluminium' ? 'aluminium' : 'copper');

function lugStudText(stud: string | undefined) {
  return stud ? `${stud} stud` : 'stud size not set';
}

const HOLDER_NAME: Record<FuseClassId, string | null> = {
  class_t: 'Class T fuse holder',
  anl: 'ANL fuse holder',
  battery_terminal: 'Battery terminal fuse mount',
  strip: 'Strip fuse holder (bolt-down base)',
  blade: 'Blade fuse holder',
  breaker_dc: null, // a breaker mounts on its own
};

// Grouping --------------------------------------------------------------------------------------------

class Lines {
  /** Groups in order of first use (the order of the lines); looked up by category, then key. */
  private groups: (BomLine & { ids: Set<string> })[] = [];
  private byCategory = new Map<BomCategory, Map<string, BomLine & { ids: Set<string> }>>();
  /** `describe` runs once per group (descriptions format sizes; keys are cheap). */
  add(category: BomCategory, key: string, describe: () => string, quantity: number, unit: BomUnit, partId: string) {
    let inCategory = this.byCategory.get(category);
    if (!inCategory) this.byCategory.set(category, (inCategory = new Map()));
    let g = inCategory.get(key);
    if (!g) {
      g = { category, description: describe(), quantity: 0, unit, partIds: [], parts: [], ids: new Set() };
      inCategory.set(key, g);
      this.groups.push(g);
    }
    g.quantity += quantity;
    if (!g.ids.has(partId)) {
      g.ids.add(partId);
      g.partIds.push(partId);
    }
    return g;
  }
  all() {
    return this.groups.slice();
  }
}

interface CableStock {
  id: string;
  label: string;
  conductor: ConductorSize;
  material: string;
  insulation_C?: number;
  length_m: number;
}

/** The bill of materials of a diagram document. */
export function billOfMaterials(doc: DiagramDocument, opts: BomOptions): BillOfMaterials {
  const us = opts.unitSystem;
  const allowance = opts.cutAllowancePerEnd_m ?? DEFAULT_CUT_ALLOWANCE_PER_END_M;
  if (!Number.isFinite(allowance) || allowance < 0) throw new RangeError('cutAllowancePerEnd_m must be 0 or more');
  const lengthUnit: BomUnit = us === 'metric' ? 'm' : 'ft';
  const toUnit = (m: number) => (us === 'metric' ? m : mToFt(m));
  const step = us === 'metric' ? 0.01 : 0.1;
  const lines = new Lines();
  const parts = new Map(doc.parts.map((p) => [p.id, p]));
  const labelOf = partLabels(doc);

  // Cables and their lugs.
  const stock: CableStock[] = [];
  for (const c of doc.cables) {
    if (c.props.length_m <= 0) continue; // bolted joint: no conductor, no lugs
    stock.push({
      id: c.id, label: labelOf(c.id), conductor: c.props.conductor, material: c.props.material,
      insulation_C: c.props.insulation_C, length_m: c.props.length_m,
    });
  }
  for (const p of doc.parts) {
    if (p.type !== 'series_string' || !p.props.interconnect) continue;
    const ic = p.props.interconnect;
    for (let i = 1; i < p.props.count; i++) {
      stock.push({ id: `${p.id}/j${i}`, label: `${labelOf(p.id)} jumper ${i}`, conductor: ic.conductor, material: ic.material, length_m: ic.length_m });
    }
  }
  const cutsByLine = new Map<BomLine, BomCut[]>();
  for (const s of stock) {
    const cut_m = s.length_m + 2 * allowance;
    const insulation = s.insulation_C === undefined ? 'insulation rating not set' : `${s.insulation_C} °C insulation`;
    const line = lines.add(
      'cables', `${conductorKey(s.conductor)}|${s.material}|${s.insulation_C ?? ''}`,
      () => `${formatConductor(s.conductor, us).text} ${materialName(s.material)} cable, ${insulation}`,
      cut_m, lengthUnit, partIdOf(s.id),
    );
    const cuts = cutsByLine.get(line) ?? [];
    cuts.push({
      id: s.id, label: s.label, length_m: s.length_m, cut_m: clean(cut_m),
      length: clean(round(toUnit(s.length_m), step)), cutLength: clean(roundUp(toUnit(cut_m), step)),
    });
    cutsByLine.set(line, cuts);
  }
  for (const [line, cuts] of cutsByLine) {
    // Longest first; equal lengths keep document order (Array.prototype.sort is stable).
    line.cuts = cuts.sort((x, y) => y.cut_m - x.cut_m);
    line.quantity = clean(roundUp(toUnit(line.quantity), us === 'metric' ? 0.1 : 1));
  }

  // Lugs: two per cable (one per end); ends that land on a lug part take its stud.
  const lugPartsReached = new Set<string>();
  const addLug = (conductor: ConductorSize | null, material: string, stud: string | undefined, partId: string) => {
    lines.add('lugs', `${conductor ? conductorKey(conductor) : '-'}|${material}|${stud ?? ''}`, () => {
      const forWhat = conductor ? `for ${formatConductor(conductor, us).text} ${materialName(material)}` : '(conductor size not set)';
      const kind = material === 'aluminium' ? 'Crimp lug (aluminium/bimetal)' : 'Crimp lug';
      return `${kind} ${forWhat}, ${lugStudText(stud)}`;
    }, 1, 'pcs', partId);
  };
  for (const c of doc.cables) {
    if (c.props.length_m <= 0) continue;
    for (const end of [c.from, c.to]) {
      const at = parts.get(end.part);
      const stud = at?.type === 'lug' ? at.props.stud : undefined;
      if (at?.type === 'lug') lugPartsReached.add(at.id);
      addLug(c.props.conductor, c.props.material, stud, c.id);
    }
  }
  for (const p of doc.parts) {
    if (p.type === 'series_string' && p.props.interconnect) {
      for (let i = 1; i < p.props.count; i++) {
        addLug(p.props.interconnect.conductor, p.props.interconnect.material, undefined, p.id);
        addLug(p.props.interconnect.conductor, p.props.interconnect.material, undefined, p.id);
      }
    }
    if (p.type === 'lug' && !lugPartsReached.has(p.id)) addLug(null, 'copper', p.props.stud, p.id);
  }

  // Everything else, part by part.
  const addBattery = (b: BatteryProps, partId: string) => {
    const model = b.model ? `, ${b.model}` : '';
    lines.add('batteries', `${b.chemistry}|${b.nominal_V}|${b.capacity_Ah}|${b.model ?? ''}`,
      () => `${CHEMISTRIES[b.chemistry].name} battery, ${num(b.nominal_V)} V, ${num(b.capacity_Ah)} Ah${model}`, 1, 'pcs', partId);
  };
  for (const p of doc.parts) addPart(p);
  function addPart(p: DiagramPart) {
    switch (p.type) {
      case 'battery':
        return addBattery(p.props, p.id);
      case 'series_string':
        for (const m of stringMembers(p.props)) addBattery(m, p.id);
        return;
      case 'fuse': {
        const f = p.props;
        const cls = FUSE_CLASSES[f.fuseClass];
        lines.add('fuses', `${f.fuseClass}|${f.rating_A}|${f.voltage_rating_V}|${f.interrupting_A}`,
          () => `${cls.name}, ${num(f.rating_A)} A, ${num(f.voltage_rating_V)} V DC, interrupting rating ${num(f.interrupting_A / 1000)} kA`, 1, 'pcs', p.id);
        const holder = HOLDER_NAME[f.fuseClass];
        if (holder) lines.add('fuse_holders', `${f.fuseClass}|${f.rating_A}`, () => `${holder} for a ${num(f.rating_A)} A fuse`, 1, 'pcs', p.id);
        return;
      }
      case 'busbar': {
        const b = p.props;
        const area = b.area_mm2 !== undefined ? `, ${num(busbarArea_mm2(b))} mm²` : '';
        const spacing = b.segmentLengths_m ? 'uneven tap spacing' : `at ${smallLength(b.tapSpacing_m * 1000, us)}`;
        lines.add('busbars', `${b.material}|${b.width_mm}|${b.thickness_mm}|${b.area_mm2 ?? ''}|${b.tapCount}|${b.tapSpacing_m}|${(b.segmentLengths_m ?? []).join(';')}|${b.rating_A}`,
          () => `${b.material === 'aluminium' ? 'Aluminium' : 'Copper'} busbar ${smallLength(b.width_mm, us)} × ${smallLength(b.thickness_mm, us)}${area}, ${b.tapCount} taps ${spacing}, ${num(b.rating_A)} A`,
          1, 'pcs', p.id);
        return;
      }
      case 'switch':
        lines.add('switches', `${p.props.rating_A}`, () => `Battery disconnect switch, ${num(p.props.rating_A)} A`, 1, 'pcs', p.id);
        return;
      case 'shunt':
        lines.add('shunts', `${p.props.rating_A}|${p.props.drop_mV}`, () => `Shunt ${num(p.props.rating_A)} A / ${num(p.props.drop_mV)} mV`, 1, 'pcs', p.id);
        return;
      case 'charger':
        lines.add('chargers', `${p.props.voltage_setpoint_V}|${p.props.current_limit_A}`,
          () => `Charger, ${num(p.props.voltage_setpoint_V)} V set point, ${num(p.props.current_limit_A)} A`, 1, 'pcs', p.id);
        return;
      case 'inverter': {
        const r = p.props.rated_W;
        lines.add('inverters', `${r ?? `load:${p.props.power_W}`}`,
          () => r !== undefined ? `Inverter, ${num(r)} W continuous` : `Inverter, rating not set (${num(p.props.power_W)} W load analysed)`, 1, 'pcs', p.id);
        return;
      }
      case 'lug': // counted with the cables above
      case 'dc_load': // the owner's equipment, not bank material
      case 'note':
        return;
    }
  }

  const all = lines.all().map(({ ids: _ids, ...l }) => ({ ...l, parts: l.partIds.map((id) => ({ id, label: labelOf(id) })) }));
  const order = new Map(BOM_CATEGORIES.map((c, i) => [c, i]));
  all.sort((a, b) => order.get(a.category)! - order.get(b.category)!); // stable: document order within a category
  const totals: BomTotal[] = [];
  for (const category of BOM_CATEGORIES) {
    const ls = all.filter((l) => l.category === category);
    if (!ls.length) continue;
    totals.push({ category, lines: ls.length, quantity: clean(ls.reduce((s, l) => s + l.quantity, 0)), unit: ls[0].unit });
  }
  return { unitSystem: us, cutAllowancePerEnd_m: allowance, lines: all, totals, caution: BOM_CAUTION };
}

/** The diagram id behind a cut: a string interconnect "<string>/j<n>" belongs to its string part. */
function partIdOf(cutId: string) {
  const slash = cutId.indexOf('/');
  return slash < 0 ? cutId : cutId.slice(0, slash);
}

const TERMINAL_TEXT: Record<string, string> = { pos: '+', neg: '−' };

/**
 * How the bill of materials names the diagram's parts and cables: a part by its label (its type's
 * name when it has none); a cable by its label, or by where it runs, "Battery 1 (+) to Main fuse (a)".
 * Unknown ids come back as they are.
 */
export function partLabels(doc: DiagramDocument): (id: string) => string {
  const partNames = new Map(doc.parts.map((p) => [p.id, (p.label ?? '').trim() || PART_TYPES[p.type].name]));
  const end = (e: { part: string; terminal: string }) => `${partNames.get(e.part) ?? e.part} (${TERMINAL_TEXT[e.terminal] ?? e.terminal})`;
  const names = new Map<string, string>(partNames);
  for (const c of doc.cables) names.set(c.id, c.label?.trim() || `${end(c.from)} to ${end(c.to)}`);
  return (id) => names.get(id) ?? id;
}
