import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { describe, expect, it } from 'vitest';
import { postToPostTemplate } from '@shared/diagram/templates';
import { PropertiesPanel } from '@/features/editor/properties/PropertiesPanel';
import { editor, resetEditor } from '../editor/flow-mocks';
import { mockApi } from '../helpers';

const at = '2025-03-01T10:00:00Z';
const battery = {
  id: 'li-b', teamId: 't-north', kind: 'battery', name: 'LFP 200 Ah house', manufacturer: 'Tidewater Cells', partNumber: 'TW-LF200',
  props: { chemistry: 'lfp', nominal_V: 12.8, capacity_Ah: 200, r_internal_ohm: 0.0025, soc: 1 }, createdAt: at, updatedAt: at, updatedBy: null,
};
const cable = {
  ...battery, id: 'li-c', kind: 'cable', name: 'Welding flex 35 mm²', manufacturer: '', partNumber: '',
  props: { conductor: { system: 'mm2', size: 35 }, material: 'copper', stranding: 'flexible', insulation_C: 105 },
};

function renderPanel() {
  mockApi({
    'GET /api/diagrams/d-1': { body: { diagram: { id: 'd-1', teamId: 't-north', projectId: 'p-1' }, role: 'designer' } },
    'GET /api/teams/t-north/library': { body: { items: [battery, cable] } },
  });
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  const router = createMemoryRouter([{ path: '/diagrams/:diagramId', element: <PropertiesPanel /> }], { initialEntries: ['/diagrams/d-1'] });
  render(<QueryClientProvider client={client}><RouterProvider router={router} /></QueryClientProvider>);
}

describe('team library in the properties panel', () => {
  it('applies a battery preset to the selected battery, keeping its state of charge, in one undo step', async () => {
    const doc = postToPostTemplate({ count: 2, takeOff: 'diagonal', name: 'Preset bank' });
    const target = doc.parts.find((p) => p.type === 'battery')!;
    (target.props as { soc: number }).soc = 0.6;
    resetEditor(doc);
    editor().select([target.id]);
    renderPanel();
    const user = userEvent.setup();
    const steps = editor().past.length;
    await user.selectOptions(await screen.findByLabelText('Team library'), 'LFP 200 Ah house');
    const after = editor().doc.parts.find((p) => p.id === target.id)!;
    expect(after.props).toMatchObject({ chemistry: 'lfp', capacity_Ah: 200, r_internal_ohm: 0.0025, soc: 0.6 });
    expect(editor().past.length).toBe(steps + 1);
  });

  it('applies a cable preset to the selected cable, keeping its length', async () => {
    const doc = postToPostTemplate({ count: 2, takeOff: 'diagonal', name: 'Preset bank' });
    const target = doc.cables[0];
    resetEditor(doc);
    editor().select([target.id]);
    renderPanel();
    const user = userEvent.setup();
    await user.selectOptions(await screen.findByLabelText('Team library'), 'Welding flex 35 mm²');
    const after = editor().doc.cables.find((c) => c.id === target.id)!;
    expect(after.props).toMatchObject({ conductor: { system: 'mm2', size: 35 }, insulation_C: 105, length_m: target.props.length_m });
  });
});
