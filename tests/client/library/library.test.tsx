import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { apiError, meWith, mockApi, renderApp } from '../helpers';

const fuse = {
  id: 'li-1', teamId: 't-north', kind: 'fuse', name: 'Class T 300 A', manufacturer: 'Breakwater Protection', partNumber: 'BW-T300',
  props: { fuseClass: 'class_t', rating_A: 300, voltage_rating_V: 160, interrupting_A: 20000 },
  createdAt: '2025-03-01T10:00:00Z', updatedAt: '2025-03-02T10:00:00Z', updatedBy: { id: 'u-dana', name: 'Dana Whitlock' },
};
const cable = {
  ...fuse, id: 'li-2', kind: 'cable', name: 'Tinned flex 2/0', manufacturer: '', partNumber: '',
  props: { conductor: { system: 'awg', size: '2/0' }, material: 'copper', stranding: 'flexible', insulation_C: 105 },
};

const CSV = [
  'kind,name,chemistry,nominal_V,capacity_Ah,r_internal_ohm,conductor',
  'battery,Spare LFP 50 Ah,lfp,12.8,50,0.008,',
  'battery,Comma battery,lfp,"12,8",100,0.004,',
  'cable,Bare number cable,,,,,35',
  'cable,Flex 6 AWG,,,,,6 AWG',
].join('\n');

function setup(role: string, importAnswer?: (body: { csv: string; mode: string }) => { status?: number; body?: unknown }) {
  return mockApi({
    'GET /api/auth/me': { body: meWith([{ id: 't-north', name: 'North Shore Off-Grid', role }]) },
    'GET /api/teams/t-north/library': { body: { items: [cable, fuse] } },
    'POST /api/teams/t-north/library/import': ({ body }) => importAnswer?.(body as { csv: string; mode: string }) ?? { body: { imported: 0, created: 0, updated: 0, rows: [] } },
  });
}

async function pickCsv(text: string) {
  const user = userEvent.setup();
  await user.click(await screen.findByRole('button', { name: 'Import CSV…' }));
  const dialog = await screen.findByRole('dialog', { name: 'Import parts from CSV' });
  await user.upload(within(dialog).getByLabelText('CSV file'), new File([text], 'parts.csv', { type: 'text/csv' }));
  return { user, dialog };
}

describe('parts library page', () => {
  it('lists presets by kind with their ratings; a viewer gets export only', async () => {
    setup('viewer');
    renderApp('/teams/t-north/library');
    const cables = await screen.findByRole('table', { name: /Cables/ });
    expect(within(cables).getByText('Tinned flex 2/0')).toBeInTheDocument();
    expect(within(cables).getByText('2/0 AWG · copper · flexible · 105 °C')).toBeInTheDocument();
    const fuses = screen.getByRole('table', { name: /Fuses/ });
    expect(within(fuses).getByText('Class T · 300 A · 160 V DC · 20000 A interrupting')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Export CSV' })).toHaveAttribute('href', '/api/teams/t-north/library/export');
    expect(screen.queryByRole('button', { name: 'Import CSV…' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /^Edit / })).not.toBeInTheDocument();
  });

  it('shows the row-by-row report before importing; "Import nothing" sends nothing', async () => {
    const fetchMock = setup('designer');
    renderApp('/teams/t-north/library');
    const { user, dialog } = await pickCsv(CSV);
    const report = await within(dialog).findByRole('table', { name: 'Rows with errors' });
    const rows = within(report).getAllByRole('row').slice(1);
    expect(rows.map((r) => within(r).getAllByRole('cell').map((c) => c.textContent))).toEqual([
      ['2', '3', 'nominal_V', '"12,8" is not a number; use a decimal point (e.g. 12.8)'],
      ['3', '4', 'conductor', expect.stringContaining('"35"')],
    ]);
    expect(within(dialog).getByText(/2 rows with errors, 2 valid rows/)).toBeInTheDocument();
    await user.click(within(dialog).getByRole('button', { name: 'Import nothing' }));
    expect(screen.queryByRole('dialog')).not.toBeInTheDocument();
    expect(fetchMock.mock.calls.some(([url]) => String(url).endsWith('/import'))).toBe(false);
  });

  it('imports the valid rows with mode valid_rows and reports what was skipped', async () => {
    const sent: { csv: string; mode: string }[] = [];
    setup('owner', (body) => {
      sent.push(body);
      return { body: { imported: 2, created: 2, updated: 0, rows: [{ row: 2, line: 3, errors: [] }, { row: 3, line: 4, errors: [] }] } };
    });
    renderApp('/teams/t-north/library');
    const { user, dialog } = await pickCsv(CSV);
    await user.click(await within(dialog).findByRole('button', { name: 'Import the 2 valid rows' }));
    expect(await within(dialog).findByText(/2 items imported \(2 added, 0 updated\); 2 rows with errors skipped/)).toBeInTheDocument();
    expect(sent).toEqual([{ csv: CSV, mode: 'valid_rows' }]);
  });

  it('a clean file imports whole (all_or_nothing); the server report is shown when it refuses', async () => {
    const sent: string[] = [];
    setup('designer', (body) => {
      sent.push(body.mode);
      return apiError(422, 'import_failed', '1 row has errors, so nothing was imported.', {
        rows: [{ row: 1, line: 2, errors: [{ column: 'name', message: 'Name taken on the server' }] }],
        validCount: 0,
      });
    });
    renderApp('/teams/t-north/library');
    const { user, dialog } = await pickCsv('kind,name,conductor\ncable,Flex 6 AWG,6 AWG\n');
    expect(await within(dialog).findByText(/1 row ready to import, no errors/)).toBeInTheDocument();
    await user.click(within(dialog).getByRole('button', { name: 'Import 1 row' }));
    const report = await within(dialog).findByRole('table', { name: 'Rows with errors' });
    expect(within(report).getByText('Name taken on the server')).toBeInTheDocument();
    expect(sent).toEqual(['all_or_nothing']);
  });

  it('adds a fuse through the form: fields of its kind, checked before sending', async () => {
    const posted: unknown[] = [];
    mockApi({
      'GET /api/auth/me': { body: meWith([{ id: 't-north', name: 'North Shore Off-Grid', role: 'designer' }]) },
      'GET /api/teams/t-north/library': { body: { items: [] } },
      'POST /api/teams/t-north/library': ({ body }) => {
        posted.push(body);
        return { status: 201, body: { item: { ...fuse, ...(body as object), id: 'li-9' } } };
      },
    });
    renderApp('/teams/t-north/library');
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: /Add part/ }));
    const form = await screen.findByRole('form', { name: 'New library item' });
    await user.selectOptions(within(form).getByLabelText('Kind'), 'fuse');
    await user.type(within(form).getByLabelText('Name'), 'ANL 150 A');
    await user.clear(within(form).getByLabelText('Rating (A)'));
    await user.click(within(form).getByRole('button', { name: 'Add to library' }));
    expect(await within(form).findByText('Required')).toBeInTheDocument();
    expect(posted).toHaveLength(0);
    await user.type(within(form).getByLabelText('Rating (A)'), '150');
    await user.selectOptions(within(form).getByLabelText('Class'), 'anl');
    await user.click(within(form).getByRole('button', { name: 'Add to library' }));
    await waitFor(() => expect(posted).toHaveLength(1));
    expect(posted[0]).toMatchObject({ kind: 'fuse', name: 'ANL 150 A', props: { fuseClass: 'anl', rating_A: 150 } });
  });
});
