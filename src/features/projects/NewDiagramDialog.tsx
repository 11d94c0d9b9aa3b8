/**
 * "New diagram": blank, from a template (layout, battery, count, take-off, series count) or from a
 * diagram file. The document is built and checked in the browser, then created in one request
 * (POST /api/projects/:id/diagrams with its content) and opened in the editor. Loaded on first use.
 */
import { useId, useState, type FormEvent, type ReactNode } from 'react';
import { useNavigate } from 'react-router';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { emptyDiagram, type DiagramDocument, type TakeOff } from '@shared/diagram';
import { BATTERY_PRESETS } from '@shared/electrical/parts';
import { createDiagramSchema } from '@shared/schemas/diagrams';
import type { FieldErrors } from '@shared/schemas/errors';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { SelectField, TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { parseForm, serverFormErrors } from '@/lib/forms';
import { buildTemplate, DEFAULT_PRESET, KINDS, type Kind } from '@/features/editor/TemplateDialog';
import { DiagramFileField, nameFromFile, type DiagramFileRead } from '@/features/diagram-files/DiagramFileField';
import { createDiagramIn } from './api';
import { projectKeys } from './hooks';

type Source = 'blank' | 'template' | 'file';

const SOURCES: { id: Source; title: string; text: string }[] = [
  { id: 'blank', title: 'Blank', text: 'An empty canvas; place parts from the palette.' },
  { id: 'template', title: 'From a template', text: 'A complete bank layout to edit: post to post, busbars or series strings.' },
  { id: 'file', title: 'From a file', text: 'A diagram file saved from Bankwright (.bankwright.json).' },
];

const nameOnly = createDiagramSchema.pick({ name: true });

function Choice({ name, checked, onChange, title, text }: { name: string; checked: boolean; onChange: () => void; title: string; text: ReactNode }) {
  return (
    <label
      className={`block cursor-pointer rounded-md border p-2.5 focus-within:outline-2 focus-within:outline-copper-500 ${
        checked ? 'border-copper-500 bg-copper-50' : 'border-graphite-200 hover:border-graphite-300'
      }`}
    >
      <input type="radio" name={name} checked={checked} onChange={onChange} className="sr-only" />
      <span className="block text-[13px] font-semibold text-graphite-900">{title}</span>
      <span className="mt-0.5 block text-xs text-graphite-600">{text}</span>
    </label>
  );
}

/** A whole-number field: typing is free (a cleared field may be retyped); the value is clamped to [min, max] when it is used and on blur. */
function NumberField({ label, value, onChange, min, max }: { label: string; value: number; onChange: (n: number) => void; min: number; max: number }) {
  const [text, setText] = useState(String(value));
  const clamp = (raw: string) => Math.max(min, Math.min(max, Math.round(Number(raw)) || min));
  return (
    <TextField
      label={label}
      type="number"
      inputMode="numeric"
      min={min}
      max={max}
      value={text}
      hint={`${min} to ${max}`}
      onChange={(e) => {
        setText(e.target.value);
        if (e.target.value.trim() !== '') onChange(clamp(e.target.value));
      }}
      onBlur={() => setText(String(clamp(text)))}
    />
  );
}

export interface TemplateChoice {
  kind: Kind;
  presetId: string;
  count: number;
  takeOff: TakeOff;
  pos: number;
  neg: number;
  series: number;
  parallel: number;
}

export const DEFAULT_TEMPLATE: TemplateChoice = { kind: 'post', presetId: DEFAULT_PRESET, count: 4, takeOff: 'diagonal', pos: 1, neg: 4, series: 4, parallel: 2 };

/** The document a template choice gives, named. Throws with the template's message when the choice is not buildable. */
export function templateDocument(t: TemplateChoice, name: string): DiagramDocument {
  const doc = buildTemplate(t.kind, { ...t, pos: Math.min(t.pos, t.count), neg: Math.min(t.neg, t.count) });
  return { ...doc, name };
}

function TemplateFields({ value, onChange }: { value: TemplateChoice; onChange: (t: TemplateChoice) => void }) {
  const set = (patch: Partial<TemplateChoice>) => onChange({ ...value, ...patch });
  const group = useId();
  return (
    <div className="space-y-3">
      <fieldset>
        <legend className="mb-1.5 text-[13px] font-medium text-graphite-800">Layout</legend>
        <div className="grid gap-2 sm:grid-cols-3">
          {KINDS.map((k) => (
            <Choice key={k.id} name={`${group}-kind`} checked={value.kind === k.id} onChange={() => set({ kind: k.id })} title={k.title} text={k.text} />
          ))}
        </div>
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        <div className="sm:col-span-2">
          <SelectField label="Battery (chemistry, voltage, capacity)" value={value.presetId} onChange={(e) => set({ presetId: e.target.value })}>
            {BATTERY_PRESETS.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label}
              </option>
            ))}
          </SelectField>
        </div>
        {value.kind !== 'series' ? (
          <NumberField label="Batteries in parallel" value={value.count} onChange={(count) => set({ count })} min={1} max={value.kind === 'post' ? 64 : 63} />
        ) : null}
        {value.kind === 'post' ? (
          <SelectField label="Take-off" value={value.takeOff} onChange={(e) => set({ takeOff: e.target.value as TakeOff })}>
            <option value="same-end">Same end (+ and − on battery 1)</option>
            <option value="diagonal">Diagonal (+ on the first, − on the last)</option>
            <option value="inner">Inner batteries (choose below)</option>
          </SelectField>
        ) : null}
        {value.kind === 'post' && value.takeOff === 'inner' ? (
          <>
            <NumberField label="Positive take-off at battery" value={value.pos} onChange={(pos) => set({ pos })} min={1} max={value.count} />
            <NumberField label="Negative take-off at battery" value={value.neg} onChange={(neg) => set({ neg })} min={1} max={value.count} />
          </>
        ) : null}
        {value.kind === 'series' ? (
          <>
            <NumberField label="Batteries in series per string" value={value.series} onChange={(series) => set({ series })} min={1} max={64} />
            <NumberField label="Strings in parallel" value={value.parallel} onChange={(parallel) => set({ parallel })} min={1} max={63} />
          </>
        ) : null}
      </div>
      <p className="text-xs text-graphite-500">A starting layout to edit, not a design approved to install.</p>
    </div>
  );
}

export function NewDiagramDialog({ projectId, open, onClose, initialSource = 'blank' }: { projectId: string; open: boolean; onClose: () => void; initialSource?: Source }) {
  const [source, setSource] = useState<Source>(initialSource);
  const [name, setName] = useState('');
  const [template, setTemplate] = useState<TemplateChoice>(DEFAULT_TEMPLATE);
  const [file, setFile] = useState<DiagramFileRead>({ state: 'none' });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const [buildError, setBuildError] = useState<string | null>(null);
  const group = useId();
  const qc = useQueryClient();
  const navigate = useNavigate();
  const create = useMutation({
    mutationFn: (body: { name: string; content: DiagramDocument }) => createDiagramIn(projectId, body),
    onSuccess: async (diagram) => {
      await qc.invalidateQueries({ queryKey: projectKeys.diagrams(projectId) });
      close();
      navigate(`/diagrams/${diagram.id}`);
    },
  });
  const server = serverFormErrors(create.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };
  // The server names document problems by path under content (e.g. content.parts.3.props.capacity_Ah).
  const contentErrors = Object.entries(fieldErrors).filter(([k]) => k === 'content' || k.startsWith('content.')).flatMap(([k, v]) => v.map((m) => `${k}: ${m}`));

  function close() {
    setSource(initialSource);
    setName('');
    setTemplate(DEFAULT_TEMPLATE);
    setFile({ state: 'none' });
    setClientErrors({});
    setBuildError(null);
    create.reset();
    onClose();
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    setBuildError(null);
    create.reset();
    const parsed = parseForm(nameOnly, { name });
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    const diagramName = parsed.data.name;
    let content: DiagramDocument;
    if (source === 'file') {
      if (file.state !== 'valid') return setBuildError('Choose a valid diagram file first.');
      content = { ...file.doc, name: diagramName };
    } else if (source === 'template') {
      try {
        content = templateDocument(template, diagramName);
      } catch (err) {
        return setBuildError(err instanceof Error ? err.message : String(err));
      }
    } else {
      content = emptyDiagram(diagramName);
    }
    create.mutate({ name: diagramName, content });
  }

  return (
    <Dialog open={open} onClose={close} title="New diagram" description="Start blank, from a common bank layout, or from a diagram file." width="max-w-2xl">
      <form onSubmit={submit} noValidate className="space-y-4">
        <TextField
          label="Diagram name"
          name="name"
          placeholder="e.g. House bank, 4 × 100 Ah"
          value={name}
          maxLength={120}
          onChange={(e) => setName(e.target.value)}
          errors={fieldErrors.name}
          data-autofocus
        />
        <fieldset>
          <legend className="mb-1.5 text-[13px] font-medium text-graphite-800">Start from</legend>
          <div className="grid gap-2 sm:grid-cols-3">
            {SOURCES.map((s) => (
              <Choice key={s.id} name={`${group}-source`} checked={source === s.id} onChange={() => setSource(s.id)} title={s.title} text={s.text} />
            ))}
          </div>
        </fieldset>
        {source === 'template' ? <TemplateFields value={template} onChange={setTemplate} /> : null}
        {source === 'file' ? (
          <DiagramFileField
            onRead={(read) => {
              setFile(read);
              if (read.state === 'valid' && !name.trim()) setName(read.doc.name?.trim() || nameFromFile(read.fileName));
            }}
          />
        ) : null}
        {buildError ? <Notice signal="error">{buildError}</Notice> : null}
        {server.formError ? <Notice signal="error">The diagram was not created: {server.formError}</Notice> : null}
        {contentErrors.length ? <Notice signal="error">The diagram was not created: {contentErrors.slice(0, 5).join('; ')}</Notice> : null}
        <DialogActions>
          <Button variant="ghost" onClick={close}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={create.isPending} disabled={source === 'file' && file.state !== 'valid'}>
            Create and open
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
