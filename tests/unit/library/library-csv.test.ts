import { describe, expect, it } from 'vitest';
import { type LibraryItem, LIBRARY_COLUMNS, libraryItemSchema, libraryToCsv, parseLibraryCsv } from '../../../shared/library';

// An invented team's presets (fictional makers).
const GOOD = [
  'kind,name,manufacturer,partNumber,chemistry,nominal_V,capacity_Ah,r_internal_ohm,conductor,material,insulation_C,fuseClass,rating_A,voltage_rating_V,interrupting_A,width_mm,thickness_mm,tapCount,tapSpacing_m',
  'battery,"House bank LFP, 200 Ah",Fernhill Cells,FH-200,lfp,12.8,200,0.0025,,,,,,,,,,,',
  'cable,Welding flex 2/0,Ostara Wire,,,,,,2/0,copper,105,,,,,,,,',
  'cable,Metric 35,,,,,,,35 mm²,,,,,,,,,,',
  'fuse,Main Class T 300 A,,,,,,,,,,Class T,300,160,20000,,,,',
  'busbar,Six-stud bar,,,,,,,,copper,,,250,,,25,6,6,40 mm',
].join('\r\n');

describe('parseLibraryCsv', () => {
  it('reads a good file of every kind', () => {
    const r = parseLibraryCsv(GOOD);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.items).toEqual([
      {
        kind: 'battery', name: 'House bank LFP, 200 Ah', manufacturer: 'Fernhill Cells', partNumber: 'FH-200',
        props: { chemistry: 'lfp', nominal_V: 12.8, capacity_Ah: 200, r_internal_ohm: 0.0025, soc: 1 },
      },
      {
        kind: 'cable', name: 'Welding flex 2/0', manufacturer: 'Ostara Wire',
        props: { conductor: { system: 'awg', size: '2/0' }, material: 'copper', stranding: 'flexible', insulation_C: 105 },
      },
      { kind: 'cable', name: 'Metric 35', props: { conductor: { system: 'mm2', size: 35 }, material: 'copper', stranding: 'flexible', insulation_C: 90 } },
      { kind: 'fuse', name: 'Main Class T 300 A', props: { fuseClass: 'class_t', rating_A: 300, voltage_rating_V: 160, interrupting_A: 20000 } },
      { kind: 'busbar', name: 'Six-stud bar', props: { material: 'copper', width_mm: 25, thickness_mm: 6, tapCount: 6, tapSpacing_m: 0.04, rating_A: 250 } },
    ]);
  });

  it('accepts a BOM, LF line ends, columns in any order and case, quoted commas and line breaks', () => {
    const text = '\uFEFFNAME,Kind,Conductor\n"Reel A, ""tinned""\nspare",cable,4/0 AWG\n';
    const r = parseLibraryCsv(text);
    expect(r).toEqual({
      ok: true,
      items: [{ kind: 'cable', name: 'Reel A, "tinned"\nspare', props: { conductor: { system: 'awg', size: '4/0' }, material: 'copper', stranding: 'flexible', insulation_C: 90 } }],
    });
  });

  it('reports a missing column, a bad number, an unknown conductor and an unknown kind, row by row', () => {
    const text = [
      'kind,name,chemistry,nominal_V,capacity_Ah,r_internal_ohm,conductor',
      'battery,Ok battery,agm,12,100,0.004,', // row 1 fine
      'battery,Bad number,agm,12,lots,0.004,', // row 2
      'cable,Bad conductor,,,,,7 AWG', // row 3
      'cable,Ambiguous,,,,,35', // row 4
      'widget,What,,,,,', // row 5
      'fuse,No fuse columns,,,,,', // row 6: the header lacks fuse columns
      'battery,Decimal comma,agm,"12,8",100,0.004,', // row 7
    ].join('\n');
    const r = parseLibraryCsv(text);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.validItems.map((i) => i.name)).toEqual(['Ok battery']);
    expect(r.rows.map((x) => [x.row, x.line, x.errors.map((e) => e.column)])).toEqual([
      [2, 3, ['capacity_Ah']],
      [3, 4, ['conductor']],
      [4, 5, ['conductor']],
      [5, 6, ['kind']],
      [6, 7, ['fuseClass', 'voltage_rating_V', 'interrupting_A', 'rating_A']],
      [7, 8, ['nominal_V']],
    ]);
    expect(r.rows[0].errors[0].message).toBe('"lots" is not a number');
    expect(r.rows[1].errors[0].message).toMatch(/not an AWG size/);
    expect(r.rows[2].errors[0].message).toMatch(/could be AWG or mm²/);
    expect(r.rows[3].errors[0].message).toMatch(/Unknown kind "widget"/);
    expect(r.rows[4].errors[0].message).toMatch(/missing from the header/);
    expect(r.rows[5].errors[0].message).toMatch(/decimal point/);
  });

  it('reports empty required cells, values out of range, cells for another kind and duplicate ids', () => {
    const text = [
      'kind,id,name,chemistry,nominal_V,capacity_Ah,r_internal_ohm,conductor,insulation_C',
      'battery,b1,,lfp,12.8,100,0.005,,', // no name
      'battery,b2,Negative,lfp,12.8,-5,0.005,,', // capacity must be > 0
      'cable,c1,Mixed,lfp,,,,2 AWG,', // chemistry on a cable
      'cable,c1,Twice,,,,,2 AWG,80', // duplicate id; 80 °C is not a rating
      'cable,c2,Twice ok,,,,,2 AWG,194 °F',
    ].join('\n');
    const r = parseLibraryCsv(text);
    if (r.ok) throw new Error('should fail');
    expect(r.rows.map((x) => [x.row, x.errors.map((e) => e.column)])).toEqual([
      [1, ['name']],
      [2, ['capacity_Ah']],
      [3, ['chemistry']],
      [4, ['insulation_C', 'id']], // a row with errors still claims its id
    ]);
    expect(r.rows[2].errors[0].message).toBe('chemistry does not apply to a cable; leave it empty');
    // 194 °F = 90 °C.
    expect(r.validItems.map((i) => [i.id, i.kind === 'cable' && i.props.insulation_C])).toEqual([['c2', 90]]);
  });

  it('reports duplicate ids', () => {
    const r = parseLibraryCsv('kind,id,name,conductor\ncable,x1,A,2 AWG\ncable,x1,B,4 AWG\n');
    if (r.ok) throw new Error('should fail');
    expect(r.rows).toEqual([{ row: 2, line: 3, errors: [{ column: 'id', message: 'id "x1" is also used on row 1' }] }]);
    expect(r.validItems.map((i) => i.name)).toEqual(['A']);
  });

  it('reports header problems at row 0 and imports nothing', () => {
    const unknown = parseLibraryCsv('kind,name,colour\ncable,A,red\n');
    expect(unknown).toEqual({ ok: false, rows: [{ row: 0, line: 1, errors: [{ column: 'colour', message: 'Unknown column "colour"' }] }], validItems: [] });
    const noKind = parseLibraryCsv('name,conductor\nA,2 AWG\n');
    expect(!noKind.ok && noKind.rows[0].errors).toEqual([{ column: 'kind', message: 'The header has no "kind" column' }]);
    expect(parseLibraryCsv('')).toMatchObject({ ok: false, rows: [{ row: 0 }] });
    expect(parseLibraryCsv('kind,name\r\n')).toEqual({ ok: true, items: [] });
  });

  it('reports extra cells and a broken quote with the row they are on', () => {
    const extra = parseLibraryCsv('kind,name,conductor\ncable,A,2 AWG,surprise\n');
    expect(!extra.ok && extra.rows).toEqual([{ row: 1, line: 2, errors: [{ column: '', message: 'Row has 4 cells; the header has 3' }] }]);
    const broken = parseLibraryCsv('kind,name,conductor\ncable,A,2 AWG\ncable,"B,4 AWG\n');
    expect(broken.ok).toBe(false);
    if (broken.ok) return;
    expect(broken.validItems.map((i) => i.name)).toEqual(['A']);
    expect(broken.rows).toEqual([{ row: 2, line: 3, errors: [{ column: '', message: 'A quoted field is not closed' }] }]);
  });
});

describe('libraryToCsv', () => {
  it('round-trips through parseLibraryCsv', () => {
    const r = parseLibraryCsv(GOOD);
    if (!r.ok) throw new Error('good file');
    const extra: LibraryItem[] = [
      libraryItemSchema.parse({ kind: 'busbar', id: 'bar-7', name: '=Uneven bar', props: { material: 'aluminium', width_mm: 40, thickness_mm: 10, area_mm2: 380, tapCount: 3, tapSpacing_m: 0.05, segmentLengths_m: [0.05, 0.07], rating_A: 400 } }),
      libraryItemSchema.parse({ kind: 'battery', name: 'Spare, "old" AGM', props: { chemistry: 'agm', nominal_V: 12, capacity_Ah: 90, r_internal_ohm: 0.006, max_continuous_A: 180, max_c_rate: 2, short_circuit_A: 2000, cells_in_series: 6, soc: 1 } }),
      libraryItemSchema.parse({ kind: 'cable', name: 'Big', props: { conductor: { system: 'kcmil', size: 250 }, material: 'aluminium', stranding: 'concentric', insulation_C: 75 } }),
      libraryItemSchema.parse({ kind: 'fuse', name: 'Blade 10', partNumber: '+10A', props: { fuseClass: 'blade', rating_A: 10, voltage_rating_V: 32, interrupting_A: 1000, cold_r_ohm: 0.0075 } }),
    ];
    const items = [...r.items, ...extra];
    const csv = libraryToCsv(items);
    expect(csv.split('\r\n')[0]).toBe(LIBRARY_COLUMNS.map((c) => c.name).join(','));
    // Formula-looking text is written guarded and read back as typed.
    expect(csv).toContain(",'=Uneven bar,");
    expect(csv).toContain(",'+10A,");
    expect(parseLibraryCsv(csv)).toEqual({ ok: true, items });
  });
});
