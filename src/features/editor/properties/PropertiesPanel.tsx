/**
 * The Properties tab: the selected part or cable, or the bank-wide settings when nothing is selected.
 * Values are validated by the core's zod schemas; units follow the team's system and accept either.
 */
import { memo, useCallback, useId, useMemo } from 'react';
import { useShallow } from 'zustand/react/shallow';
import { cableSchema, settingsSchema, terminalsOf, type DiagramCable, type DiagramPart } from '@shared/diagram';
import {
  BATTERY_PRESETS, CONDUCTOR_PRESETS, FUSE_PRESETS, PART_TYPES, TYPICAL_SURGE_FACTOR, batteryMaxPulse_A, batteryPulse_s,
  cableRunPropsSchema, inverterSurge_s, inverterSurge_W, type BatteryProps, type InverterProps, type PartType,
} from '@shared/electrical/parts';
import { CHEMISTRIES, CHEMISTRY_IDS } from '@shared/electrical/tables/batteries';
import { FUSE_CLASSES, FUSE_CLASS_IDS, STANDARD_FUSE_RATINGS_A } from '@shared/electrical/tables/fuses';
import { AMPACITY_TABLES, AMPACITY_TABLE_IDS } from '@shared/electrical/tables/ampacity';
import { cableAmpacity } from '@shared/electrical/analysis/context';
import type { UnitSystem } from '@shared/units';
import { Button } from '@/components/Button';
import { TrashIcon } from '@/components/icons';
import { useTeamLibrary } from '../Palette';
import { useEditorStore } from '../store';
import { DraftField, PresetSelect, SpecForm, getPath, type FieldSpec } from './fields';

/** What an empty battery limit field stands for: the chemistry's typical figure (common practice, from memory). */
function batteryLimitHint(prefix: string, pick: (b: BatteryProps) => string) {
  return (whole: unknown): string | undefined => {
    const b = (prefix ? getPath(whole, prefix.slice(0, -1)) : whole) as BatteryProps | undefined;
    return b?.chemistry && b.capacity_Ah > 0 ? `Optional; when empty, ${pick(b)}, typical for ${CHEMISTRIES[b.chemistry].name} (from the battery's own data where it gives one)` : 'Optional';
  };
}

const inverterHint = (pick: (p: InverterProps) => string) => (whole: unknown) => {
  const p = whole as InverterProps;
  return p && p.power_W !== undefined ? `Optional; when empty, ${pick(p)}` : 'Optional';
};

const chemistryOptions = CHEMISTRY_IDS.map((id) => ({ value: id, label: CHEMISTRIES[id].name }));

const batteryFields = (prefix = ''): FieldSpec[] => [
  { kind: 'select', key: `${prefix}chemistry`, label: 'Chemistry', options: chemistryOptions },
  { kind: 'number', key: `${prefix}capacity_Ah`, label: 'Capacity', unit: 'Ah', suggestions: [50, 100, 200, 280, 300] },
  { kind: 'number', key: `${prefix}nominal_V`, label: 'Nominal voltage', unit: 'V' },
  { kind: 'number', key: `${prefix}r_internal_ohm`, label: 'Internal resistance', unit: 'mΩ', scale: 1000 },
  { kind: 'number', key: `${prefix}soc`, label: 'State of charge', unit: '%', scale: 100 },
  { kind: 'number', key: `${prefix}restingVoltage_V`, label: 'Measured resting voltage', unit: 'V', optional: true },
  { kind: 'number', key: `${prefix}max_continuous_A`, label: 'Max continuous current', unit: 'A', optional: true },
  { kind: 'number', key: `${prefix}max_c_rate`, label: 'Max C-rate', unit: 'C', optional: true },
  {
    kind: 'number', key: `${prefix}max_pulse_A`, label: 'Max pulse current', unit: 'A', optional: true,
    hint: batteryLimitHint(prefix, (b) => `${Math.round(batteryMaxPulse_A({ ...b, max_pulse_A: undefined }))} A`),
  },
  {
    kind: 'number', key: `${prefix}pulse_s`, label: 'Pulse duration', unit: 's', optional: true,
    hint: batteryLimitHint(prefix, (b) => `${batteryPulse_s({ ...b, pulse_s: undefined })} s`),
  },
  { kind: 'number', key: `${prefix}short_circuit_A`, label: 'Short-circuit current (datasheet)', unit: 'A', optional: true },
  { kind: 'number', key: `${prefix}cells_in_series`, label: 'Cells in series', optional: true, integer: true },
  { kind: 'text', key: `${prefix}model`, label: 'Make and model', optional: true },
  { kind: 'date', key: `${prefix}installDate`, label: 'Install date', optional: true },
  { kind: 'number', key: `${prefix}age_years`, label: 'Age', unit: 'years', optional: true },
];

const fuseRatingSuggestions = [...STANDARD_FUSE_RATINGS_A].filter((a) => a <= 1200);

export const PART_FIELDS: Record<PartType, FieldSpec[]> = {
  battery: batteryFields(),
  series_string: [
    { kind: 'number', key: 'count', label: 'Batteries in series', integer: true },
    ...batteryFields('member.').map((f) => ({ ...f, label: `Each battery: ${f.label.toLowerCase()}` })),
    { kind: 'conductor', key: 'interconnect.conductor', label: 'Interconnect conductor', presets: CONDUCTOR_PRESETS },
    { kind: 'length', key: 'interconnect.length_m', label: 'Interconnect length' },
  ],
  lug: [
    { kind: 'number', key: 'contact_ohm', label: 'Contact resistance', unit: 'µΩ', scale: 1e6 },
    { kind: 'text', key: 'stud', label: 'Stud size', optional: true },
  ],
  busbar: [
    { kind: 'number', key: 'tapCount', label: 'Taps', integer: true },
    { kind: 'select', key: 'material', label: 'Material', options: [{ value: 'copper', label: 'Copper' }, { value: 'aluminium', label: 'Aluminium' }] },
    { kind: 'number', key: 'width_mm', label: 'Width', unit: 'mm' },
    { kind: 'number', key: 'thickness_mm', label: 'Thickness', unit: 'mm' },
    { kind: 'number', key: 'area_mm2', label: 'Cross-section override', unit: 'mm²', optional: true },
    { kind: 'length', key: 'tapSpacing_m', label: 'Tap spacing' },
    { kind: 'number', key: 'rating_A', label: 'Rating', unit: 'A' },
  ],
  fuse: [
    { kind: 'select', key: 'fuseClass', label: 'Fuse class', options: FUSE_CLASS_IDS.map((id) => ({ value: id, label: FUSE_CLASSES[id].name })) },
    { kind: 'number', key: 'rating_A', label: 'Rating', unit: 'A', suggestions: fuseRatingSuggestions },
    { kind: 'number', key: 'voltage_rating_V', label: 'Voltage rating (DC)', unit: 'V' },
    { kind: 'number', key: 'interrupting_A', label: 'Interrupting rating', unit: 'A' },
    { kind: 'number', key: 'cold_r_ohm', label: 'Cold resistance', unit: 'mΩ', scale: 1000, optional: true },
  ],
  switch: [
    { kind: 'bool', key: 'closed', label: 'Closed (on)' },
    { kind: 'number', key: 'rating_A', label: 'Rating', unit: 'A' },
    { kind: 'number', key: 'contact_ohm', label: 'Contact resistance', unit: 'mΩ', scale: 1000 },
  ],
  shunt: [
    { kind: 'number', key: 'rating_A', label: 'Rating', unit: 'A' },
    { kind: 'number', key: 'drop_mV', label: 'Drop at rating', unit: 'mV', suggestions: [50, 75, 100] },
  ],
  inverter: [
    { kind: 'number', key: 'power_W', label: 'AC output power', unit: 'W' },
    { kind: 'number', key: 'rated_W', label: 'Continuous rating', unit: 'W', optional: true },
    { kind: 'number', key: 'efficiency', label: 'Efficiency', unit: '%', scale: 100 },
    { kind: 'number', key: 'cutoff_V', label: 'Low-voltage cut-off', unit: 'V', optional: true },
    {
      kind: 'number', key: 'surge_W', label: 'Surge power', unit: 'W', optional: true,
      hint: inverterHint((p) => `${inverterSurge_W({ ...p, surge_W: undefined })} W (${TYPICAL_SURGE_FACTOR} × the continuous rating, common practice)`),
    },
    {
      kind: 'number', key: 'surge_s', label: 'Surge duration', unit: 's', optional: true,
      hint: inverterHint((p) => `${inverterSurge_s({ ...p, surge_s: undefined })} s (common practice)`),
    },
  ],
  dc_load: [], // by mode, below
  charger: [
    { kind: 'bool', key: 'enabled', label: 'Charging (on)' },
    { kind: 'number', key: 'voltage_setpoint_V', label: 'Voltage setpoint', unit: 'V' },
    { kind: 'number', key: 'current_limit_A', label: 'Current limit', unit: 'A' },
    { kind: 'number', key: 'r_internal_ohm', label: 'Output resistance', unit: 'mΩ', scale: 1000 },
  ],
  note: [{ kind: 'textarea', key: 'text', label: 'Note text' }],
};

const DC_LOAD_FIELDS: Record<string, FieldSpec[]> = {
  current: [{ kind: 'number', key: 'current_A', label: 'Current', unit: 'A' }],
  resistance: [{ kind: 'number', key: 'r_ohm', label: 'Resistance', unit: 'Ω' }],
  power: [
    { kind: 'number', key: 'power_W', label: 'Power', unit: 'W' },
    { kind: 'number', key: 'cutoff_V', label: 'Low-voltage cut-off', unit: 'V', optional: true },
  ],
};

const CABLE_FIELDS: FieldSpec[] = [
  { kind: 'conductor', key: 'conductor', label: 'Conductor size', presets: CONDUCTOR_PRESETS },
  { kind: 'length', key: 'length_m', label: 'Length (one conductor)' },
  { kind: 'select', key: 'role', label: 'Role', options: [{ value: 'cable', label: 'Cable run' }, { value: 'jumper', label: 'Jumper (post to post)' }] },
  { kind: 'select', key: 'material', label: 'Material', options: [{ value: 'copper', label: 'Copper' }, { value: 'aluminium', label: 'Aluminium' }] },
  { kind: 'select', key: 'stranding', label: 'Stranding', options: [{ value: 'flexible', label: 'Fine-strand flexible' }, { value: 'concentric', label: 'Concentric' }, { value: 'solid', label: 'Solid' }] },
  { kind: 'select', key: 'insulation_C', label: 'Insulation rating', options: [60, 75, 90, 105].map((t) => ({ value: t, label: `${t} °C` })) },
  { kind: 'select', key: 'terminal_C', label: 'Lowest termination rating', options: [60, 75, 90].map((t) => ({ value: t, label: `${t} °C` })), optional: true },
  { kind: 'select', key: 'installation', label: 'Installation', options: [{ value: 'free_air', label: 'Free air' }, { value: 'bundled', label: 'Bundled' }, { value: 'engine_space', label: 'Engine or hot space' }] },
  { kind: 'number', key: 'bundledConductors', label: 'Conductors in the bundle', integer: true, optional: true },
  { kind: 'temperature', key: 'ambient_C', label: 'Ambient around this run', optional: true },
  { kind: 'select', key: 'resistanceBasis', label: 'Resistance from', options: [{ value: 'computed', label: 'Resistivity and area' }, { value: 'table', label: 'Published table value' }] },
  { kind: 'number', key: 'lugFrom_ohm', label: 'Lug joint at start', unit: 'µΩ', scale: 1e6, optional: true },
  { kind: 'number', key: 'lugTo_ohm', label: 'Lug joint at end', unit: 'µΩ', scale: 1e6, optional: true },
];

export const SETTINGS_FIELDS: FieldSpec[] = [
  { kind: 'number', key: 'systemVoltage_V', label: 'System voltage', unit: 'V', suggestions: [12, 24, 48] },
  { kind: 'number', key: 'designMargin', label: 'Design margin', unit: '×' },
  { kind: 'number', key: 'voltageDropLimit_pct', label: 'Voltage-drop limit', unit: '%' },
  { kind: 'select', key: 'ampacityTable', label: 'Ampacity table', options: AMPACITY_TABLE_IDS.map((id) => ({ value: id, label: AMPACITY_TABLES[id].name })) },
  { kind: 'temperature', key: 'ambient_C', label: 'Ambient temperature' },
  { kind: 'number', key: 'maxPostToPost', label: 'Most batteries post to post', integer: true },
  { kind: 'number', key: 'busbarLengthTolerance_pct', label: 'Equal-length tolerance', unit: '%' },
  { kind: 'number', key: 'imbalanceThreshold_pct', label: 'Current-share imbalance flagged above', unit: '%' },
  { kind: 'select', key: 'ruleSet', label: 'Protection rules', options: [{ value: 'general', label: 'General (NEC)' }, { value: 'marine', label: 'Marine (ABYC E-11)' }] },
];

function describePart(p: DiagramPart) {
  return p.label || `${PART_TYPES[p.type].name} ${p.id}`;
}

type PartPropertiesProps = { part: DiagramPart; unitSystem: UnitSystem; readOnly: boolean };

/** The form shows label and props only: a move (each frame of a drag) must not re-render it. */
const sameForm = (a: PartPropertiesProps, b: PartPropertiesProps) =>
  a.unitSystem === b.unitSystem && a.readOnly === b.readOnly && a.part.id === b.part.id && a.part.type === b.part.type && a.part.label === b.part.label && a.part.props === b.part.props;

const PartProperties = memo(function PartProperties({ part, unitSystem, readOnly }: PartPropertiesProps) {
  const updatePart = useEditorStore((s) => s.updatePart);
  const def = PART_TYPES[part.type];
  const specs = part.type === 'dc_load' ? DC_LOAD_FIELDS[part.props.mode] : PART_FIELDS[part.type];
  const onCommit = useCallback((props: unknown, key: string) => updatePart(part.id, { props }, `prop:${part.id}:${key}`), [part.id, updatePart]);
  const modeId = useId();
  return (
    <div className="space-y-3">
      <DraftField<string>
        label="Label"
        value={part.label}
        disabled={readOnly}
        format={(v) => v}
        parse={(t) => (t.length > 120 ? { ok: false, message: 'Label must be at most 120 characters' } : { ok: true, value: t })}
        onCommit={(v) => {
          updatePart(part.id, { label: v }, `label:${part.id}`);
          return null;
        }}
      />
      {!readOnly ? <TeamLibraryPresets kind={part.type} onPick={(props) => updatePart(part.id, { props: part.type === 'battery' ? { ...props, soc: part.props.soc } : props } as Partial<DiagramPart>)} /> : null}
      {part.type === 'battery' ? (
        <PresetSelect
          label="Battery presets"
          disabled={readOnly}
          options={BATTERY_PRESETS.map((p) => ({ id: p.id, label: p.label }))}
          onPick={(id) => {
            const p = BATTERY_PRESETS.find((x) => x.id === id);
            if (p) updatePart(part.id, { props: { ...p.props, soc: part.props.soc } });
          }}
        />
      ) : null}
      {part.type === 'fuse' ? (
        <PresetSelect
          label="Fuse presets"
          disabled={readOnly}
          options={FUSE_PRESETS.map((p) => ({ id: p.id, label: p.label }))}
          onPick={(id) => {
            const p = FUSE_PRESETS.find((x) => x.id === id);
            if (p) updatePart(part.id, { props: p.props });
          }}
        />
      ) : null}
      {part.type === 'dc_load' ? (
        <div className="bw-field">
          <label htmlFor={modeId} className="bw-field-label">
            Load model
          </label>
          <select
            id={modeId}
            className="bw-input"
            disabled={readOnly}
            value={part.props.mode}
            onChange={(e) => {
              const mode = e.target.value;
              const props = mode === 'current' ? { mode, current_A: 20 } : mode === 'power' ? { mode, power_W: 240 } : { mode, r_ohm: 1 };
              updatePart(part.id, { props });
            }}
          >
            <option value="current">Constant current</option>
            <option value="power">Constant power</option>
            <option value="resistance">Fixed resistance</option>
          </select>
        </div>
      ) : null}
      <SpecForm key={part.id + (part.type === 'dc_load' ? part.props.mode : '')} specs={specs} value={part.props} schema={def.schema} unitSystem={unitSystem} disabled={readOnly} onCommit={onCommit} />
    </div>
  );
}, sameForm);

function TerminalSelect({ label, value, options, onChange, disabled }: { label: string; value: string; options: { value: string; label: string }[]; onChange: (v: string) => void; disabled?: boolean }) {
  const id = useId();
  return (
    <div className="bw-field">
      <label htmlFor={id} className="bw-field-label">
        {label}
      </label>
      <select id={id} className="bw-input" value={value} disabled={disabled} onChange={(e) => onChange(e.target.value)}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

const TERMINAL_WORD: Record<string, string> = { pos: '+ (positive)', neg: '− (negative)' };
/** A fuse's terminals are named for what they face: a toward its battery, b toward the bank. */
const FUSE_TERMINAL_WORD: Record<string, string> = { a: 'battery side', b: 'bank side' };

/** A terminal in words for the connection pickers. */
function terminalWord(p: DiagramPart, t: string): string {
  if (p.type === 'fuse' && FUSE_TERMINAL_WORD[t]) return FUSE_TERMINAL_WORD[t];
  if (p.type === 'busbar') return `tap ${t}`;
  return TERMINAL_WORD[t] ?? t;
}

function CableProperties({ cable, unitSystem, readOnly }: { cable: DiagramCable; unitSystem: UnitSystem; readOnly: boolean }) {
  const parts = useEditorStore((s) => s.doc.parts);
  const updateCable = useEditorStore((s) => s.updateCable);
  const moveCableEnd = useEditorStore((s) => s.moveCableEnd);
  const terminalOptions = useMemo(
    () =>
      parts.flatMap((p) =>
        terminalsOf(p).map((t) => ({ value: `${p.id}\u0000${t}`, label: `${describePart(p)} · ${terminalWord(p, t)}` })),
      ),
    [parts],
  );
  const onCommit = useCallback((props: DiagramCable['props'], key: string) => updateCable(cable.id, { props }, `cable:${cable.id}:${key}`), [cable.id, updateCable]);
  const pick = (end: 'from' | 'to') => (v: string) => {
    const [part, terminal] = v.split('\u0000');
    moveCableEnd(cable.id, end, { part, terminal });
  };
  return (
    <div className="space-y-3">
      <DraftField<string>
        label="Label"
        value={cable.label ?? ''}
        disabled={readOnly}
        format={(v) => v}
        parse={(t) => (t.length > 120 ? { ok: false, message: 'Label must be at most 120 characters' } : { ok: true, value: t })}
        onCommit={(v) => {
          updateCable(cable.id, { label: v }, `label:${cable.id}`);
          return null;
        }}
      />
      <TerminalSelect label="From" value={`${cable.from.part}\u0000${cable.from.terminal}`} options={terminalOptions} onChange={pick('from')} disabled={readOnly} />
      <TerminalSelect label="To" value={`${cable.to.part}\u0000${cable.to.terminal}`} options={terminalOptions} onChange={pick('to')} disabled={readOnly} />
      {!readOnly ? <TeamLibraryPresets kind="cable" onPick={(props) => updateCable(cable.id, { props: { ...cable.props, ...props } as DiagramCable['props'] })} /> : null}
      <SpecForm key={cable.id} specs={CABLE_FIELDS} value={cable.props} schema={cableRunPropsSchema} unitSystem={unitSystem} disabled={readOnly} onCommit={onCommit} />
      <AmpacityChain cable={cable} />
    </div>
  );
}

/** The cable's ampacity derating chain, factor by factor: table value, ambient, bundling, engine space, termination. */
function AmpacityChain({ cable }: { cable: DiagramCable }) {
  const settings = useEditorStore((s) => s.doc.settings);
  const reading = useMemo(() => cableAmpacity(cable.props, settings), [cable.props, settings]);
  if (!reading) {
    return (
      <p className="text-[12px] text-graphite-600" data-testid="ampacity-chain">
        Ampacity: {cable.props.length_m === 0 ? 'none for a bolted joint (no conductor).' : 'this size is not in the selected table.'}
      </p>
    );
  }
  const d = reading.derating;
  if (!d) return null;
  return (
    <section aria-label="Ampacity derating" className="rounded border border-graphite-200 px-2 py-1.5 text-[12px]" data-testid="ampacity-chain">
      <h4 className="font-semibold text-graphite-800">Ampacity, step by step</h4>
      <ol className="mt-0.5 space-y-0.5 tabular-nums">
        <li>
          {d.base_A.toFixed(0)} A — {AMPACITY_TABLES[d.table]?.name ?? d.table}, {d.column_C} °C column
        </li>
        {d.factors.map((f) => (
          <li key={f.kind} className={f.factor < 1 ? 'text-graphite-900' : 'text-graphite-500'}>
            × {f.factor.toFixed(2)} {f.name} <span className="text-graphite-500">({f.basis})</span>
          </li>
        ))}
        <li className="font-semibold">= {d.final_A.toFixed(1)} A</li>
      </ol>
    </section>
  );
}

/** The team parts library's presets of one kind (battery, fuse, busbar or cable), when the team has any. */
function TeamLibraryPresets({ kind, onPick }: { kind: string; onPick: (props: Record<string, unknown>) => void }) {
  const library = useTeamLibrary();
  const items = (library.data ?? []).filter((i) => i.kind === kind);
  if (!items.length) return null;
  return (
    <PresetSelect
      label="Team library"
      options={items.map((i) => ({ id: i.id, label: i.name }))}
      onPick={(id) => {
        const item = items.find((i) => i.id === id);
        if (item) onPick(structuredClone(item.props) as Record<string, unknown>);
      }}
    />
  );
}

function SettingsForm({ unitSystem, readOnly }: { unitSystem: UnitSystem; readOnly: boolean }) {
  const settings = useEditorStore((s) => s.doc.settings);
  const updateSettings = useEditorStore((s) => s.updateSettings);
  const onCommit = useCallback((next: typeof settings, key: string) => updateSettings(next, `settings:${key}`), [updateSettings]);
  return <SpecForm specs={SETTINGS_FIELDS} value={settings} schema={settingsSchema} unitSystem={unitSystem} disabled={readOnly} onCommit={onCommit} />;
}

export function PropertiesPanel() {
  const { unitSystem, readOnly, selection } = useEditorStore(useShallow((s) => ({ unitSystem: s.unitSystem, readOnly: s.readOnly, selection: s.selection })));
  const part = useEditorStore((s) => (s.selection.length === 1 ? s.doc.parts.find((p) => p.id === s.selection[0]) : undefined));
  const cable = useEditorStore((s) => (s.selection.length === 1 && !part ? s.doc.cables.find((c) => c.id === s.selection[0]) : undefined));
  const deleteSelection = useEditorStore((s) => s.deleteSelection);
  const rotateSelection = useEditorStore((s) => s.rotateSelection);
  void cableSchema;

  let title: string;
  let body: React.ReactNode;
  if (part) {
    title = `${PART_TYPES[part.type].name}: ${describePart(part)}`;
    body = <PartProperties part={part} unitSystem={unitSystem} readOnly={readOnly} />;
  } else if (cable) {
    title = `Cable: ${cable.label || cable.id}`;
    body = <CableProperties cable={cable} unitSystem={unitSystem} readOnly={readOnly} />;
  } else if (selection.length > 1) {
    title = `${selection.length} items selected`;
    body = <p className="text-[13px] text-graphite-600">Select one part or cable to edit its properties. Move, rotate (R), duplicate (Ctrl+D) or delete them together.</p>;
  } else {
    title = 'Bank settings';
    body = <SettingsForm unitSystem={unitSystem} readOnly={readOnly} />;
  }
  return (
    <section aria-label="Properties" className="space-y-3">
      <div className="flex items-start justify-between gap-2">
        <h2 className="text-[14px] font-semibold text-graphite-900">{title}</h2>
        {!readOnly && selection.length > 0 ? (
          <div className="flex shrink-0 gap-1">
            {part || selection.length > 1 ? (
              <Button size="sm" variant="ghost" onClick={rotateSelection} title="Rotate 90° (R)">
                Rotate
              </Button>
            ) : null}
            <Button size="sm" variant="danger-outline" onClick={deleteSelection} aria-label="Delete selection">
              <TrashIcon size={13} /> Delete
            </Button>
          </div>
        ) : null}
      </div>
      <p className="text-xs text-graphite-500">
        Units: {unitSystem === 'metric' ? 'metric (m, mm²)' : 'US customary (ft, AWG)'}; fields accept either.
        {readOnly ? ' Read only: your role cannot edit diagrams.' : ''}
      </p>
      {body}
    </section>
  );
}
