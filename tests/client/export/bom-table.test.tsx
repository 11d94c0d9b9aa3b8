/** The bill-of-materials table: totals against counts made here from the template, sorting, CSV. */
import { describe, expect, it, vi } from 'vitest';
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { busbarBankTemplate } from '@shared/diagram';
import { billOfMaterials } from '@shared/diagram/bom';
import { BomCsvButtons, BomTable } from '@/features/bom/BomTable';

const doc = busbarBankTemplate({ count: 3, batteryCable_m: 1.2, mainCable_m: 2 });
const bom = billOfMaterials(doc, { unitSystem: 'metric' });

function totalRow(name: string) {
  const row = within(screen.getByRole('table', { name: 'Totals by category' })).getByRole('row', { name: new RegExp(`^${name}`) });
  return within(row).getAllByRole('cell').map((c) => c.textContent);
}

describe('BomTable', () => {
  it('shows totals equal to the counts of the diagram', () => {
    render(<BomTable bom={bom} />);
    // Counted here from the document, not from the BOM code.
    const batteries = doc.parts.filter((p) => p.type === 'battery').length;
    const fuses = doc.parts.filter((p) => p.type === 'fuse').length;
    const busbars = doc.parts.filter((p) => p.type === 'busbar').length;
    const cables = doc.cables.filter((c) => c.props.length_m > 0);
    const lugs = 2 * cables.length; // one crimp lug on each end of each cable (docs/bill-of-materials.md)
    // Cut length: each cable plus 0.05 m at each end, each conductor group rounded up to 0.1 m.
    const byConductor = new Map<string, number>();
    for (const c of cables) {
      const k = `${c.props.conductor.system}:${c.props.conductor.size}|${c.props.material}|${c.props.insulation_C}`;
      byConductor.set(k, (byConductor.get(k) ?? 0) + c.props.length_m + 0.1);
    }
    const metres = [...byConductor.values()].reduce((s, m) => s + Math.ceil(m * 10 - 1e-9) / 10, 0);

    expect(batteries).toBe(3);
    expect(totalRow('Batteries').slice(0, 2)).toEqual([String(batteries), 'pcs']);
    expect(totalRow('Fuses').slice(0, 2)).toEqual([String(fuses), 'pcs']);
    expect(totalRow('Busbars').slice(0, 2)).toEqual([String(busbars), 'pcs']);
    expect(totalRow('Lugs').slice(0, 2)).toEqual([String(lugs), 'pcs']);
    expect(Number(totalRow('Cables')[0])).toBeCloseTo(metres, 6);
    expect(totalRow('Cables')[1]).toBe('m');
  });

  it('shows each line\'s parts by label and category by name, as the CSV lists them', async () => {
    render(<BomTable bom={bom} />);
    const table = screen.getByRole('table', { name: 'Bill of materials' });
    const rows = within(table).getAllByRole('row').slice(1).map((r) => within(r).getAllByRole('cell').map((c) => c.textContent));
    const { bomToCsv, parseCsv } = await import('@shared/diagram/csv');
    const parsed = parseCsv(bomToCsv(bom));
    if (!parsed.ok) throw new Error(parsed.error.message);
    const csv = parsed.records.slice(1, -1).map((r) => r.fields);
    expect(rows.map((r) => [r[0], r[4]])).toEqual(csv.map((r) => [r[0], r[4]]));
    expect(rows.map((r) => r[0])).toContain('Fuse holders');
    expect(rows.find((r) => r[0] === 'Batteries')![4]).toBe('Battery 1; Battery 2; Battery 3');
  });

  it('sorts by quantity and back', async () => {
    const user = userEvent.setup();
    render(<BomTable bom={bom} />);
    const table = screen.getByRole('table', { name: 'Bill of materials' });
    const quantities = () => within(table).getAllByRole('row').slice(1).map((r) => Number(within(r).getAllByRole('cell')[2].textContent));
    await user.click(within(table).getByRole('button', { name: /Quantity/ }));
    const asc = quantities();
    expect(asc).toEqual([...asc].sort((a, b) => a - b));
    expect(within(table).getByRole('columnheader', { name: /Quantity/ })).toHaveAttribute('aria-sort', 'ascending');
    await user.click(within(table).getByRole('button', { name: /Quantity/ }));
    const desc = quantities();
    expect(desc).toEqual([...asc].sort((a, b) => b - a));
    await user.click(within(table).getByRole('button', { name: /Category/ }));
    expect(within(within(table).getAllByRole('row')[1]).getAllByRole('cell')[0]).toHaveTextContent('Batteries');
  });

  it('downloads the lines as CSV', async () => {
    const user = userEvent.setup();
    const blobs: Blob[] = [];
    vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => {
      blobs.push(b as Blob);
      return 'blob:test';
    });
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => {});
    const clicks: string[] = [];
    vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
      clicks.push(this.download);
    });
    render(<BomCsvButtons bom={bom} baseName="bank" />);
    await user.click(screen.getByRole('button', { name: 'Download CSV' }));
    expect(clicks).toEqual(['bank-bill-of-materials.csv']);
    const text = await blobs[0].text();
    const lines = text.trim().split('\r\n');
    expect(lines[0]).toBe('Category,Description,Quantity,Unit,Parts,Part ids');
    expect(lines.filter((l) => l.startsWith('Batteries,'))).toHaveLength(1);
    expect(lines.at(-1)).toMatch(/^Note,/);
  });
});
