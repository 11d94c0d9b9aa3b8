import { act, render as renderDom, screen } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import type { ReactElement } from 'react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate, type DiagramPart } from '@shared/diagram';
import { PropertiesPanel } from '@/features/editor/properties/PropertiesPanel';
import { editor, resetEditor } from './flow-mocks';

// The panel reads the team parts library (server state); no diagram route here, so it offers none.
const render = (ui: ReactElement) => renderDom(<QueryClientProvider client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}>{ui}</QueryClientProvider>);

const battery = (id = 'bat1') => editor().doc.parts.find((p) => p.id === id) as Extract<DiagramPart, { type: 'battery' }>;
const cable = (id: string) => editor().doc.cables.find((c) => c.id === id)!;

function openOn(id: string | null, unitSystem: 'metric' | 'us' = 'metric') {
  resetEditor(postToPostTemplate({ count: 2, takeOff: 'diagonal' }), { unitSystem });
  if (id) act(() => editor().select([id]));
  render(<PropertiesPanel />);
}

describe('properties panel: battery', () => {
  it("edits a battery's capacity, typing coalescing into one undo step", async () => {
    openOn('bat1');
    const user = userEvent.setup();
    const field = screen.getByLabelText('Capacity');
    expect(field).toHaveValue('100');
    const steps = editor().past.length;
    await user.clear(field);
    await user.type(field, '230');
    expect(battery().props.capacity_Ah).toBe(230);
    expect(editor().past.length).toBe(steps + 1);
    act(() => editor().undo());
    expect(battery().props.capacity_Ah).toBe(100);
  });

  it('shows a field error naming the field for a bad value and does not commit it', async () => {
    openOn('bat1');
    const user = userEvent.setup();
    const field = screen.getByLabelText('Capacity');
    await user.clear(field);
    await user.type(field, '-5');
    expect(field).toHaveAttribute('aria-invalid', 'true');
    expect(screen.getByText('Capacity must be more than 0 Ah')).toBeInTheDocument();
    expect(battery().props.capacity_Ah).toBe(100);
    await user.clear(field);
    await user.type(field, 'lots');
    expect(screen.getByText('Capacity must be a number (Ah)')).toBeInTheDocument();
  });

  it('shows internal resistance in mΩ and stores ohms', async () => {
    openOn('bat1');
    const user = userEvent.setup();
    const field = screen.getByLabelText('Internal resistance');
    await user.clear(field);
    await user.type(field, '3.5');
    expect(battery().props.r_internal_ohm).toBeCloseTo(0.0035, 10);
  });
});

describe('properties panel: cable', () => {
  it('accepts "2/0" and "35 mm²" as conductor sizes', async () => {
    openOn('j-pos-1');
    const user = userEvent.setup();
    const field = screen.getByLabelText('Conductor size');
    await user.clear(field);
    await user.type(field, '2/0');
    expect(cable('j-pos-1').props.conductor).toEqual({ system: 'awg', size: '2/0' });
    await user.clear(field);
    await user.type(field, '35 mm²');
    expect(cable('j-pos-1').props.conductor).toEqual({ system: 'mm2', size: 35 });
  });

  it('reads "12 ft" as metres and a bare number in the team unit', async () => {
    openOn('c-main-neg', 'us');
    const user = userEvent.setup();
    const field = screen.getByLabelText('Length (one conductor)');
    await user.clear(field);
    await user.type(field, '12 ft');
    // 12 ft × 0.3048 m/ft (international foot, exact)
    expect(cable('c-main-neg').props.length_m).toBeCloseTo(3.6576, 9);
    await user.clear(field);
    await user.type(field, '10');
    expect(cable('c-main-neg').props.length_m).toBeCloseTo(3.048, 9);
    await user.clear(field);
    await user.type(field, '3.5 m');
    expect(cable('c-main-neg').props.length_m).toBeCloseTo(3.5, 9);
  });

  it("shows lengths in the team's unit system", () => {
    openOn('c-main-neg', 'us');
    // The template's 2 m main cable: 2 / 0.3048 = 6.56 ft.
    expect(screen.getByLabelText('Length (one conductor)')).toHaveValue('6.6 ft');
    expect(screen.getByText(/US customary/)).toBeInTheDocument();
  });

  it('shows metric lengths for a metric team', () => {
    openOn('c-main-neg', 'metric');
    expect(screen.getByLabelText('Length (one conductor)')).toHaveValue('2.00 m');
  });

  it('applies a conductor preset', async () => {
    openOn('j-pos-1');
    const user = userEvent.setup();
    await user.selectOptions(screen.getByLabelText('Conductor size presets'), 'mm2-50');
    expect(cable('j-pos-1').props.conductor).toEqual({ system: 'mm2', size: 50 });
  });
});

describe('properties panel: bank settings and roles', () => {
  it('edits the bank settings when nothing is selected, with the ambient in °F for a US team', async () => {
    openOn(null, 'us');
    expect(screen.getByRole('heading', { name: 'Bank settings' })).toBeInTheDocument();
    const ambient = screen.getByLabelText('Ambient temperature');
    // 30 °C = 86 °F
    expect(ambient).toHaveValue('86 °F');
    const user = userEvent.setup();
    await user.clear(ambient);
    await user.type(ambient, '104');
    // 104 °F = 40 °C
    expect(editor().doc.settings.ambient_C).toBeCloseTo(40, 9);
    const drop = screen.getByLabelText('Voltage-drop limit');
    await user.clear(drop);
    await user.type(drop, '0');
    expect(screen.getByText('Voltage-drop limit must be more than 0 %')).toBeInTheDocument();
  });

  it('disables every field for a read-only role', () => {
    resetEditor(postToPostTemplate({ count: 2, takeOff: 'diagonal' }), { readOnly: true });
    act(() => editor().select(['bat1']));
    render(<PropertiesPanel />);
    expect(screen.getByLabelText('Capacity')).toBeDisabled();
    expect(screen.queryByRole('button', { name: 'Delete selection' })).not.toBeInTheDocument();
  });
});

describe('properties panel: current limits, surge and fuse sides', () => {
  function openBusbarOn(id: string, edit?: (d: ReturnType<typeof busbarBankTemplate>) => void) {
    const doc = busbarBankTemplate({ count: 2 });
    edit?.(doc);
    resetEditor(doc, { unitSystem: 'metric' });
    act(() => editor().select([id]));
    render(<PropertiesPanel />);
  }
  const inverter = () => editor().doc.parts.find((p) => p.type === 'inverter') as Extract<DiagramPart, { type: 'inverter' }>;

  it('edits a battery\u2019s pulse current and duration, reading "1.2 kA" and "500 ms"', async () => {
    openOn('bat1');
    const user = userEvent.setup();
    const pulse = screen.getByLabelText('Max pulse current');
    // A new 100 Ah LFP battery: 2C = 200 A for 5 s (common practice, from memory).
    expect(pulse).toHaveValue('200');
    expect(screen.getByLabelText('Pulse duration')).toHaveValue('5');
    await user.clear(pulse);
    await user.type(pulse, '1.2 kA');
    expect(battery().props.max_pulse_A).toBe(1200);
    const duration = screen.getByLabelText('Pulse duration');
    await user.clear(duration);
    await user.type(duration, '500 ms');
    expect(battery().props.pulse_s).toBe(0.5);
  });

  it('says what an empty pulse field stands for', async () => {
    openOn('bat1');
    const user = userEvent.setup();
    await user.clear(screen.getByLabelText('Max pulse current'));
    expect(battery().props.max_pulse_A).toBeUndefined();
    // 2C × 100 Ah for LFP (common practice, from memory).
    expect(screen.getByText(/when empty, 200 A, typical for Lithium iron phosphate/)).toBeInTheDocument();
  });

  it('edits an inverter\u2019s surge, reading "4.5 kW"; empty, it is 2 × the continuous rating for 5 s', async () => {
    const inv = busbarBankTemplate({ count: 2 }).parts.find((p) => p.type === 'inverter')!;
    openBusbarOn(inv.id);
    const user = userEvent.setup();
    const rated = inverter().props.rated_W ?? inverter().props.power_W;
    // 2 × the continuous rating for 5 s when not given (common practice, from memory).
    expect(screen.getByText(`Optional; when empty, ${2 * rated} W (2 × the continuous rating, common practice)`)).toBeInTheDocument();
    expect(screen.getByText('Optional; when empty, 5 s (common practice)')).toBeInTheDocument();
    const surge = screen.getByLabelText('Surge power');
    await user.type(surge, '4.5 kW');
    expect(inverter().props.surge_W).toBe(4500);
    await user.type(screen.getByLabelText('Surge duration'), '3');
    expect(inverter().props.surge_s).toBe(3);
  });

  it('names a fuse\u2019s terminals for what they face in the cable\u2019s end pickers', () => {
    // The template's link from Battery 1's post to Fuse 1: terminal a is the battery side, b the bank side.
    openBusbarOn('c-fuse1');
    const to = screen.getByLabelText('To') as HTMLSelectElement;
    expect(to.selectedOptions[0].textContent).toBe('Fuse 1 · battery side');
    const labels = [...to.options].map((o) => o.textContent);
    expect(labels).toContain('Fuse 1 · bank side');
    expect(labels.some((l) => /Fuse 1 · (a|b)$/.test(l ?? ''))).toBe(false);
  });
});

describe('properties panel: the ampacity derating chain', () => {
  it('shows a bundled cable\u2019s ampacity factor by factor', async () => {
    openOn('j-pos-1', 'us');
    const user = userEvent.setup();
    await user.selectOptions(screen.getByLabelText('Installation'), 'bundled');
    const chain = screen.getByTestId('ampacity-chain');
    // 4 to 6 current-carrying conductors bundled: 80 % (NEC 310.15(C)(1)); 4 is assumed when no count is given.
    expect(chain).toHaveTextContent(/× 0\.80/);
    expect(chain).toHaveTextContent(/NEC 310\.15\(C\)\(1\)/);
    expect(chain).toHaveTextContent(/NEC 310\.16, 75 °C copper, 75 °C column/);
  });
});
