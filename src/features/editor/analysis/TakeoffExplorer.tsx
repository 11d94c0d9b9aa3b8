/**
 * Take-off explorer: the layouts for the load's main leads — each pair of batteries for a post-to-post
 * bank, run lengths equalised and every pair of busbar taps for a busbar bank — with the bank imbalance
 * and loss of each, the layout as drawn marked. "Suggest" previews the optimizer's best against the
 * layout as drawn; "Apply" makes it ONE undoable edit.
 */
import { useState } from 'react';
import type { DiagramDocument } from '@shared/diagram';
import { formatLength, type UnitSystem } from '@shared/units';
import { Button } from '@/components/Button';
import { CheckIcon } from '@/components/icons';
import { useEditorStore } from '../store';
import { applyDocument } from './apply';
import type { TakeoffCandidate } from './engine';
import { useLabels, type LabelOf } from './labels';
import { useIsCurrent, useTakeoffExploration } from './useCore';
import { fmtA, fmtPct, fmtW } from './ui';

const SHOWN = 8;
const POLE = { pos: 'Positive', neg: 'Negative' } as const;

/** What applying `c` changes in `doc`, one line per moved lead or lengthened cable. */
export function describeMoves(c: TakeoffCandidate, asDrawn: TakeoffCandidate | undefined, doc: DiagramDocument, labelOf: LabelOf, system: UnitSystem): string[] {
  const a = c.apply;
  if (a.kind === 'leads') {
    return a.moves.map((m) => {
      const pole = doc.cables.find((x) => x.id === m.cable);
      const other = pole ? (m.end === 'from' ? pole.to : pole.from) : null;
      const name = other?.terminal === 'neg' ? POLE.neg : other?.terminal === 'pos' ? POLE.pos : 'Main';
      return `${name} main lead (${labelOf(m.cable)}): ${labelOf(m.from.part)} tap ${m.from.terminal} → tap ${m.to.terminal}`;
    });
  }
  const ch = a.choice;
  if (ch.kind === 'post_to_post') {
    const was = asDrawn?.apply.kind === 'optimizer' && asDrawn.apply.choice.kind === 'post_to_post' ? asDrawn.apply.choice : null;
    const out: string[] = [];
    for (const pole of ['pos', 'neg'] as const) {
      const from = was?.[pole].battery;
      const to = ch[pole].battery;
      if (from !== to) out.push(`${POLE[pole]} main lead (${labelOf(ch[pole].cable)}): ${from ? labelOf(from) : '?'} ${pole === 'pos' ? '+' : '−'} → ${labelOf(to)} ${pole === 'pos' ? '+' : '−'}`);
    }
    return out;
  }
  return Object.entries(ch.lengths_m).map(([id, len]) => {
    const old = doc.cables.find((x) => x.id === id)?.props.length_m ?? 0;
    return `${labelOf(id)}: ${formatLength(old, system)} → ${formatLength(len, system)}`;
  });
}

async function applyCandidate(c: TakeoffCandidate, label: string): Promise<boolean> {
  const store = useEditorStore.getState();
  const a = c.apply;
  if (a.kind === 'leads') {
    return store.edit(label, (d) => {
      for (const m of a.moves) {
        const cable = d.cables.find((x) => x.id === m.cable);
        if (cable) cable[m.end] = { part: m.to.part, terminal: m.to.terminal };
      }
    });
  }
  const { applyTakeoff } = await import('@shared/electrical/optimizer');
  return applyDocument(label, applyTakeoff(store.doc, a.choice));
}

function Row({ c, best, selected, onSelect }: { c: TakeoffCandidate; best: boolean; selected: boolean; onSelect: () => void }) {
  return (
    <li>
      <button
        type="button"
        aria-pressed={selected}
        onClick={onSelect}
        data-testid={`takeoff-${c.key}`}
        className={`grid w-full grid-cols-[1fr_3.2rem_3.2rem] items-baseline gap-x-1.5 rounded px-1.5 py-1 text-left text-[11px] tabular-nums hover:bg-graphite-50 ${selected ? 'bg-copper-50 ring-1 ring-copper-500' : ''}`}
      >
        <span className="min-w-0">
          <span className="block leading-[1.3]">{c.description}</span>
          {c.current || best ? (
            <span className="mt-0.5 flex gap-1">
              {c.current ? <span className="rounded border border-graphite-300 px-1 text-[10px] font-medium text-graphite-700">as drawn</span> : null}
              {best ? (
                <span className="inline-flex items-center gap-0.5 rounded border border-ok-200 bg-ok-50 px-1 text-[10px] font-medium text-ok-700">
                  <CheckIcon size={10} /> best
                </span>
              ) : null}
            </span>
          ) : null}
        </span>
        <span className="text-right">{fmtPct(c.imbalance_pct)}</span>
        <span className="text-right">{fmtW(c.losses_W)}</span>
      </button>
    </li>
  );
}

function CandidateList({ title, list, bestKey, selected, onSelect }: { title: string; list: TakeoffCandidate[]; bestKey: string; selected: string | null; onSelect: (k: string) => void }) {
  const [all, setAll] = useState(false);
  if (!list.length) return null;
  const asDrawn = list.find((c) => c.current);
  let shown = all ? list : list.slice(0, SHOWN);
  if (!all && asDrawn && !shown.includes(asDrawn)) shown = [...shown, asDrawn];
  return (
    <div>
      <div className="grid grid-cols-[1fr_3.2rem_3.2rem] gap-x-1.5 border-b border-graphite-200 px-1.5 pb-0.5 text-[11px] font-medium text-graphite-500">
        <span>{title}</span>
        <span className="text-right">Imbalance</span>
        <span className="text-right">Loss</span>
      </div>
      <ul aria-label={title} className="mt-0.5 space-y-px">
        {shown.map((c) => (
          <Row key={c.key} c={c} best={c.key === bestKey} selected={selected === c.key} onSelect={() => onSelect(c.key)} />
        ))}
      </ul>
      {list.length > SHOWN ? (
        <button type="button" className="mt-0.5 px-1.5 text-[11px] text-copper-700 underline" onClick={() => setAll((a) => !a)}>
          {all ? 'Show fewer' : `Show all ${list.length}`}
        </button>
      ) : null}
    </div>
  );
}

export function TakeoffExplorer() {
  const { output, status, message } = useTakeoffExploration(true);
  const current = useIsCurrent('takeoff');
  const readOnly = useEditorStore((s) => s.readOnly);
  const doc = useEditorStore((s) => s.doc);
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const labelOf = useLabels();
  const [selected, setSelected] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [done, setDone] = useState<string | null>(null);

  if (!output) return <p className="text-[12px] text-graphite-600">{status === 'error' ? `The layouts could not be evaluated: ${message}` : 'Evaluating the take-off layouts…'}</p>;
  if (!output.ok) return <p className="text-[12px] text-graphite-600">No take-off layouts to compare: {output.message}.</p>;

  const candidates = output.candidates;
  const optimizer = candidates.filter((c) => c.group === 'optimizer');
  const taps = candidates.filter((c) => c.group === 'taps');
  const pick = candidates.find((c) => c.key === selected) ?? null;
  const asDrawn = pick ? candidates.find((c) => c.group === pick.group && c.current) : undefined;
  const moves = pick ? describeMoves(pick, candidates.find((c) => c.group === 'optimizer' && c.current), doc, labelOf, unitSystem) : [];

  const apply = async () => {
    if (!pick) return;
    setBusy(true);
    try {
      const label = `Take-off: ${pick.description}`;
      if (await applyCandidate(pick, label)) {
        setDone(pick.description);
        setSelected(null);
      }
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="space-y-2" aria-busy={status === 'computing'}>
      <div className="flex items-center gap-2">
        <p className="min-w-0 flex-1 text-[11px] text-graphite-600">
          {output.layout === 'post_to_post' ? 'Post-to-post bank: battery pairs for the main leads.' : 'Busbar bank: run lengths and busbar taps for the main leads.'}
          {!current ? ' Updating…' : ''}
        </p>
        <Button size="sm" variant="primary" disabled={!current} onClick={() => { setSelected(output.best); setDone(null); }}>
          Suggest
        </Button>
      </div>
      {done ? (
        <p role="status" className="text-[11px] text-ok-700">
          Applied: {done}. Undo reverts it in one step.
        </p>
      ) : null}
      {pick ? (
        <div className="rounded-md border border-copper-300 bg-copper-50/50 px-2.5 py-2 text-[12px]" role="region" aria-label="Layout preview" data-testid="takeoff-preview">
          <p className="font-semibold">{pick.key === output.best ? 'Suggested: ' : 'Preview: '}{pick.description}</p>
          <table className="mt-1 w-full text-[11px] tabular-nums">
            <thead>
              <tr className="text-graphite-500">
                <th className="text-left font-medium" />
                <th className="text-right font-medium">As drawn</th>
                <th className="text-right font-medium">This layout</th>
              </tr>
            </thead>
            <tbody>
              <tr>
                <td>Imbalance</td>
                <td className="text-right">{asDrawn ? fmtPct(asDrawn.imbalance_pct) : '—'}</td>
                <td className="text-right font-semibold" data-testid="preview-imbalance">{fmtPct(pick.imbalance_pct)}</td>
              </tr>
              <tr>
                <td>Total loss</td>
                <td className="text-right">{asDrawn ? fmtW(asDrawn.losses_W) : '—'}</td>
                <td className="text-right font-semibold">{fmtW(pick.losses_W)}</td>
              </tr>
              <tr>
                <td>Busiest battery</td>
                <td className="text-right">{asDrawn ? fmtA(asDrawn.maxCurrent_A) : '—'}</td>
                <td className="text-right font-semibold">{fmtA(pick.maxCurrent_A)}</td>
              </tr>
            </tbody>
          </table>
          {pick.current ? (
            <p className="mt-1 text-[11px] text-graphite-700">This is the layout as drawn.</p>
          ) : (
            <div className="mt-1">
              <p className="text-[11px] font-medium text-graphite-700">What changes</p>
              <ul className="list-disc pl-4 text-[11px]">
                {moves.map((m) => (
                  <li key={m}>{m}</li>
                ))}
              </ul>
            </div>
          )}
          {pick.key === output.best ? <p className="mt-1 text-[11px] leading-[1.4] text-graphite-700">{output.explanation}</p> : null}
          <div className="mt-2 flex gap-1.5">
            {!readOnly && !pick.current ? (
              <Button size="sm" variant="primary" pending={busy} disabled={!current} onClick={apply}>
                Apply this layout
              </Button>
            ) : null}
            <Button size="sm" variant="ghost" onClick={() => setSelected(null)}>
              Close preview
            </Button>
          </div>
          {readOnly ? <p className="mt-1 text-[11px] text-graphite-500">Your role can compare layouts but not change the diagram.</p> : null}
        </div>
      ) : null}
      <CandidateList title={output.layout === 'post_to_post' ? 'Lead pairs' : 'Run lengths'} list={optimizer} bestKey={output.best} selected={selected} onSelect={(k) => { setSelected(k); setDone(null); }} />
      <CandidateList title="Main lead taps" list={taps} bestKey={output.best} selected={selected} onSelect={(k) => { setSelected(k); setDone(null); }} />
      <p className="text-[11px] text-graphite-500">Choose a row to preview it. Imbalance: spread of the batteries' share ÷ ideal share, in the load case.</p>
    </div>
  );
}
