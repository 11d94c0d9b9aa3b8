/**
 * Add or edit one parts-library item. The fields follow the CSV columns of its kind; the item is
 * checked with the shared library schema before it is sent, and the server checks it again. Props the
 * form does not show (e.g. a busbar's segment lengths) are kept as they are.
 */
import { useState, type FormEvent } from 'react';
import { cablePresetPropsSchema, libraryItemSchema, LIBRARY_KINDS, type LibraryKind } from '@shared/library';
import { LIBRARY_KIND_LABELS, type LibraryRecord } from '@shared/schemas/library';
import { CHEMISTRIES, CHEMISTRY_IDS } from '@shared/electrical/tables/batteries';
import { FUSE_CLASSES, FUSE_CLASS_IDS } from '@shared/electrical/tables/fuses';
import { cableRunDefaults, defaultPartProps, INSULATION_RATINGS_C } from '@shared/electrical/parts';
import { parseConductorSize } from '@shared/units/parse';
import { sizeLabel } from '@shared/units/format';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { SelectField, TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { errorMessage, isApiError } from '@/lib/api';
import { useCreateLibraryItem, useUpdateLibraryItem } from './hooks';

type FieldKind = 'number' | 'select' | 'conductor';
interface FieldDef {
  key: string;
  label: string;
  kind: FieldKind;
  optional?: boolean;
  /** Shown value = stored value × scale (e.g. mΩ for Ω). */
  scale?: number;
  options?: { value: string; label: string }[];
  hint?: string;
}

const MATERIALS = [
  { value: 'copper', label: 'Copper' },
  { value: 'aluminium', label: 'Aluminium' },
];

export const KIND_FIELDS: Record<LibraryKind, FieldDef[]> = {
  battery: [
    { key: 'chemistry', label: 'Chemistry', kind: 'select', options: CHEMISTRY_IDS.map((id) => ({ value: id, label: CHEMISTRIES[id].name })) },
    { key: 'nominal_V', label: 'Nominal voltage (V)', kind: 'number' },
    { key: 'capacity_Ah', label: 'Capacity (Ah)', kind: 'number' },
    { key: 'r_internal_ohm', label: 'Internal resistance (mΩ)', kind: 'number', scale: 1000, hint: 'From the data sheet, per battery' },
    { key: 'max_continuous_A', label: 'Max continuous current (A)', kind: 'number', optional: true },
    { key: 'short_circuit_A', label: 'Short-circuit current (A)', kind: 'number', optional: true, hint: 'Leave empty to estimate from the internal resistance' },
  ],
  cable: [
    { key: 'conductor', label: 'Conductor size', kind: 'conductor', hint: 'e.g. 2/0 AWG, 35 mm², 250 kcmil' },
    { key: 'material', label: 'Material', kind: 'select', options: MATERIALS },
    {
      key: 'stranding',
      label: 'Stranding',
      kind: 'select',
      options: [
        { value: 'flexible', label: 'Flexible (fine strand)' },
        { value: 'concentric', label: 'Concentric' },
        { value: 'solid', label: 'Solid' },
      ],
    },
    { key: 'insulation_C', label: 'Insulation rating (°C)', kind: 'select', options: INSULATION_RATINGS_C.map((c) => ({ value: String(c), label: `${c} °C` })) },
  ],
  fuse: [
    { key: 'fuseClass', label: 'Class', kind: 'select', options: FUSE_CLASS_IDS.map((id) => ({ value: id, label: FUSE_CLASSES[id].name })) },
    { key: 'rating_A', label: 'Rating (A)', kind: 'number' },
    { key: 'voltage_rating_V', label: 'Voltage rating (V DC)', kind: 'number', hint: 'As marked on the fuse' },
    { key: 'interrupting_A', label: 'Interrupting rating (A)', kind: 'number', hint: 'As marked on the fuse' },
  ],
  busbar: [
    { key: 'material', label: 'Material', kind: 'select', options: MATERIALS },
    { key: 'width_mm', label: 'Width (mm)', kind: 'number' },
    { key: 'thickness_mm', label: 'Thickness (mm)', kind: 'number' },
    { key: 'tapCount', label: 'Taps (studs)', kind: 'number' },
    { key: 'tapSpacing_m', label: 'Tap spacing (mm)', kind: 'number', scale: 1000 },
    { key: 'rating_A', label: 'Rating (A)', kind: 'number' },
  ],
};

export function defaultPresetProps(kind: LibraryKind): Record<string, unknown> {
  if (kind === 'cable') return cablePresetPropsSchema.parse(cableRunDefaults());
  if (kind === 'battery') return { ...defaultPartProps('battery'), soc: 1 };
  return { ...(defaultPartProps(kind) as Record<string, unknown>) };
}

function toText(def: FieldDef, v: unknown): string {
  if (v === undefined || v === null) return '';
  if (def.kind === 'conductor') return sizeLabel(v as Parameters<typeof sizeLabel>[0]);
  if (def.kind === 'number') return String(Math.round((v as number) * (def.scale ?? 1) * 1e9) / 1e9);
  return String(v);
}

type Values = Record<string, string>;

function valuesOf(kind: LibraryKind, props: Record<string, unknown>): Values {
  return Object.fromEntries(KIND_FIELDS[kind].map((f) => [f.key, toText(f, props[f.key])]));
}

/** The props from the form: fields over `base`; field errors for what cannot be read. */
function propsFrom(kind: LibraryKind, base: Record<string, unknown>, values: Values): { props: Record<string, unknown>; errors: Record<string, string[]> } {
  const props: Record<string, unknown> = { ...base };
  const errors: Record<string, string[]> = {};
  for (const f of KIND_FIELDS[kind]) {
    const text = (values[f.key] ?? '').trim();
    if (!text) {
      if (f.optional) delete props[f.key];
      else errors[f.key] = ['Required'];
      continue;
    }
    if (f.kind === 'number') {
      const n = Number(text.replace(/\s/g, ''));
      if (!Number.isFinite(n)) errors[f.key] = [`"${text}" is not a number${/^\d+,\d+$/.test(text) ? '; use a decimal point' : ''}`];
      else props[f.key] = n / (f.scale ?? 1);
    } else if (f.kind === 'conductor') {
      const r = parseConductorSize(text);
      if (r.ok) props[f.key] = r.value;
      else errors[f.key] = [r.error.message];
    } else {
      props[f.key] = f.key === 'insulation_C' ? Number(text) : text;
    }
  }
  return { props, errors };
}

export function ItemDialog({ teamId, item, open, onClose }: { teamId: string; item: LibraryRecord | null; open: boolean; onClose: () => void }) {
  const [kind, setKind] = useState<LibraryKind>(item?.kind ?? 'battery');
  const [base, setBase] = useState<Record<string, unknown>>(() => (item ? { ...(item.props as Record<string, unknown>) } : defaultPresetProps('battery')));
  const [values, setValues] = useState<Values>(() => valuesOf(item?.kind ?? 'battery', item ? (item.props as Record<string, unknown>) : defaultPresetProps('battery')));
  const [name, setName] = useState(item?.name ?? '');
  const [manufacturer, setManufacturer] = useState(item?.manufacturer ?? '');
  const [partNumber, setPartNumber] = useState(item?.partNumber ?? '');
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const create = useCreateLibraryItem(teamId);
  const update = useUpdateLibraryItem(teamId);
  const saving = create.isPending || update.isPending;
  const failure = create.error ?? update.error;

  function changeKind(k: LibraryKind) {
    const props = defaultPresetProps(k);
    setKind(k);
    setBase(props);
    setValues(valuesOf(k, props));
    setErrors({});
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    const { props, errors: fieldErrors } = propsFrom(kind, base, values);
    const candidate = { kind, name, manufacturer, partNumber, props };
    const parsed = libraryItemSchema.safeParse(candidate);
    const all: Record<string, string[]> = { ...fieldErrors };
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const key = issue.path[0] === 'props' ? String(issue.path[1] ?? '') : String(issue.path[0] ?? '');
        if (!all[key]) all[key] = [issue.message];
      }
    }
    setErrors(all);
    if (Object.keys(all).length || !parsed.success) return;
    const done = { onSuccess: onClose };
    if (item) update.mutate({ id: item.id, patch: { name, manufacturer, partNumber, props } }, done);
    else create.mutate(parsed.data, done);
  }

  const serverFields = isApiError(failure) ? failure.fieldErrors : {};
  const errs = (key: string) => errors[key] ?? serverFields[key] ?? serverFields[`props.${key}`];

  return (
    <Dialog open={open} onClose={onClose} title={item ? `Edit ${item.name}` : 'Add a part to the library'} width="max-w-xl">
      <form onSubmit={submit} noValidate aria-label={item ? 'Edit library item' : 'New library item'} className="space-y-3">
        {item ? null : (
          <SelectField label="Kind" value={kind} onChange={(e) => changeKind(e.target.value as LibraryKind)}>
            {LIBRARY_KINDS.map((k) => (
              <option key={k} value={k}>
                {LIBRARY_KIND_LABELS[k]}
              </option>
            ))}
          </SelectField>
        )}
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} errors={errs('name')} data-autofocus maxLength={120} />
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Manufacturer" value={manufacturer} onChange={(e) => setManufacturer(e.target.value)} errors={errs('manufacturer')} maxLength={120} />
          <TextField label="Part number" value={partNumber} onChange={(e) => setPartNumber(e.target.value)} errors={errs('partNumber')} maxLength={60} />
        </div>
        <div className="grid gap-3 sm:grid-cols-2">
          {KIND_FIELDS[kind].map((f) =>
            f.kind === 'select' ? (
              <SelectField key={`${kind}-${f.key}`} label={f.label} value={values[f.key] ?? ''} onChange={(e) => setValues((v) => ({ ...v, [f.key]: e.target.value }))} errors={errs(f.key)} hint={f.hint}>
                {f.options!.map((o) => (
                  <option key={o.value} value={o.value}>
                    {o.label}
                  </option>
                ))}
              </SelectField>
            ) : (
              <TextField
                key={`${kind}-${f.key}`}
                label={f.optional ? `${f.label}, optional` : f.label}
                value={values[f.key] ?? ''}
                inputMode={f.kind === 'number' ? 'decimal' : undefined}
                onChange={(e) => setValues((v) => ({ ...v, [f.key]: e.target.value }))}
                errors={errs(f.key)}
                hint={f.hint}
              />
            ),
          )}
        </div>
        <p className="text-xs text-graphite-500">Presets are starting points: check each against the part's own marked ratings and data sheet.</p>
        {failure && !Object.keys(serverFields).length ? <Notice signal="error">{errorMessage(failure)}</Notice> : null}
        <DialogActions>
          <Button onClick={onClose} disabled={saving}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={saving}>
            {item ? 'Save' : 'Add to library'}
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
