/**
 * Property fields with units. Each field keeps the text being typed; every keystroke that reads as a
 * valid value is committed (edits to one field coalesce into one undo step), anything else shows a
 * field error naming the field and is not committed.
 */
import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import type { z } from 'zod';
import { formatConductor, formatLength, formatTemperature, parseQuantity, parseTemperature, sizeLabel, type ConductorSize, type UnitSystem } from '@shared/units';
import { ErrorIcon } from '@/components/icons';
import { parseConductorInput, parseLengthInput } from '../units';

export type FieldSpec =
  | {
      kind: 'number'; key: string; label: string; unit?: string; scale?: number; optional?: boolean; integer?: boolean; suggestions?: number[];
      /** A hint under the field, from the whole value the form edits (e.g. what an empty optional field stands for). */
      hint?: (whole: unknown) => string | undefined;
    }
  | { kind: 'select'; key: string; label: string; options: { value: string | number; label: string }[]; optional?: boolean }
  | { kind: 'text' | 'textarea' | 'date'; key: string; label: string; optional?: boolean }
  | { kind: 'bool'; key: string; label: string }
  | { kind: 'length'; key: string; label: string; optional?: boolean }
  | { kind: 'conductor'; key: string; label: string; presets?: { id: string; label: string; props: ConductorSize }[] }
  | { kind: 'temperature'; key: string; label: string; optional?: boolean };

type Parsed<T> = { ok: true; value: T } | { ok: false; message: string };

export function getPath(obj: unknown, key: string): unknown {
  return key.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}

/** A copy of `obj` with `key` (dotted path) set, or deleted when `value` is undefined. */
export function setPath<T>(obj: T, key: string, value: unknown): T {
  const out = structuredClone(obj) as Record<string, unknown>;
  const keys = key.split('.');
  let o = out;
  for (const k of keys.slice(0, -1)) {
    if (!o[k] || typeof o[k] !== 'object') o[k] = {};
    o = o[k] as Record<string, unknown>;
  }
  const last = keys[keys.length - 1];
  if (value === undefined) delete o[last];
  else o[last] = value;
  return out as T;
}

const trimNum = (x: number) => String(Math.round(x * 1e6) / 1e6);

/** A friendly, named message for a zod issue on a field shown with `scale` and `unit`. */
export function issueMessage(issue: z.core.$ZodIssue, label: string, scale = 1, unit = ''): string {
  const u = unit ? ` ${unit}` : '';
  const i = issue as z.core.$ZodIssue & { minimum?: number | bigint; maximum?: number | bigint; inclusive?: boolean; expected?: string };
  if (issue.code === 'too_small' && typeof i.minimum === 'number') {
    return `${label} must be ${i.inclusive ? 'at least' : 'more than'} ${trimNum(i.minimum * scale)}${u}`;
  }
  if (issue.code === 'too_big' && typeof i.maximum === 'number') {
    return `${label} must be ${i.inclusive ? 'at most' : 'less than'} ${trimNum(i.maximum * scale)}${u}`;
  }
  if (issue.code === 'invalid_type' && i.expected === 'int') return `${label} must be a whole number`;
  if (issue.code === 'invalid_type' && i.expected === 'number') return `${label} must be a number`;
  return `${label}: ${issue.message}`;
}

interface DraftProps<T> {
  label: string;
  value: T;
  format: (v: T) => string;
  parse: (text: string) => Parsed<T>;
  /** Commit a parsed value; returns an error message when the value is refused. */
  onCommit: (v: T) => string | null;
  disabled?: boolean;
  hint?: ReactNode;
  multiline?: boolean;
  type?: string;
  listId?: string;
  suffix?: ReactNode;
}

/** A text input that keeps its draft while focused and re-reads the value when it changes elsewhere (undo). */
export function DraftField<T>({ label, value, format, parse, onCommit, disabled, hint, multiline, type = 'text', listId, suffix }: DraftProps<T>) {
  const id = useId();
  const [text, setText] = useState(() => format(value));
  const [error, setError] = useState<string | null>(null);
  const focused = useRef(false);
  const formatted = format(value);
  useEffect(() => {
    if (!focused.current) {
      setText(formatted);
      setError(null);
    }
  }, [formatted]);

  const change = (t: string) => {
    setText(t);
    const p = parse(t);
    if (!p.ok) {
      setError(p.message);
      return;
    }
    setError(onCommit(p.value));
  };
  const common = {
    id,
    value: text,
    disabled,
    'aria-invalid': error ? true : undefined,
    'aria-describedby': [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(' ') || undefined,
    onFocus: () => {
      focused.current = true;
    },
    onBlur: () => {
      focused.current = false;
      if (!error) setText(format(value));
    },
    className: `bw-input${error ? ' bw-input-invalid' : ''}`,
  };
  return (
    <div className="bw-field">
      <label htmlFor={id} className="bw-field-label">
        {label}
      </label>
      <div className="flex items-center gap-1">
        {multiline ? (
          <textarea {...common} rows={3} onChange={(e) => change(e.target.value)} />
        ) : (
          <input {...common} type={type} list={listId} autoComplete="off" spellCheck={false} onChange={(e) => change(e.target.value)} />
        )}
        {suffix}
      </div>
      {hint ? (
        <p id={`${id}-hint`} className="bw-field-hint">
          {hint}
        </p>
      ) : null}
      <div aria-live="polite">
        {error ? (
          <p id={`${id}-error`} className="bw-field-error">
            <ErrorIcon size={13} className="mt-px shrink-0" />
            <span>{error}</span>
          </p>
        ) : null}
      </div>
    </div>
  );
}

/** Read a number typed with or without its unit ("100", "100 Ah", "3,5"), or with a prefixed unit ("2 kW", "0.12 Ω" in a mΩ field). */
export function parseNumber(text: string, label: string, unit?: string, integer?: boolean): Parsed<number> {
  const p = parseQuantity(text, unit, label);
  if (!p.ok) return { ok: false, message: p.error.message };
  if (integer && !Number.isInteger(p.value)) return { ok: false, message: `${label} must be a whole number` };
  return { ok: true, value: p.value };
}

export interface SpecFormProps<V> {
  specs: FieldSpec[];
  value: V;
  schema: z.ZodType;
  unitSystem: UnitSystem;
  disabled?: boolean;
  onCommit: (next: V, key: string) => void;
}

/** A form of fields over one value (a part's props, a cable's props, the bank settings), validated by its zod schema. */
export function SpecForm<V>({ specs, value, schema, unitSystem, disabled, onCommit }: SpecFormProps<V>) {
  const tryCommit = (spec: FieldSpec, fieldValue: unknown, scale = 1, unit = ''): string | null => {
    const next = setPath(value, spec.key, fieldValue);
    const result = schema.safeParse(next);
    if (!result.success) {
      const keyPath = spec.key.split('.');
      const issue = result.error.issues.find((i) => i.path.join('.') === keyPath.join('.')) ?? result.error.issues[0];
      return issueMessage(issue, spec.label, scale, unit);
    }
    onCommit(result.data as V, spec.key);
    return null;
  };
  return (
    <div className="space-y-3">
      {specs.map((spec) => (
        <SpecField key={spec.key} spec={spec} value={getPath(value, spec.key)} whole={value} unitSystem={unitSystem} disabled={disabled} tryCommit={tryCommit} />
      ))}
    </div>
  );
}

function SpecField({ spec, value, whole, unitSystem, disabled, tryCommit }: {
  spec: FieldSpec; value: unknown; whole: unknown; unitSystem: UnitSystem; disabled?: boolean;
  tryCommit: (spec: FieldSpec, v: unknown, scale?: number, unit?: string) => string | null;
}) {
  const listId = useId();
  switch (spec.kind) {
    case 'number': {
      const scale = spec.scale ?? 1;
      return (
        <>
          <DraftField<number | undefined>
            label={spec.label}
            value={value as number | undefined}
            disabled={disabled}
            format={(v) => (v === undefined ? '' : trimNum(v * scale))}
            parse={(t) => {
              if (!t.trim() && spec.optional) return { ok: true, value: undefined };
              const p = parseNumber(t, spec.label, spec.unit, spec.integer);
              return p.ok ? { ok: true, value: p.value / scale } : p;
            }}
            onCommit={(v) => tryCommit(spec, v, scale, spec.unit)}
            listId={spec.suggestions ? listId : undefined}
            suffix={spec.unit ? <span className="bw-unit">{spec.unit}</span> : null}
            hint={spec.hint?.(whole) ?? (spec.optional ? 'Optional' : undefined)}
          />
          {spec.suggestions ? (
            <datalist id={listId}>
              {spec.suggestions.map((s) => (
                <option key={s} value={trimNum(s * scale)} />
              ))}
            </datalist>
          ) : null}
        </>
      );
    }
    case 'length':
      return (
        <DraftField<number | undefined>
          label={spec.label}
          value={value as number | undefined}
          disabled={disabled}
          format={(v) => (v === undefined ? '' : formatLength(v, unitSystem))}
          parse={(t) => {
            if (!t.trim() && spec.optional) return { ok: true, value: undefined };
            if (/^0+([.,]0*)?\s*(m|mm|ft|in)?$/i.test(t.trim())) return { ok: true, value: 0 };
            const p = parseLengthInput(t, unitSystem);
            return p.ok ? p : { ok: false, message: `${spec.label}: ${p.error.message}` };
          }}
          onCommit={(v) => tryCommit(spec, v, 1, 'm')}
          hint={unitSystem === 'metric' ? 'm, mm, ft or in; a bare number is metres' : 'ft, in, m or mm; a bare number is feet'}
        />
      );
    case 'conductor': {
      const c = value as ConductorSize;
      return (
        <div className="space-y-1.5">
          <DraftField<ConductorSize>
            label={spec.label}
            value={c}
            disabled={disabled}
            format={(v) => sizeLabel(v)}
            parse={(t) => {
              const p = parseConductorInput(t, unitSystem);
              return p.ok ? p : { ok: false, message: `${spec.label}: ${p.error.message}` };
            }}
            onCommit={(v) => tryCommit(spec, v)}
            hint={`${formatConductor(c, unitSystem).text}. Type AWG, kcmil or mm², e.g. 2/0, 250 kcmil, 35 mm²`}
          />
          {spec.presets ? (
            <PresetSelect
              label={`${spec.label} presets`}
              disabled={disabled}
              options={spec.presets.map((p) => ({ id: p.id, label: p.label }))}
              onPick={(id) => {
                const p = spec.presets!.find((x) => x.id === id);
                if (p) tryCommit(spec, p.props);
              }}
            />
          ) : null}
        </div>
      );
    }
    case 'temperature':
      return (
        <DraftField<number | undefined>
          label={spec.label}
          value={value as number | undefined}
          disabled={disabled}
          format={(v) => (v === undefined ? '' : formatTemperature(v, unitSystem))}
          parse={(t) => {
            if (!t.trim() && spec.optional) return { ok: true, value: undefined };
            const bare = /^-?\d+([.,]\d+)?$/.test(t.trim());
            const p = parseTemperature(bare && unitSystem === 'us' ? `${t} F` : t);
            return p.ok ? p : { ok: false, message: `${spec.label}: ${p.error.message}` };
          }}
          onCommit={(v) => tryCommit(spec, v, 1, '°C')}
          hint={spec.optional ? 'Optional; °C or °F' : '°C or °F'}
        />
      );
    case 'text':
    case 'textarea':
    case 'date':
      return (
        <DraftField<string | undefined>
          label={spec.label}
          value={value as string | undefined}
          disabled={disabled}
          multiline={spec.kind === 'textarea'}
          type={spec.kind === 'date' ? 'date' : 'text'}
          format={(v) => v ?? ''}
          parse={(t) => ({ ok: true, value: !t && spec.optional ? undefined : t })}
          onCommit={(v) => tryCommit(spec, v)}
        />
      );
    case 'select':
      return <SelectSpecField spec={spec} value={value} disabled={disabled} tryCommit={tryCommit} />;
    case 'bool':
      return <BoolSpecField spec={spec} value={Boolean(value)} disabled={disabled} tryCommit={tryCommit} />;
  }
}

function SelectSpecField({ spec, value, disabled, tryCommit }: {
  spec: Extract<FieldSpec, { kind: 'select' }>; value: unknown; disabled?: boolean; tryCommit: (spec: FieldSpec, v: unknown) => string | null;
}) {
  const id = useId();
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="bw-field">
      <label htmlFor={id} className="bw-field-label">
        {spec.label}
      </label>
      <select
        id={id}
        className="bw-input"
        disabled={disabled}
        value={value === undefined ? '' : String(value)}
        aria-invalid={error ? true : undefined}
        onChange={(e) => {
          const raw = e.target.value;
          const opt = spec.options.find((o) => String(o.value) === raw);
          setError(tryCommit(spec, raw === '' ? undefined : opt ? opt.value : raw));
        }}
      >
        {spec.optional ? <option value="">—</option> : null}
        {spec.options.map((o) => (
          <option key={String(o.value)} value={String(o.value)}>
            {o.label}
          </option>
        ))}
      </select>
      {error ? (
        <p className="bw-field-error">
          <ErrorIcon size={13} className="mt-px shrink-0" />
          <span>{error}</span>
        </p>
      ) : null}
    </div>
  );
}

function BoolSpecField({ spec, value, disabled, tryCommit }: {
  spec: Extract<FieldSpec, { kind: 'bool' }>; value: boolean; disabled?: boolean; tryCommit: (spec: FieldSpec, v: unknown) => string | null;
}) {
  const id = useId();
  return (
    <div className="flex items-center gap-2">
      <input id={id} type="checkbox" className="size-4 accent-copper-600" checked={value} disabled={disabled} onChange={(e) => tryCommit(spec, e.target.checked)} />
      <label htmlFor={id} className="text-[13px] text-graphite-800">
        {spec.label}
      </label>
    </div>
  );
}

/** "Apply a preset" picker: a select that resets to its prompt after each pick. */
export function PresetSelect({ label, options, onPick, disabled }: { label: string; options: { id: string; label: string }[]; onPick: (id: string) => void; disabled?: boolean }) {
  const id = useId();
  return (
    <div className="bw-field">
      <label htmlFor={id} className="bw-field-label">
        {label}
      </label>
      <select
        id={id}
        className="bw-input"
        value=""
        disabled={disabled}
        onChange={(e) => {
          if (e.target.value) onPick(e.target.value);
        }}
      >
        <option value="">Choose a preset…</option>
        {options.map((o) => (
          <option key={o.id} value={o.id}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}
