/**
 * The bill of materials as a table: sortable by category, description or quantity; cable lines open
 * to their cut list; per-category totals below; CSV download of the lines and of the cut list.
 */
import { useMemo, useState } from 'react';
import { BOM_CATEGORIES, BOM_CATEGORY_LABELS, type BillOfMaterials, type BomLine } from '@shared/diagram/bom';
import { bomToCsv, cutListToCsv } from '@shared/diagram/csv';
import { Button } from '@/components/Button';

/** The category names of the screen, the print view and the CSV (one list, shared/diagram/bom.ts). */
export const BOM_CATEGORY_NAMES = BOM_CATEGORY_LABELS;

type SortKey = 'category' | 'description' | 'quantity';
type Sort = { key: SortKey; dir: 'asc' | 'desc' };

const CATEGORY_ORDER = new Map(BOM_CATEGORIES.map((c, i) => [c, i]));
const collator = new Intl.Collator(undefined, { numeric: true, sensitivity: 'base' });

function compare(a: BomLine, b: BomLine, key: SortKey): number {
  if (key === 'quantity') return a.quantity - b.quantity || collator.compare(a.unit, b.unit);
  if (key === 'description') return collator.compare(a.description, b.description);
  return CATEGORY_ORDER.get(a.category)! - CATEGORY_ORDER.get(b.category)!;
}

const qty = (n: number) => String(Number(n.toFixed(2)));

function saveText(text: string, fileName: string) {
  const url = URL.createObjectURL(new Blob([text], { type: 'text/csv;charset=utf-8' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function BomCsvButtons({ bom, baseName }: { bom: BillOfMaterials; baseName: string }) {
  return (
    <div className="flex gap-2 print:hidden">
      <Button size="sm" onClick={() => saveText(bomToCsv(bom), `${baseName}-bill-of-materials.csv`)} disabled={bom.lines.length === 0}>
        Download CSV
      </Button>
      <Button size="sm" variant="ghost" onClick={() => saveText(cutListToCsv(bom), `${baseName}-cut-list.csv`)} disabled={!bom.lines.some((l) => l.cuts?.length)}>
        Cut list CSV
      </Button>
    </div>
  );
}

/** Parts and cables appear by the labels the bill of materials gives them (the same in the CSV); ids are in the CSV's own column. */
export function BomTable({ bom, sortable = true }: { bom: BillOfMaterials; sortable?: boolean }) {
  const [sort, setSort] = useState<Sort>({ key: 'category', dir: 'asc' });
  const [open, setOpen] = useState<Set<string>>(new Set());
  const lines = useMemo(() => {
    const l = bom.lines.map((line, i) => ({ line, i }));
    l.sort((a, b) => (compare(a.line, b.line, sort.key) || a.i - b.i) * (sort.dir === 'asc' ? 1 : -1));
    return l;
  }, [bom, sort]);

  const header = (key: SortKey, text: string, className = '') => {
    const active = sort.key === key;
    return (
      <th scope="col" className={`px-2 py-1.5 font-semibold ${className}`} aria-sort={active ? (sort.dir === 'asc' ? 'ascending' : 'descending') : 'none'}>
        {sortable ? (
          <button
            type="button"
            className="inline-flex items-center gap-1 hover:underline"
            onClick={() => setSort(active ? { key, dir: sort.dir === 'asc' ? 'desc' : 'asc' } : { key, dir: 'asc' })}
          >
            {text}
            <span aria-hidden="true" className="text-graphite-400">{active ? (sort.dir === 'asc' ? '▲' : '▼') : '↕'}</span>
          </button>
        ) : (
          text
        )}
      </th>
    );
  };

  if (bom.lines.length === 0) return <p className="text-[13px] text-graphite-600">Nothing to order yet: the diagram has no bank material.</p>;
  return (
    <div className="space-y-3">
      <table className="w-full border-collapse text-left text-[12px]" aria-label="Bill of materials">
        <thead className="border-b border-graphite-300 bg-graphite-50 text-graphite-700">
          <tr>
            {header('category', 'Category')}
            {header('description', 'Description')}
            {header('quantity', 'Quantity', 'text-right')}
            <th scope="col" className="px-2 py-1.5 font-semibold">Unit</th>
            <th scope="col" className="px-2 py-1.5 font-semibold">Parts</th>
          </tr>
        </thead>
        <tbody>
          {lines.map(({ line, i }) => {
            const key = `${line.category}:${i}`;
            const expanded = open.has(key);
            return (
              <tr key={key} className="border-b border-graphite-100 align-top" data-category={line.category}>
                <td className="px-2 py-1 whitespace-nowrap">{BOM_CATEGORY_NAMES[line.category]}</td>
                <td className="px-2 py-1">
                  {line.description}
                  {line.cuts?.length ? (
                    <div className="mt-0.5">
                      <button
                        type="button"
                        className="text-[11px] text-copper-700 underline print:hidden"
                        aria-expanded={expanded}
                        onClick={() => setOpen((s) => {
                          const n = new Set(s);
                          if (n.has(key)) n.delete(key);
                          else n.add(key);
                          return n;
                        })}
                      >
                        {expanded ? 'Hide' : 'Show'} cut list ({line.cuts.length})
                      </button>
                      <ul className={`mt-0.5 space-y-px font-mono text-[11px] text-graphite-600 ${expanded ? '' : 'hidden print:block'}`} aria-label={`Cut list: ${line.description}`}>
                        {line.cuts.map((c) => (
                          <li key={c.id}>
                            {c.label}: {qty(c.length)} {line.unit} → cut {qty(c.cutLength)} {line.unit}
                          </li>
                        ))}
                      </ul>
                    </div>
                  ) : null}
                </td>
                <td className="px-2 py-1 text-right font-mono tabular-nums">{qty(line.quantity)}</td>
                <td className="px-2 py-1">{line.unit}</td>
                <td className="px-2 py-1 text-[11px] text-graphite-600">{line.parts.map((p) => p.label).join('; ')}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <table className="text-[12px]" aria-label="Totals by category">
        <caption className="pb-1 text-left font-semibold text-graphite-700">Totals</caption>
        <tbody>
          {bom.totals.map((t) => (
            <tr key={t.category} data-total={t.category}>
              <th scope="row" className="pr-4 text-left font-medium">{BOM_CATEGORY_NAMES[t.category]}</th>
              <td className="pr-1 text-right font-mono tabular-nums">{qty(t.quantity)}</td>
              <td className="pr-4">{t.unit}</td>
              <td className="text-graphite-500">{t.lines} line{t.lines === 1 ? '' : 's'}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="text-[11px] text-graphite-500">
        Cut lengths include {qty(bom.cutAllowancePerEnd_m * 1000)} mm at each end. {bom.caution}
      </p>
    </div>
  );
}
