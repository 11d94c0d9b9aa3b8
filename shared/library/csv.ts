/**
 * The parts library as one CSV file with a `kind` column (docs/parts-library.md).
 *
 * The first row is the header. Columns may come in any order and any letter case; only `kind` and
 * `name` must be present. Units are in the column names (`capacity_Ah`, `tapSpacing_m`). A cell of a
 * column that does not apply to the row's kind must be empty. Conductor cells take trade input
 * ("2/0", "2/0 AWG", "35 mm²", "250 kcmil"); a bare number is refused as ambiguous. Length cells in
 * metres also take a unit ("40 mm", "1.5 in"). Numbers use a decimal point.
 *
 * Rows are numbered from 1 at the first data row (the header is row 0); `line` is the file line where
 * the row starts (quoted cells may span lines).
 */
import { CHEMISTRIES, CHEMISTRY_IDS, type ChemistryId } from '../electrical/tables/batteries';
import { FUSE_CLASSES, FUSE_CLASS_IDS, type FuseClassId } from '../electrical/tables/fuses';
import { sizeLabel } from '../units/format';
import { parseConductorSize, parseLength, parseTemperature } from '../units/parse';
import { type CsvValue, formatCsv, parseCsv, unguardCell } from '../diagram/csv';
import { LIBRARY_KINDS, type LibraryItem, type LibraryKind, libraryItemSchema } from './schema';

type CellKind = 'text' | 'number' | 'int' | 'conductor' | 'length_m' | 'lengths_m' | 'chemistry' | 'fuseClass' | 'material' | 'stranding' | 'insulation';

interface Column {
  name: string;
  /** Kinds the column applies to; undefined = every kind. */
  kinds?: readonly LibraryKind[];
  cell: CellKind;
  /** Kinds for which the cell must be filled. */
  required?: readonly LibraryKind[];
  /** Where the value goes: the item itself or its props. */
  into: 'item' | 'props';
}

const ALL = LIBRARY_KINDS;

/** The columns, in the order `libraryToCsv` writes them. */
export const LIBRARY_COLUMNS: readonly Column[] = [
  { name: 'kind', cell: 'text', into: 'item', required: ALL },
  { name: 'id', cell: 'text', into: 'item' },
  { name: 'name', cell: 'text', into: 'item', required: ALL },
  { name: 'manufacturer', cell: 'text', into: 'item' },
  { name: 'partNumber', cell: 'text', into: 'item' },
  // Battery
  { name: 'chemistry', kinds: ['battery'], cell: 'chemistry', into: 'props', required: ['battery'] },
  { name: 'nominal_V', kinds: ['battery'], cell: 'number', into: 'props', required: ['battery'] },
  { name: 'capacity_Ah', kinds: ['battery'], cell: 'number', into: 'props', required: ['battery'] },
  { name: 'r_internal_ohm', kinds: ['battery'], cell: 'number', into: 'props', required: ['battery'] },
  { name: 'max_continuous_A', kinds: ['battery'], cell: 'number', into: 'props' },
  { name: 'max_c_rate', kinds: ['battery'], cell: 'number', into: 'props' },
  { name: 'short_circuit_A', kinds: ['battery'], cell: 'number', into: 'props' },
  { name: 'max_pulse_A', kinds: ['battery'], cell: 'number', into: 'props' },
  { name: 'pulse_s', kinds: ['battery'], cell: 'number', into: 'props' },
  { name: 'cells_in_series', kinds: ['battery'], cell: 'int', into: 'props' },
  // Cable
  { name: 'conductor', kinds: ['cable'], cell: 'conductor', into: 'props', required: ['cable'] },
  { name: 'stranding', kinds: ['cable'], cell: 'stranding', into: 'props' },
  { name: 'insulation_C', kinds: ['cable'], cell: 'insulation', into: 'props' },
  // Cable (default copper) and busbar (required)
  { name: 'material', kinds: ['cable', 'busbar'], cell: 'material', into: 'props', required: ['busbar'] },
  // Fuse
  { name: 'fuseClass', kinds: ['fuse'], cell: 'fuseClass', into: 'props', required: ['fuse'] },
  { name: 'voltage_rating_V', kinds: ['fuse'], cell: 'number', into: 'props', required: ['fuse'] },
  { name: 'interrupting_A', kinds: ['fuse'], cell: 'number', into: 'props', required: ['fuse'] },
  { name: 'cold_r_ohm', kinds: ['fuse'], cell: 'number', into: 'props' },
  // Fuse and busbar
  { name: 'rating_A', kinds: ['fuse', 'busbar'], cell: 'number', into: 'props', required: ['fuse', 'busbar'] },
  // Busbar
  { name: 'width_mm', kinds: ['busbar'], cell: 'number', into: 'props', required: ['busbar'] },
  { name: 'thickness_mm', kinds: ['busbar'], cell: 'number', into: 'props', required: ['busbar'] },
  { name: 'area_mm2', kinds: ['busbar'], cell: 'number', into: 'props' },
  { name: 'tapCount', kinds: ['busbar'], cell: 'int', into: 'props', required: ['busbar'] },
  { name: 'tapSpacing_m', kinds: ['busbar'], cell: 'length_m', into: 'props', required: ['busbar'] },
  { name: 'segmentLengths_m', kinds: ['busbar'], cell: 'lengths_m', into: 'props' },
];

const COLUMN_BY_LOWER = new Map(LIBRARY_COLUMNS.map((c) => [c.name.toLowerCase(), c]));

export interface LibraryCellError {
  /** Column name as in LIBRARY_COLUMNS; "" when the error is about the whole row. */
  column: string;
  message: string;
}

export interface LibraryRowErrors {
  /** 1-based data row (the header is row 0 and is not counted among the data rows). */
  row: number;
  /** 1-based line of the file where the row starts. */
  line: number;
  errors: LibraryCellError[];
}

export type ParseLibraryResult =
  | { ok: true; items: LibraryItem[] }
  | { ok: false; rows: LibraryRowErrors[]; validItems: LibraryItem[] };

// Cells ---------------------------------------------------------------------------------------------------

type CellResult = { ok: true; value: unknown } | { ok: false; message: string };

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

function readNumber(text: string): CellResult {
  if (NUMBER.test(text)) return { ok: true, value: Number(text) };
  if (/^[+-]?\d+,\d+$/.test(text)) return { ok: false, message: `"${text}" is not a number; use a decimal point (e.g. ${text.replace(',', '.')})` };
  return { ok: false, message: `"${text}" is not a number` };
}

const CHEMISTRY_NAMES = new Map<string, ChemistryId>([
  ...CHEMISTRY_IDS.map((id) => [id, id] as const),
  ...CHEMISTRY_IDS.map((id) => [CHEMISTRIES[id].name.toLowerCase(), id] as const),
  ['lifepo4', 'lfp'], ['lifepo₄', 'lfp'],
]);
const FUSE_CLASS_NAMES = new Map<string, FuseClassId>([
  ...FUSE_CLASS_IDS.map((id) => [id, id] as const),
  ...FUSE_CLASS_IDS.map((id) => [FUSE_CLASSES[id].name.toLowerCase(), id] as const),
]);

function readCell(kind: CellKind, text: string): CellResult {
  const lower = text.toLowerCase();
  switch (kind) {
    case 'text':
      return { ok: true, value: text };
    case 'number':
      return readNumber(text);
    case 'int': {
      const r = readNumber(text);
      if (r.ok && !Number.isInteger(r.value)) return { ok: false, message: `"${text}" is not a whole number` };
      return r;
    }
    case 'conductor': {
      const r = parseConductorSize(text);
      return r.ok ? { ok: true, value: r.value } : { ok: false, message: r.error.message };
    }
    case 'length_m': {
      if (NUMBER.test(text)) return { ok: true, value: Number(text) };
      const r = parseLength(text);
      return r.ok ? { ok: true, value: r.value } : { ok: false, message: r.error.message };
    }
    case 'lengths_m': {
      const out: number[] = [];
      for (const piece of text.split(/[;\s]+/).filter(Boolean)) {
        const r = readCell('length_m', piece);
        if (!r.ok) return r;
        out.push(r.value as number);
      }
      return { ok: true, value: out };
    }
    case 'chemistry': {
      const id = CHEMISTRY_NAMES.get(lower);
      return id ? { ok: true, value: id } : { ok: false, message: `Unknown chemistry "${text}"; use ${CHEMISTRY_IDS.join(', ')}` };
    }
    case 'fuseClass': {
      const id = FUSE_CLASS_NAMES.get(lower);
      return id ? { ok: true, value: id } : { ok: false, message: `Unknown fuse class "${text}"; use ${FUSE_CLASS_IDS.join(', ')}` };
    }
    case 'material':
      if (lower === 'copper' || lower === 'cu') return { ok: true, value: 'copper' };
      if (lower === 'aluminium' || lower === 'aluminum' || lower === 'al') return { ok: true, value: 'aluminium' };
      return { ok: false, message: `Unknown material "${text}"; use copper or aluminium` };
    case 'stranding':
      if (lower === 'solid' || lower === 'concentric' || lower === 'flexible') return { ok: true, value: lower };
      return { ok: false, message: `Unknown stranding "${text}"; use solid, concentric or flexible` };
    case 'insulation': {
      const r = parseTemperature(text);
      if (!r.ok) return { ok: false, message: r.error.message };
      const c = Math.round(r.value * 1e6) / 1e6;
      if (![60, 75, 90, 105].includes(c)) return { ok: false, message: `Insulation rating ${text} is not 60, 75, 90 or 105 °C` };
      return { ok: true, value: c };
    }
  }
}

// Import --------------------------------------------------------------------------------------------------

/** Read a parts-library CSV. Every row is checked; the caller decides to import all, the valid rows, or none. */
export function parseLibraryCsv(text: string): ParseLibraryResult {
  const parsed = parseCsv(text);
  const records = parsed.records;
  const rows: LibraryRowErrors[] = [];
  const items: LibraryItem[] = [];
  const fail = () => ({ ok: false as const, rows, validItems: items });

  if (!records.length) {
    if (!parsed.ok) rows.push({ row: 0, line: parsed.error.line, errors: [{ column: '', message: parsed.error.message }] });
    else rows.push({ row: 0, line: 1, errors: [{ column: '', message: 'The file is empty; the first row must be the header (kind,name,…)' }] });
    return fail();
  }

  // Header.
  const header = records[0];
  const columns: (Column | null)[] = [];
  const headerErrors: LibraryCellError[] = [];
  const seen = new Set<string>();
  for (const raw of header.fields) {
    const name = raw.trim();
    const col = COLUMN_BY_LOWER.get(name.toLowerCase()) ?? null;
    if (!col) {
      if (name) headerErrors.push({ column: name, message: `Unknown column "${name}"` });
      columns.push(null);
      continue;
    }
    if (seen.has(col.name)) headerErrors.push({ column: col.name, message: `Column "${col.name}" appears twice` });
    seen.add(col.name);
    columns.push(col);
  }
  for (const must of ['kind', 'name']) {
    if (!seen.has(must)) headerErrors.push({ column: must, message: `The header has no "${must}" column` });
  }
  if (headerErrors.length) {
    rows.push({ row: 0, line: header.line, errors: headerErrors });
    return fail();
  }

  const ids = new Map<string, number>();
  const dataRecords = records.slice(1);
  dataRecords.forEach((rec, i) => {
    const row = i + 1;
    const errors: LibraryCellError[] = [];
    const cells = new Map<string, string>();
    rec.fields.forEach((f, j) => {
      const col = columns[j];
      const value = unguardCell(f).trim();
      if (j >= columns.length) {
        if (value) errors.push({ column: '', message: `Row has ${rec.fields.length} cells; the header has ${columns.length}` });
      } else if (col) cells.set(col.name, value);
    });
    const kindText = (cells.get('kind') ?? '').toLowerCase();
    if (!kindText) errors.push({ column: 'kind', message: 'kind is required (battery, cable, fuse or busbar)' });
    else if (!(LIBRARY_KINDS as readonly string[]).includes(kindText)) {
      errors.push({ column: 'kind', message: `Unknown kind "${cells.get('kind')}"; use battery, cable, fuse or busbar` });
    }
    if (errors.some((e) => e.column === 'kind')) {
      rows.push({ row, line: rec.line, errors: dedupe(errors) });
      return;
    }
    const kind = kindText as LibraryKind;
    const item: Record<string, unknown> = { kind };
    const props: Record<string, unknown> = {};
    for (const col of LIBRARY_COLUMNS) {
      if (col.name === 'kind') continue;
      const applies = !col.kinds || col.kinds.includes(kind);
      const present = seen.has(col.name);
      const value = cells.get(col.name) ?? '';
      if (!applies) {
        if (value) errors.push({ column: col.name, message: `${col.name} does not apply to a ${kind}; leave it empty` });
        continue;
      }
      if (!value) {
        if (col.required?.includes(kind)) {
          errors.push({
            column: col.name,
            message: present ? `${col.name} is required for a ${kind}` : `Column "${col.name}" is missing from the header; a ${kind} needs it`,
          });
        }
        continue;
      }
      const r = readCell(col.cell, value);
      if (!r.ok) {
        errors.push({ column: col.name, message: r.message });
        continue;
      }
      (col.into === 'item' ? item : props)[col.name] = r.value;
    }
    // A library battery is stored full: the state of charge belongs to a battery in a diagram.
    if (kind === 'battery') props.soc = 1;
    item.props = props;

    const result = libraryItemSchema.safeParse(item);
    if (!result.success) {
      const already = new Set(errors.map((e) => e.column));
      for (const issue of result.error.issues) {
        const column = issue.path[0] === 'props' ? String(issue.path[1] ?? '') : String(issue.path[0] ?? '');
        if (already.has(column)) continue; // the cell error says it better
        errors.push({ column, message: issue.message });
      }
    }
    if (result.success && result.data.id !== undefined) {
      const first = ids.get(result.data.id);
      if (first !== undefined) errors.push({ column: 'id', message: `id "${result.data.id}" is also used on row ${first}` });
      else ids.set(result.data.id, row);
    }
    if (errors.length || !result.success) rows.push({ row, line: rec.line, errors: dedupe(errors) });
    else items.push(result.data);
  });

  if (!parsed.ok) {
    rows.push({ row: dataRecords.length + 1, line: parsed.error.line, errors: [{ column: '', message: parsed.error.message }] });
  }
  return rows.length ? fail() : { ok: true, items };
}

function dedupe(errors: LibraryCellError[]) {
  const seen = new Set<string>();
  return errors.filter((e) => {
    const k = `${e.column}\u0000${e.message}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

// Export --------------------------------------------------------------------------------------------------

function cellOut(col: Column, v: unknown): CsvValue {
  if (v === undefined || v === null) return null;
  if (col.cell === 'conductor') return sizeLabel(v as Parameters<typeof sizeLabel>[0]);
  if (col.cell === 'lengths_m') return (v as number[]).join(';');
  return v as CsvValue;
}

/**
 * The library as CSV: every column of LIBRARY_COLUMNS, one row per item. A battery's per-install
 * fields (state of charge, resting voltage, install date, age, model) are not written. Text cells are
 * guarded against CSV injection (OWASP); `parseLibraryCsv` removes the guard.
 */
export function libraryToCsv(items: readonly LibraryItem[]): string {
  const rows: CsvValue[][] = [LIBRARY_COLUMNS.map((c) => c.name)];
  for (const item of items) {
    const props = item.props as Record<string, unknown>;
    rows.push(LIBRARY_COLUMNS.map((col) => {
      if (col.kinds && !col.kinds.includes(item.kind)) return null;
      return cellOut(col, col.into === 'item' ? (item as Record<string, unknown>)[col.name] : props[col.name]);
    }));
  }
  return formatCsv(rows);
}
