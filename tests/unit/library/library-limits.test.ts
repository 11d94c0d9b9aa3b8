/** Battery current limits in the parts library's CSV: pulse current and duration columns. */
import { describe, expect, it } from 'vitest';
import { libraryItemSchema, libraryToCsv, parseLibraryCsv } from '../../../shared/library';

describe('library CSV: battery pulse limits', () => {
  it('reads max_pulse_A and pulse_s into the battery props', () => {
    // An invented maker's battery: 100 A continuous, 200 A for 10 s.
    const csv = ['kind,name,chemistry,nominal_V,capacity_Ah,r_internal_ohm,max_continuous_A,max_pulse_A,pulse_s', 'battery,Tarn 100,lfp,12.8,100,0.005,100,200,10'].join('\n');
    const r = parseLibraryCsv(csv);
    expect(r.ok && r.items[0].props).toEqual({ chemistry: 'lfp', nominal_V: 12.8, capacity_Ah: 100, r_internal_ohm: 0.005, max_continuous_A: 100, max_pulse_A: 200, pulse_s: 10, soc: 1 });
  });

  it('writes them and reads them back to the same item', () => {
    const item = libraryItemSchema.parse({
      kind: 'battery', name: 'Tarn 280', props: { chemistry: 'lfp', nominal_V: 12.8, capacity_Ah: 280, r_internal_ohm: 0.002, max_pulse_A: 400, pulse_s: 3, soc: 1 },
    });
    const csv = libraryToCsv([item]);
    const header = csv.split('\r\n')[0].split(',');
    expect(header).toEqual(expect.arrayContaining(['max_pulse_A', 'pulse_s']));
    const back = parseLibraryCsv(csv);
    expect(back.ok && back.items).toEqual([item]);
  });

  it('refuses them on a row that is not a battery, and a zero pulse duration', () => {
    const fuse = parseLibraryCsv(['kind,name,fuseClass,rating_A,voltage_rating_V,interrupting_A,max_pulse_A', 'fuse,Main,class_t,300,160,20000,500'].join('\n'));
    expect(!fuse.ok && fuse.rows[0].errors).toEqual([{ column: 'max_pulse_A', message: 'max_pulse_A does not apply to a fuse; leave it empty' }]);
    const zero = parseLibraryCsv(['kind,name,chemistry,nominal_V,capacity_Ah,r_internal_ohm,pulse_s', 'battery,Bad,lfp,12.8,100,0.005,0'].join('\n'));
    expect(!zero.ok && zero.rows[0].errors.map((e) => e.column)).toEqual(['pulse_s']);
  });
});
