/**
 * CSV in and out: an RFC 4180 writer and parser, and the bill of materials as CSV.
 *
 * Writing: fields separated by commas, records by CRLF, a field quoted when it holds a comma, a quote,
 * CR or LF (quotes doubled inside). The text starts directly with the header: no byte-order mark (a
 * caller that targets a spreadsheet which needs one to read "mm²" may prepend "\uFEFF").
 *
 * Reading: quoted fields with doubled quotes, CRLF, LF or lone CR line ends, an optional UTF-8 BOM at
 * the start, a final line end or none. Blank lines are skipped. Errors are data (`{ line, message }`).
 */
import { BOM_CATEGORY_LABELS, type BillOfMaterials } from './bom';

// Writing -------------------------------------------------------------------------------------------

/**
 * Characters that make a spreadsheet read a cell as a formula: "=", "+", "-", "@", and tab / CR.
 * OWASP "CSV injection" (formula injection) guidance: prefix such a cell with a single quote so it is
 * shown as text. `unguardCell` undoes it on import.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

/** Text that `unguardCell` would shorten: apostrophes, then a formula-start character. */
const GUARDED = /^'+[=+\-@\t\r]/;

/**
 * A cell made safe against CSV injection (OWASP): a leading apostrophe before = + - @ tab CR. Text
 * that already starts with apostrophes before such a character gets one more, so `unguardCell` is
 * its exact inverse.
 */
export function guardCell(text: string): string {
  return FORMULA_START.test(text) || GUARDED.test(text) ? `'${text}` : text;
}

/** Undo `guardCell`: one apostrophe dropped from apostrophes followed by a formula-start character. */
export function unguardCell(text: string): string {
  return GUARDED.test(text) ? text.slice(1) : text;
}

/** One field as RFC 4180 text: quoted when it holds a comma, quote, CR or LF; quotes doubled. */
export function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export type CsvValue = string | number | boolean | null | undefined;

function cellText(v: CsvValue): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  return String(v);
}

export interface FormatCsvOptions {
  /** Guard text cells against CSV injection (OWASP); default true. Numbers are never guarded. */
  guardFormulas?: boolean;
}

/** Records to CSV text, CRLF after every record (RFC 4180). */
export function formatCsv(rows: readonly (readonly CsvValue[])[], opts: FormatCsvOptions = {}): string {
  const guard = opts.guardFormulas ?? true;
  let out = '';
  for (const row of rows) {
    out += row.map((v) => {
      const text = cellText(v);
      return csvField(guard && typeof v !== 'number' ? guardCell(text) : text);
    }).join(',');
    out += '\r\n';
  }
  return out;
}

// Reading -------------------------------------------------------------------------------------------

export interface CsvRecord {
  fields: string[];
  /** 1-based line of the file where the record starts (a quoted field may span lines). */
  line: number;
}

export type ParseCsvResult =
  | { ok: true; records: CsvRecord[] }
  | { ok: false; error: { line: number; message: string }; records: CsvRecord[] };

/**
 * Parse CSV text (RFC 4180, comma separated). Blank lines (no characters at all) are skipped. A quote
 * inside an unquoted field, text after a closing quote, or a quote left open are errors; `records`
 * then holds the records read before the error.
 */
export function parseCsv(text: string): ParseCsvResult {
  const s = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const records: CsvRecord[] = [];
  let fields: string[] = [];
  let field = '';
  let line = 1;
  let recordLine = 1;
  let i = 0;
  const n = s.length;
  let atRecordStart = true;

  const endRecord = () => {
    fields.push(field);
    if (!(fields.length === 1 && fields[0] === '' && atRecordStart)) records.push({ fields, line: recordLine });
    fields = [];
    field = '';
    atRecordStart = true;
  };

  while (i < n) {
    const c = s[i];
    if (atRecordStart) {
      recordLine = line;
    }
    if (c === '"' && field === '') {
      // Quoted field.
      const startLine = line;
      i++;
      let closed = false;
      while (i < n) {
        const q = s[i];
        if (q === '"') {
          if (s[i + 1] === '"') {
            field += '"';
            i += 2;
            continue;
          }
          i++;
          closed = true;
          break;
        }
        if (q === '\r') {
          line++;
          if (s[i + 1] === '\n') {
            field += '\r\n';
            i += 2;
            continue;
          }
        } else if (q === '\n') line++;
        field += q;
        i++;
      }
      if (!closed) return { ok: false, error: { line: startLine, message: 'A quoted field is not closed' }, records };
      atRecordStart = false;
      const next = s[i];
      if (i < n && next !== ',' && next !== '\r' && next !== '\n') {
        return { ok: false, error: { line, message: 'Text after a closing quote; quote the whole field and double any quote inside it' }, records };
      }
      continue;
    }
    if (c === ',') {
      fields.push(field);
      field = '';
      atRecordStart = false;
      i++;
      continue;
    }
    if (c === '\r' || c === '\n') {
      endRecord();
      i += c === '\r' && s[i + 1] === '\n' ? 2 : 1;
      line++;
      continue;
    }
    if (c === '"') {
      return { ok: false, error: { line, message: 'A quote inside an unquoted field; quote the whole field and double the quote ("")' }, records };
    }
    field += c;
    atRecordStart = false;
    i++;
  }
  if (!atRecordStart) endRecord();
  return { ok: true, records };
}

// Bill of materials ---------------------------------------------------------------------------------

export const BOM_CSV_HEADER = ['Category', 'Description', 'Quantity', 'Unit', 'Parts', 'Part ids'] as const;

/**
 * The bill of materials as CSV, matching the screen and the print view: a header row, then one row per
 * line (the category's name, description, quantity, unit, the parts and cables it counts by label
 * separated by "; ", and their diagram ids separated by spaces), and a last `Note` row with the
 * caution. Text cells are guarded against CSV injection (OWASP). No byte-order mark.
 */
export function bomToCsv(bom: BillOfMaterials): string {
  const rows: CsvValue[][] = [[...BOM_CSV_HEADER]];
  for (const l of bom.lines) rows.push([BOM_CATEGORY_LABELS[l.category], l.description, l.quantity, l.unit, l.parts.map((p) => p.label).join('; '), l.partIds.join(' ')]);
  rows.push(['Note', bom.caution, null, null, null, null]);
  return formatCsv(rows);
}

export const CUT_LIST_CSV_HEADER = ['Conductor', 'Cable', 'Length', 'Cut length', 'Unit', 'Cable id'] as const;

/** The cut list of every cable line as CSV, longest first within each conductor: each cable by label, its id last. */
export function cutListToCsv(bom: BillOfMaterials): string {
  const rows: CsvValue[][] = [[...CUT_LIST_CSV_HEADER]];
  for (const l of bom.lines) {
    for (const c of l.cuts ?? []) rows.push([l.description, c.label, c.length, c.cutLength, l.unit, c.id]);
  }
  return formatCsv(rows);
}
