/**
 * Starting diagrams: complete, valid documents for the common bank layouts, laid out left to right.
 * Every template is a starting point to edit, not a design approved to install.
 */
import {
  type BatteryProps, type CableRunProps, type FuseProps, batteryDefaults, cableRunDefaults, fuseDefaults,
  inverterDefaults, busbarDefaults, type InverterProps, batteryCells,
} from '../electrical/parts';
import { CHEMISTRIES } from '../electrical/tables/batteries';
import { nextStandardRating } from '../electrical/tables/fuses';
import { ampacity } from '../electrical/tables/ampacity';
import { AWG_SIZES, KCMIL_SIZES } from '../units/conductor';
import type { ConductorSize } from '../units/conductor';
import {
  DIAGRAM_FORMAT_VERSION, type DiagramCable, type DiagramDocument, type DiagramDocumentInput, type DiagramPart,
  diagramSchema,
} from '../electrical/document/schema';

const PITCH = 200; // canvas units between neighbouring batteries

type PartInput = Omit<DiagramPart, 'label' | 'rotation'> & { label?: string; rotation?: 0 | 90 | 180 | 270 };

class Builder {
  parts: PartInput[] = [];
  cables: DiagramCable[] = [];
  part<P extends PartInput>(p: P): P {
    this.parts.push(p);
    return p;
  }
  cable(id: string, from: [string, string], to: [string, string], props: CableRunProps, label?: string) {
    this.cables.push({ id, from: { part: from[0], terminal: from[1] }, to: { part: to[0], terminal: to[1] }, props, ...(label ? { label } : {}) });
  }
  build(name: string, systemVoltage_V: number): DiagramDocument {
    const input: DiagramDocumentInput = {
      formatVersion: DIAGRAM_FORMAT_VERSION,
      name,
      settings: { systemVoltage_V },
      parts: this.parts as DiagramDocumentInput['parts'],
      cables: this.cables,
      annotations: [],
    };
    return diagramSchema.parse(input);
  }
}

const run = (conductor: ConductorSize, length_m: number, role: 'cable' | 'jumper' = 'cable'): CableRunProps => ({
  ...cableRunDefaults(), conductor, length_m, role,
});

export interface CommonTemplateOptions {
  battery?: BatteryProps;
  /**
   * Conductor of every cable; by default each cable is the smallest size whose NEC 310.16 75 °C
   * ampacity covers the fuse protecting it.
   */
  conductor?: ConductorSize;
  /** Length of each main cable between the bank and the load, m (default 2). */
  mainCable_m?: number;
  /** The load: an inverter (default 2 kW, 90 %). */
  inverter?: InverterProps;
  /** Main fuse on the positive take-off (default Class T at the next standard rating over 1.25 × the inverter's current); null for none. */
  mainFuse?: FuseProps | null;
  name?: string;
}

export type TakeOff = 'same-end' | 'diagonal' | 'inner';

export interface PostToPostOptions extends CommonTemplateOptions {
  count: number;
  takeOff: TakeOff;
  /** For 'inner': 1-based index of the battery whose positive, and of the one whose negative, feed the load. */
  takeOffIndices?: { pos: number; neg: number };
  /** Jumper conductor and length between neighbouring posts; default the main conductor, 0.3 m. */
  jumper?: { conductor?: ConductorSize; length_m?: number };
}

function nominalOf(b: BatteryProps) {
  return b.nominal_V;
}

/** The default 2 kW inverter with its low-voltage cut-off at the batteries' cut-off voltage. */
function inverterFor(b: BatteryProps, seriesCount: number): InverterProps {
  const cutoff = CHEMISTRIES[b.chemistry].cellCutoff_V * batteryCells(b) * seriesCount;
  return { ...inverterDefaults(), cutoff_V: Math.round(cutoff * 10) / 10 };
}

/** Design margin used to size template fuses over the expected current (common practice 1.25). */
const DESIGN_MARGIN = 1.25;

/** Inverter DC input current at the bank's nominal voltage, A (first principles: P / (V × efficiency)). */
function inverterCurrent_A(inv: InverterProps, bankNominal_V: number) {
  return inv.power_W / (bankNominal_V * inv.efficiency);
}

/** A Class T fuse at the next standard rating over margin × current (NEC 240.6(A)). */
function fuseFor(current_A: number): FuseProps {
  return fuseDefaults('class_t', nextStandardRating(current_A * DESIGN_MARGIN) ?? 6000);
}

/**
 * The smallest copper size whose NEC 310.16 75 °C ampacity (30 °C, free air) is at least `amps`, so
 * the fuse protects the cable (NEC 240.4); 2/0 AWG when nothing in the table is large enough.
 */
export function conductorFor(amps: number): ConductorSize {
  const sizes: ConductorSize[] = [
    ...AWG_SIZES.map((size) => ({ system: 'awg', size }) as ConductorSize),
    ...KCMIL_SIZES.map((size) => ({ system: 'kcmil', size }) as ConductorSize),
  ];
  for (const size of sizes) {
    const a = ampacity({ size, table: 'nec-310.16-75C' });
    if (a.ok && a.amps >= amps) return size;
  }
  return { system: 'awg', size: '2/0' };
}

function addLoad(bld: Builder, x: number, opts: CommonTemplateOptions & { inverter: InverterProps }, bankNominal_V: number, posFeed: [string, string], negFeed: [string, string]) {
  const main = opts.mainCable_m ?? 2;
  const fuse = opts.mainFuse === undefined ? fuseFor(inverterCurrent_A(opts.inverter, bankNominal_V)) : opts.mainFuse;
  const conductor = opts.conductor ?? conductorFor(fuse ? fuse.rating_A : inverterCurrent_A(opts.inverter, bankNominal_V) * DESIGN_MARGIN);
  bld.part({ id: 'inverter', type: 'inverter', label: 'Inverter', position: { x: x + PITCH, y: 0 }, props: opts.inverter });
  if (fuse) {
    bld.part({ id: 'main-fuse', type: 'fuse', label: 'Main fuse', position: { x, y: -120 }, props: fuse });
    bld.cable('c-main-fuse', posFeed, ['main-fuse', 'a'], run(conductor, 0.15), 'Battery to main fuse');
    bld.cable('c-main-pos', ['main-fuse', 'b'], ['inverter', 'pos'], run(conductor, main), 'Main positive');
  } else {
    bld.cable('c-main-pos', posFeed, ['inverter', 'pos'], run(conductor, main), 'Main positive');
  }
  bld.cable('c-main-neg', negFeed, ['inverter', 'neg'], run(conductor, main), 'Main negative');
}

/** N batteries joined post to post by jumpers, with the take-off at the chosen batteries. */
export function postToPostTemplate(opts: PostToPostOptions): DiagramDocument {
  const n = opts.count;
  if (!Number.isInteger(n) || n < 1 || n > 64) throw new RangeError('count must be a whole number from 1 to 64');
  const battery = opts.battery ?? batteryDefaults();
  const inverter = opts.inverter ?? inverterFor(battery, 1);
  // Jumpers carry up to the whole load current next to the take-off; size them like the main cable.
  const jumperConductor = opts.jumper?.conductor ?? opts.conductor ?? conductorFor(inverterCurrent_A(inverter, battery.nominal_V) * DESIGN_MARGIN);
  const jumperLength = opts.jumper?.length_m ?? 0.3;
  const bld = new Builder();
  for (let i = 1; i <= n; i++) {
    bld.part({ id: `bat${i}`, type: 'battery', label: `Battery ${i}`, position: { x: (i - 1) * PITCH, y: 0 }, props: battery });
  }
  for (let i = 1; i < n; i++) {
    bld.cable(`j-pos-${i}`, [`bat${i}`, 'pos'], [`bat${i + 1}`, 'pos'], run(jumperConductor, jumperLength, 'jumper'));
    bld.cable(`j-neg-${i}`, [`bat${i}`, 'neg'], [`bat${i + 1}`, 'neg'], run(jumperConductor, jumperLength, 'jumper'));
  }
  let pos = 1;
  let neg = 1;
  if (opts.takeOff === 'diagonal') neg = n;
  if (opts.takeOff === 'inner') {
    if (!opts.takeOffIndices) throw new RangeError("takeOff 'inner' needs takeOffIndices");
    ({ pos, neg } = opts.takeOffIndices);
    for (const k of [pos, neg]) if (!Number.isInteger(k) || k < 1 || k > n) throw new RangeError(`take-off index ${k} is outside 1..${n}`);
  }
  addLoad(bld, n * PITCH, { ...opts, inverter }, battery.nominal_V, [`bat${pos}`, 'pos'], [`bat${neg}`, 'neg']);
  return bld.build(opts.name ?? `${n} batteries post to post (${opts.takeOff})`, systemVoltageFor(nominalOf(battery)));
}

export interface BusbarBankOptions extends CommonTemplateOptions {
  count: number;
  /** Length of every battery-to-busbar cable, m (equal on purpose; default 1). */
  batteryCable_m?: number;
  /** A fuse at each battery's positive (default Class T over 1.25 × its equal share); null for none. */
  batteryFuse?: FuseProps | null;
}

/** N batteries on a positive and a negative busbar with equal cables; the load from the busbars' last taps. */
export function busbarBankTemplate(opts: BusbarBankOptions): DiagramDocument {
  const n = opts.count;
  if (!Number.isInteger(n) || n < 1 || n > 63) throw new RangeError('count must be a whole number from 1 to 63');
  const battery = opts.battery ?? batteryDefaults();
  const inverter = opts.inverter ?? inverterFor(battery, 1);
  const share_A = inverterCurrent_A(inverter, battery.nominal_V) / n;
  const len = opts.batteryCable_m ?? 1;
  const batteryFuse = opts.batteryFuse === undefined ? fuseFor(share_A) : opts.batteryFuse;
  const conductor = opts.conductor ?? conductorFor(batteryFuse ? batteryFuse.rating_A : share_A * DESIGN_MARGIN);
  const bld = new Builder();
  const bus = { ...busbarDefaults(), tapCount: n + 1 };
  bld.part({ id: 'bus-pos', type: 'busbar', label: 'Positive busbar', position: { x: 0, y: -300 }, props: bus });
  bld.part({ id: 'bus-neg', type: 'busbar', label: 'Negative busbar', position: { x: 0, y: 300 }, props: bus });
  addStrings(bld, n, len, conductor, batteryFuse, (i) => ({
    id: `bat${i}`, type: 'battery', label: `Battery ${i}`, position: { x: (i - 1) * PITCH, y: 0 }, props: battery,
  }));
  addLoad(bld, n * PITCH, { ...opts, conductor: opts.conductor, inverter }, battery.nominal_V, ['bus-pos', `t${n + 1}`], ['bus-neg', `t${n + 1}`]);
  return bld.build(opts.name ?? `${n} batteries on busbars`, systemVoltageFor(nominalOf(battery)));
}

function addStrings(
  bld: Builder, n: number, len: number, conductor: ConductorSize, fuse: FuseProps | null,
  makeSource: (i: number) => PartInput,
) {
  for (let i = 1; i <= n; i++) {
    const src = bld.part(makeSource(i));
    if (fuse) {
      bld.part({ id: `fuse${i}`, type: 'fuse', label: `Fuse ${i}`, position: { x: (i - 1) * PITCH, y: -150 }, props: fuse });
      bld.cable(`c-fuse${i}`, [src.id, 'pos'], [`fuse${i}`, 'a'], run(conductor, 0.15));
      bld.cable(`c-pos${i}`, [`fuse${i}`, 'b'], ['bus-pos', `t${i}`], run(conductor, len));
    } else {
      bld.cable(`c-pos${i}`, [src.id, 'pos'], ['bus-pos', `t${i}`], run(conductor, len));
    }
    bld.cable(`c-neg${i}`, [src.id, 'neg'], ['bus-neg', `t${i}`], run(conductor, len));
  }
}

export interface SeriesParallelOptions extends CommonTemplateOptions {
  /** Batteries in series per string (e.g. 4 for 48 V from 12.8 V batteries). */
  seriesCount: number;
  /** Strings in parallel. */
  parallelCount: number;
  /** Length of each string-to-busbar cable, m (default 1). */
  stringCable_m?: number;
  /** A fuse at each string's positive (default Class T over 1.25 × its equal share); null for none. */
  stringFuse?: FuseProps | null;
  /** Jumper between batteries inside a string (default 0.3 m of the main conductor). */
  interconnect?: { conductor?: ConductorSize; length_m?: number };
}

/** Series strings (e.g. 4S2P 48 V) on busbars, a fuse per string. */
export function seriesParallelTemplate(opts: SeriesParallelOptions): DiagramDocument {
  const { seriesCount: s, parallelCount: p } = opts;
  if (!Number.isInteger(s) || s < 1 || s > 64) throw new RangeError('seriesCount must be a whole number from 1 to 64');
  if (!Number.isInteger(p) || p < 1 || p > 63) throw new RangeError('parallelCount must be a whole number from 1 to 63');
  const battery = opts.battery ?? batteryDefaults();
  const inverter = opts.inverter ?? inverterFor(battery, s);
  const share_A = inverterCurrent_A(inverter, battery.nominal_V * s) / p;
  const fuse = opts.stringFuse === undefined ? fuseFor(share_A) : opts.stringFuse;
  const conductor = opts.conductor ?? conductorFor(fuse ? fuse.rating_A : share_A * DESIGN_MARGIN);
  const bld = new Builder();
  const bus = { ...busbarDefaults(), tapCount: p + 1 };
  bld.part({ id: 'bus-pos', type: 'busbar', label: 'Positive busbar', position: { x: 0, y: -300 }, props: bus });
  bld.part({ id: 'bus-neg', type: 'busbar', label: 'Negative busbar', position: { x: 0, y: 300 }, props: bus });
  addStrings(bld, p, opts.stringCable_m ?? 1, conductor, fuse, (i) => ({
    id: `string${i}`, type: 'series_string', label: `String ${i}`, position: { x: (i - 1) * PITCH, y: 0 },
    props: {
      count: s, member: battery,
      interconnect: { conductor: opts.interconnect?.conductor ?? conductor, length_m: opts.interconnect?.length_m ?? 0.3, material: 'copper' },
    },
  }));
  addLoad(bld, p * PITCH, { ...opts, inverter }, battery.nominal_V * s, ['bus-pos', `t${p + 1}`], ['bus-neg', `t${p + 1}`]);
  return bld.build(opts.name ?? `${s}S${p}P strings on busbars`, systemVoltageFor(battery.nominal_V * s));
}

/** The trade's name for a bank voltage: 12.8 V LFP is a "12 V" bank, 51.2 V is "48 V". */
export function systemVoltageFor(nominal_V: number): number {
  const classes = [6, 12, 24, 36, 48, 60, 72, 96, 120];
  let best = nominal_V;
  let err = Infinity;
  for (const c of classes) {
    const e = Math.abs(nominal_V - c) / c;
    if (e < err && e <= 0.15) {
      err = e;
      best = c;
    }
  }
  return best;
}
