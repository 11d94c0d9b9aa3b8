/** "New from template": the common bank layouts from shared/diagram/templates.ts, each editable afterwards. */
import { useId, useState } from 'react';
import { busbarBankTemplate, postToPostTemplate, seriesParallelTemplate, type DiagramDocument, type TakeOff } from '@shared/diagram';
import { BATTERY_PRESETS } from '@shared/electrical/parts';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { Notice } from '@/components/Notice';
import { useEditorStore } from './store';

export type Kind = 'post' | 'busbar' | 'series';

export const KINDS: { id: Kind; title: string; text: string }[] = [
  { id: 'post', title: 'Batteries post to post', text: 'Jumpered neighbour to neighbour; take-off at the same end, diagonally, or at inner batteries.' },
  { id: 'busbar', title: 'Batteries on busbars', text: 'Each battery on its own equal-length, fused cable to a positive and a negative busbar.' },
  { id: 'series', title: 'Series-parallel strings', text: 'Strings of batteries in series (e.g. 4S2P at 48 V), a fuse per string, on busbars.' },
];

export const DEFAULT_PRESET = BATTERY_PRESETS.find((p) => p.id.startsWith('lfp-') && p.props.capacity_Ah === 100)?.id ?? BATTERY_PRESETS[0].id;

export function buildTemplate(kind: Kind, o: { count: number; takeOff: TakeOff; pos: number; neg: number; series: number; parallel: number; presetId: string }): DiagramDocument {
  const battery = BATTERY_PRESETS.find((p) => p.id === o.presetId)?.props;
  if (kind === 'post') {
    return postToPostTemplate({ count: o.count, takeOff: o.takeOff, battery, ...(o.takeOff === 'inner' ? { takeOffIndices: { pos: o.pos, neg: o.neg } } : {}) });
  }
  if (kind === 'busbar') return busbarBankTemplate({ count: o.count, battery });
  return seriesParallelTemplate({ seriesCount: o.series, parallelCount: o.parallel, battery });
}

function NumberInput({ label, value, onChange, min, max }: { label: string; value: number; onChange: (n: number) => void; min: number; max: number }) {
  const id = useId();
  return (
    <div className="bw-field">
      <label htmlFor={id} className="bw-field-label">
        {label}
      </label>
      <input id={id} type="number" className="bw-input" min={min} max={max} value={value} onChange={(e) => onChange(Math.max(min, Math.min(max, Math.round(Number(e.target.value) || min))))} />
    </div>
  );
}

export function TemplateDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const [kind, setKind] = useState<Kind>('post');
  const [count, setCount] = useState(4);
  const [takeOff, setTakeOff] = useState<TakeOff>('diagonal');
  const [pos, setPos] = useState(1);
  const [neg, setNeg] = useState(4);
  const [series, setSeries] = useState(4);
  const [parallel, setParallel] = useState(2);
  const [presetId, setPresetId] = useState(DEFAULT_PRESET);
  const [error, setError] = useState<string | null>(null);
  const hasParts = useEditorStore((s) => s.doc.parts.length > 0);
  const presetFieldId = useId();
  const takeOffId = useId();

  const apply = () => {
    try {
      const doc = buildTemplate(kind, { count, takeOff, pos: Math.min(pos, count), neg: Math.min(neg, count), series, parallel, presetId });
      const store = useEditorStore.getState();
      store.replaceDocument(doc, 'Start from template');
      store.clearFresh();
      store.requestFit();
      onClose();
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    }
  };

  return (
    <Dialog open={open} onClose={onClose} title="New from template" description="A complete starting layout you can edit. It is a starting point, not a design approved to install." width="max-w-xl">
      <div className="space-y-4">
        <fieldset>
          <legend className="bw-field-label mb-1.5">Layout</legend>
          <div className="grid gap-2 sm:grid-cols-3">
            {KINDS.map((k) => (
              <label key={k.id} className={`bw-choice${kind === k.id ? ' bw-choice-on' : ''}`}>
                <input type="radio" name="template-kind" value={k.id} checked={kind === k.id} onChange={() => setKind(k.id)} className="sr-only" />
                <span className="block text-[13px] font-semibold">{k.title}</span>
                <span className="mt-0.5 block text-xs text-graphite-600">{k.text}</span>
              </label>
            ))}
          </div>
        </fieldset>
        <div className="grid gap-3 sm:grid-cols-2">
          <div className="bw-field sm:col-span-2">
            <label htmlFor={presetFieldId} className="bw-field-label">
              Battery
            </label>
            <select id={presetFieldId} className="bw-input" value={presetId} onChange={(e) => setPresetId(e.target.value)}>
              {BATTERY_PRESETS.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.label}
                </option>
              ))}
            </select>
          </div>
          {kind !== 'series' ? <NumberInput label="Batteries" value={count} onChange={setCount} min={1} max={kind === 'post' ? 64 : 63} /> : null}
          {kind === 'post' ? (
            <div className="bw-field">
              <label htmlFor={takeOffId} className="bw-field-label">
                Take-off
              </label>
              <select id={takeOffId} className="bw-input" value={takeOff} onChange={(e) => setTakeOff(e.target.value as TakeOff)}>
                <option value="same-end">Same end (+ and − on battery 1)</option>
                <option value="diagonal">Diagonal (+ on the first, − on the last)</option>
                <option value="inner">Inner batteries (choose below)</option>
              </select>
            </div>
          ) : null}
          {kind === 'post' && takeOff === 'inner' ? (
            <>
              <NumberInput label="Positive take-off at battery" value={pos} onChange={setPos} min={1} max={count} />
              <NumberInput label="Negative take-off at battery" value={neg} onChange={setNeg} min={1} max={count} />
            </>
          ) : null}
          {kind === 'series' ? (
            <>
              <NumberInput label="Batteries in series per string" value={series} onChange={setSeries} min={1} max={64} />
              <NumberInput label="Strings in parallel" value={parallel} onChange={setParallel} min={1} max={63} />
            </>
          ) : null}
        </div>
        {hasParts ? <Notice signal="warning">This replaces the parts on the canvas. Undo (Ctrl+Z) brings them back.</Notice> : null}
        {error ? <Notice signal="error">{error}</Notice> : null}
      </div>
      <DialogActions>
        <Button variant="ghost" onClick={onClose}>
          Cancel
        </Button>
        <Button variant="primary" onClick={apply}>
          Use this template
        </Button>
      </DialogActions>
    </Dialog>
  );
}
