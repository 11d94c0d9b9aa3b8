/** One line of the figures that matter for each kind of library item, for tables and the palette. */
import type { LibraryItem } from '@shared/library';
import { CHEMISTRIES } from '@shared/electrical/tables/batteries';
import { FUSE_CLASSES } from '@shared/electrical/tables/fuses';
import { sizeLabel } from '@shared/units/format';

const num = (n: number, digits = 3) => String(Math.round(n * 10 ** digits) / 10 ** digits);

export function itemSummary(item: LibraryItem): string {
  switch (item.kind) {
    case 'battery': {
      const p = item.props;
      return `${CHEMISTRIES[p.chemistry].name.replace(/ \(.*\)$/, '')} · ${num(p.nominal_V)} V · ${num(p.capacity_Ah)} Ah · ${num(p.r_internal_ohm * 1000, 2)} mΩ`;
    }
    case 'cable': {
      const p = item.props;
      return `${sizeLabel(p.conductor)} · ${p.material} · ${p.stranding} · ${p.insulation_C} °C`;
    }
    case 'fuse': {
      const p = item.props;
      return `${FUSE_CLASSES[p.fuseClass].name} · ${num(p.rating_A)} A · ${num(p.voltage_rating_V)} V DC · ${num(p.interrupting_A)} A interrupting`;
    }
    case 'busbar': {
      const p = item.props;
      return `${p.material} ${num(p.width_mm)} × ${num(p.thickness_mm)} mm · ${p.tapCount} taps at ${num(p.tapSpacing_m * 1000, 1)} mm · ${num(p.rating_A)} A`;
    }
  }
}
