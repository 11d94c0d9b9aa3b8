import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { ReactFlowProvider } from '@xyflow/react';
import { describe, expect, it } from 'vitest';
import { postToPostTemplate } from '@shared/diagram/templates';
import { Palette } from '@/features/editor/Palette';
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

function renderPalette() {
  mockApi({
    'GET /api/diagrams/d-1': { body: { diagram: { id: 'd-1', teamId: 't-north', projectId: 'p-1' }, role: 'designer' } },
    'GET /api/teams/t-north/library': { body: { items: [battery, cable] } },
  });
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  const router = createMemoryRouter(
    [{ path: '/diagrams/:diagramId', element: <ReactFlowProvider><Palette /></ReactFlowProvider> }],
    { initialEntries: ['/diagrams/d-1'] },
  );
  render(<QueryClientProvider client={client}><RouterProvider router={router} /></QueryClientProvider>);
}

describe('team library in the palette', () => {
  it('places a battery preset with its props, make and model', async () => {
    resetEditor();
    renderPalette();
    const user = userEvent.setup();
    const group = await screen.findByRole('region', { name: 'Team library' });
    await user.click(await within(group).findByRole('button', { name: /^LFP 200 Ah house/ }));
    const [part] = editor().doc.parts;
    expect(part.type).toBe('battery');
    expect(part.props).toEqual({ chemistry: 'lfp', nominal_V: 12.8, capacity_Ah: 200, r_internal_ohm: 0.0025, soc: 1, model: 'Tidewater Cells TW-LF200' });
  });

  it('applies a cable preset to the selected cables only, in one undo step; disabled with none selected', async () => {
    const doc = postToPostTemplate({ count: 2, takeOff: 'diagonal', name: 'Preset bank' });
    resetEditor(doc);
    renderPalette();
    const user = userEvent.setup();
    const button = await screen.findByRole('button', { name: /^Welding flex 35 mm²/ });
    expect(button).toBeDisabled();
    const [first, second] = editor().doc.cables;
    const untouched = structuredClone(editor().doc.cables.slice(2));
    editor().select([first.id, second.id]);
    expect(await screen.findByRole('button', { name: /Apply to the 2 selected cables/ })).toBeEnabled();
    const lengths = [first.props.length_m, second.props.length_m];
    const steps = editor().past.length;
    await user.click(button);
    const [a, b] = editor().doc.cables;
    for (const c of [a, b]) expect(c.props).toMatchObject({ conductor: { system: 'mm2', size: 35 }, insulation_C: 105, material: 'copper' });
    expect([a.props.length_m, b.props.length_m]).toEqual(lengths);
    expect(editor().doc.cables.slice(2)).toEqual(untouched);
    expect(editor().past.length).toBe(steps + 1);
  });
});
