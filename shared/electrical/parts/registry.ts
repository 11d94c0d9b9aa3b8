/**
 * The part types: each declares its props schema, its terminals, its defaults and its electrical model.
 * `PART_TYPES` is the one table the editor, the diagram schema and the compiler read.
 */
import type { z } from 'zod';
import type { ModelContext, PartModel } from './common';
import {
  BATTERY_TERMINALS, SERIES_STRING_TERMINALS, batteryDefaults, batteryModel, batteryPropsSchema,
  seriesStringDefaults, seriesStringModel, seriesStringPropsSchema,
} from './battery';
import {
  FUSE_TERMINALS, LUG_TERMINALS, SHUNT_TERMINALS, SWITCH_TERMINALS, busbarDefaults, busbarModel,
  busbarPropsSchema, busbarTerminals, fuseDefaults, fuseModel, fusePropsSchema, lugDefaults, lugModel,
  lugPropsSchema, shuntDefaults, shuntModel, shuntPropsSchema, switchDefaults, switchModel, switchPropsSchema,
} from './passive';
import {
  CHARGER_TERMINALS, DC_LOAD_TERMINALS, INVERTER_TERMINALS, chargerDefaults, chargerModel, chargerPropsSchema,
  dcLoadDefaults, dcLoadModel, dcLoadPropsSchema, inverterDefaults, inverterModel, inverterPropsSchema,
  noteDefaults, notePropsSchema,
} from './loads';

export const PART_TYPE_IDS = [
  'battery', 'series_string', 'lug', 'busbar', 'fuse', 'switch', 'shunt', 'inverter', 'dc_load', 'charger', 'note',
] as const;
export type PartType = (typeof PART_TYPE_IDS)[number];

/**
 * How a part behaves in the bank's topology:
 * - source: battery, string or charger (has pos/neg and an EMF);
 * - conductor: a low-resistance pass-through (lug, busbar, fuse, switch, shunt);
 * - load: inverter, DC load;
 * - none: not electrical (note).
 */
export type PartRole = 'source' | 'conductor' | 'load' | 'none';

export interface PartDefinition<S extends z.ZodType = z.ZodType> {
  type: PartType;
  /** Name shown in the parts palette (trade term). */
  name: string;
  role: PartRole;
  schema: S;
  defaults: () => z.infer<S>;
  terminals: (props: z.infer<S>) => readonly string[];
  model: (props: z.infer<S>, ctx: ModelContext) => PartModel;
}

function def<S extends z.ZodType>(d: PartDefinition<S>): PartDefinition<S> {
  return d;
}

export const PART_TYPES = {
  battery: def({ type: 'battery', name: 'Battery', role: 'source', schema: batteryPropsSchema, defaults: () => batteryDefaults(), terminals: () => BATTERY_TERMINALS, model: batteryModel }),
  series_string: def({ type: 'series_string', name: 'Series string', role: 'source', schema: seriesStringPropsSchema, defaults: () => seriesStringDefaults(), terminals: () => SERIES_STRING_TERMINALS, model: seriesStringModel }),
  lug: def({ type: 'lug', name: 'Lug / terminal joint', role: 'conductor', schema: lugPropsSchema, defaults: lugDefaults, terminals: () => LUG_TERMINALS, model: lugModel }),
  busbar: def({ type: 'busbar', name: 'Busbar', role: 'conductor', schema: busbarPropsSchema, defaults: busbarDefaults, terminals: busbarTerminals, model: busbarModel }),
  fuse: def({ type: 'fuse', name: 'Fuse', role: 'conductor', schema: fusePropsSchema, defaults: () => fuseDefaults(), terminals: () => FUSE_TERMINALS, model: fuseModel }),
  switch: def({ type: 'switch', name: 'Switch / disconnect', role: 'conductor', schema: switchPropsSchema, defaults: switchDefaults, terminals: () => SWITCH_TERMINALS, model: switchModel }),
  shunt: def({ type: 'shunt', name: 'Shunt', role: 'conductor', schema: shuntPropsSchema, defaults: shuntDefaults, terminals: () => SHUNT_TERMINALS, model: shuntModel }),
  inverter: def({ type: 'inverter', name: 'Inverter', role: 'load', schema: inverterPropsSchema, defaults: inverterDefaults, terminals: () => INVERTER_TERMINALS, model: inverterModel }),
  dc_load: def({ type: 'dc_load', name: 'DC load', role: 'load', schema: dcLoadPropsSchema, defaults: dcLoadDefaults, terminals: () => DC_LOAD_TERMINALS, model: dcLoadModel }),
  charger: def({ type: 'charger', name: 'Charger', role: 'source', schema: chargerPropsSchema, defaults: chargerDefaults, terminals: () => CHARGER_TERMINALS, model: chargerModel }),
  note: def({ type: 'note', name: 'Note', role: 'none', schema: notePropsSchema, defaults: noteDefaults, terminals: () => [], model: () => ({ elements: [] }) }),
} as const satisfies Record<PartType, PartDefinition>;

export type PartPropsOf<T extends PartType> = z.infer<(typeof PART_TYPES)[T]['schema']>;

/** Terminal names of a part (e.g. battery pos/neg, fuse a/b, busbar t1..tN). */
export function partTerminals<T extends PartType>(type: T, props: PartPropsOf<T>): readonly string[] {
  return (PART_TYPES[type] as unknown as PartDefinition).terminals(props);
}

/** Electrical model of a part in local terminal names. */
export function partModel<T extends PartType>(type: T, props: PartPropsOf<T>, ctx: ModelContext): PartModel {
  return (PART_TYPES[type] as unknown as PartDefinition).model(props, ctx);
}

/** Props for a new part of a type (sensible trade values). */
export function defaultPartProps<T extends PartType>(type: T): PartPropsOf<T> {
  return (PART_TYPES[type] as unknown as PartDefinition).defaults() as PartPropsOf<T>;
}
