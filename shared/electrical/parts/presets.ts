/** Presets of common sizes for the parts palette and pickers. Editable starting points, not approvals. */
import type { ConductorSize } from '../../units/conductor';
import { CHEMISTRIES, type ChemistryId } from '../tables/batteries';
import { FUSE_CLASSES, FUSE_CLASS_IDS, type FuseClassId } from '../tables/fuses';
import { type BatteryProps, batteryDefaults } from './battery';
import { type FuseProps, fuseDefaults } from './passive';

export interface Preset<P> {
  id: string;
  label: string;
  props: P;
}

const BATTERY_PRESET_SIZES: Record<ChemistryId, number[]> = {
  lfp: [50, 100, 200, 280, 300],
  nmc: [50, 100, 200],
  agm: [50, 100, 200, 230],
  gel: [100, 200],
  flooded: [100, 200, 225],
};

/** 12 V-class batteries of common capacities for each chemistry. */
export const BATTERY_PRESETS: Preset<BatteryProps>[] = (Object.keys(BATTERY_PRESET_SIZES) as ChemistryId[]).flatMap(
  (chem) =>
    BATTERY_PRESET_SIZES[chem].map((ah) => {
      const props = batteryDefaults(chem, ah);
      return { id: `${chem}-${props.nominal_V}V-${ah}Ah`, label: `${CHEMISTRIES[chem].name} ${props.nominal_V} V ${ah} Ah`, props };
    }),
);

/** Common battery-cable sizes. */
export const CONDUCTOR_PRESETS: Preset<ConductorSize>[] = [
  ...(['8', '6', '4', '2', '1', '1/0', '2/0', '3/0', '4/0'] as const).map((size) => ({
    id: `awg-${size}`, label: `${size} AWG`, props: { system: 'awg', size } as ConductorSize,
  })),
  ...[250, 300, 350, 500].map((size) => ({ id: `kcmil-${size}`, label: `${size} kcmil`, props: { system: 'kcmil', size } as ConductorSize })),
  ...[10, 16, 25, 35, 50, 70, 95, 120].map((size) => ({ id: `mm2-${size}`, label: `${size} mm²`, props: { system: 'mm2', size } as ConductorSize })),
];

/** Fuses of each class at its common ratings. */
export const FUSE_PRESETS: Preset<FuseProps>[] = FUSE_CLASS_IDS.flatMap((cls: FuseClassId) =>
  FUSE_CLASSES[cls].commonRatings_A.map((a) => ({ id: `${cls}-${a}A`, label: `${FUSE_CLASSES[cls].name} ${a} A`, props: fuseDefaults(cls, a) })),
);
