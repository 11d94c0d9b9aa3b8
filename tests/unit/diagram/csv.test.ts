import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { postToPostTemplate } from '../../../shared/diagram';
import { billOfMaterials } from '../../../shared/diagram/bom';
import { bomToCsv, csvField, cutListToCsv, formatCsv, guardCell, parseCsv, unguardCell } from '../../../shared/diagram/csv';

const fields = (text: string) => {
  const r = parseCsv(text);
  if (!r.ok) throw new Error(r.error.message);
  return r.records.map((x) => x.fields);
};

describe('CSV writer (RFC 4180)', () => {
  it('quotes fields with commas, quotes, CR or LF and doubles quotes', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField('cr\r')).toBe('"cr\r"');
    expect(formatCsv([['a', 1, null, true], ['x,y', 2.5, undefined, '']])).toBe('a,1,,true\r\n"x,y",2.5,,\r\n');
  });

  it('guards cells that start a formula (OWASP CSV injection), never numbers', () => {
    for (const s of ['=1+1', '+1', '-1', '@SUM(A1)', '\tx', '\rx']) expect(guardCell(s)).toBe(`'${s}`);
    expect(guardCell('1+1')).toBe('1+1');
    expect(formatCsv([['=HYPERLINK("x")', -3]])).toBe(`"'=HYPERLINK(""x"")",-3\r\n`);
    expect(unguardCell("'=1+1")).toBe('=1+1');
    expect(unguardCell("'quoted")).toBe("'quoted");
    expect(guardCell("'=x")).toBe("''=x");
    expect(unguardCell("''=x")).toBe("'=x");
    expect(formatCsv([['=x']], { guardFormulas: false })).toBe('=x\r\n');
  });
});

describe('CSV parser (RFC 4180)', () => {
  it('reads quoted fields with commas, doubled quotes and line breaks', () => {
    expect(fields('a,"b,c","say ""hi""","two\r\nlines"\r\nd,e,f,g\r\n')).toEqual([
      ['a', 'b,c', 'say "hi"', 'two\r\nlines'],
      ['d', 'e', 'f', 'g'],
    ]);
  });

  it('accepts LF, CR, a missing last line end, a BOM, empty fields and skips blank lines', () => {
    expect(fields('\uFEFFa,b\n\nc,\r"",d')).toEqual([['a', 'b'], ['c', ''], ['', 'd']]);
    expect(fields('')).toEqual([]);
    expect(fields(',\n')).toEqual([['', '']]);
  });

  it('gives the line where each record starts', () => {
    const r = parseCsv('h1,h2\n"multi\nline",x\nlast,y\n');
    expect(r.ok && r.records.map((x) => x.line)).toEqual([1, 2, 4]);
  });

  it('reports an unclosed quote, text after a closing quote and a stray quote', () => {
    expect(parseCsv('a,b\n"open,c\n')).toMatchObject({ ok: false, error: { line: 2 }, records: [{ fields: ['a', 'b'] }] });
    expect(parseCsv('"ab"c,d')).toMatchObject({ ok: false, error: { line: 1 } });
    expect(parseCsv('ab"c,d')).toMatchObject({ ok: false, error: { line: 1 } });
  });

  it('reads back whatever the writer wrote', () => {
    const cell = fc.string({ unit: fc.constantFrom('a', 'Z', ' ', ',', '"', '\n', '\r', 'é', '²', "'", '=') , maxLength: 8 });
    fc.assert(fc.property(fc.array(fc.array(cell, { minLength: 2, maxLength: 5 }), { maxLength: 6 }), (rows) => {
      expect(fields(formatCsv(rows, { guardFormulas: false }))).toEqual(rows);
      // With the guard on, unguarding every cell gives the text back.
      expect(fields(formatCsv(rows)).map((r) => r.map(unguardCell))).toEqual(rows);
    }), { numRuns: 300 });
  });
});

describe('bomToCsv', () => {
  const doc = () => postToPostTemplate({ count: 2, takeOff: 'same-end', conductor: { system: 'awg', size: '2/0' } });

  it('writes a header, one row per line and the caution, with no byte-order mark', () => {
    const bom = billOfMaterials(doc(), { unitSystem: 'us' });
    const csv = bomToCsv(bom);
    expect(csv.charCodeAt(0)).not.toBe(0xfeff);
    const rows = fields(csv);
    expect(rows[0]).toEqual(['Category', 'Description', 'Quantity', 'Unit', 'Parts', 'Part ids']);
    expect(rows).toHaveLength(1 + bom.lines.length + 1);
    expect(rows[1]).toEqual(['Batteries', 'Lithium iron phosphate (LiFePO₄) battery, 12.8 V, 100 Ah', '2', 'pcs', 'Battery 1; Battery 2', 'bat1 bat2']);
    expect(csv.split('\r\n')[1]).toBe('Batteries,"Lithium iron phosphate (LiFePO₄) battery, 12.8 V, 100 Ah",2,pcs,Battery 1; Battery 2,bat1 bat2');
    // Readable category names, never the internal keys.
    expect(rows.map((r) => r[0])).toEqual(['Category', 'Batteries', 'Cables', 'Lugs', 'Fuses', 'Fuse holders', 'Inverters', 'Note']);
    expect(csv).not.toMatch(/fuse_holders/);
    expect(rows.find((r) => r[0] === 'Fuse holders')!.slice(4)).toEqual(['Main fuse', 'main-fuse']);
    expect(rows.at(-1)![0]).toBe('Note');
    expect(rows.at(-1)![1]).toMatch(/not an approval to install/);
  });

  it('guards user text against formula injection and quotes quotes', () => {
    const d = doc();
    d.cables[0].label = '=HYPERLINK("http://example.invalid","x")';
    const b1 = d.parts.find((p) => p.id === 'bat1')!;
    if (b1.type === 'battery') b1.props.model = 'Harbour "Deep" 100';
    const bom = billOfMaterials(d, { unitSystem: 'metric' });
    const cuts = fields(cutListToCsv(bom));
    expect(cuts[0]).toEqual(['Conductor', 'Cable', 'Length', 'Cut length', 'Unit', 'Cable id']);
    const cut = cuts.find((r) => r[5] === d.cables[0].id)!;
    expect(cut[1]).toBe(`'=HYPERLINK("http://example.invalid","x")`);
    expect(bomToCsv(bom)).toContain(`'=HYPERLINK(""http://example.invalid"",""x"")`);
    expect(bomToCsv(bom)).toContain('"Lithium iron phosphate (LiFePO₄) battery, 12.8 V, 100 Ah, Harbour ""Deep"" 100"');
  });
});
