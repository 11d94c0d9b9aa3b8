/**
 * Take-off explorer: the layouts for the load's main leads — each pair of batteries for a post-to-post
 * bank, run lengths equalised and every pair of busbar taps for a busbar bank — with the bank imbalance
 * and loss of each, the layout as drawn marked. A layout is marked "best" only where it beats the one
 * as drawn (the optimizer's verdict); otherwise the explorer says the layout as drawn is already the
 * best. Choosing a row previews it on the canvas (ghost cables over the drawing, nothing changed);
 * "Apply" makes it ONE undoable edit, Escape or "Close preview" clears it.
 */
import { useRef, useState } from 'react';
import type { DiagramDocument } from '@shared/diagram';
import { formatLength, type UnitSystem } from '@shared/units';
import { Button } from '@/components/Button';
import { CheckIcon } from '@/components/icons';
import { useEditorStore } from '../store';
import { applyPreview, clearPreview, showPreview, usePreviewStore } from '../canvas/preview';
import { applyDocument } from './apply';
import { ChangePreview } from './SizingAssistant';
import type { DesignCheck } from '@shared/electrical/sizing';
import type { LeadMove, TakeoffCandidate } from './engine';
import { useLabels, usePlainText, type LabelOf } from './labels';
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
      const name = other?.terminal === 'neg' ? `${POLE.neg} main lead` : other?.terminal === 'pos' ? `${POLE.pos} main lead` : 'Main lead';
      return `${name} (${labelOf(m.cable)}): ${labelOf(m.from.part)} tap ${m.from.terminal} → tap ${m.to.terminal}`;
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

function withMoves(doc: DiagramDocument, moves: LeadMove[]): DiagramDocument {
  const byCable = new Map(moves.map((m) => [m.cable, m]));
  return { ...doc, cables: doc.cables.map((c) => {
    const m = byCable.get(c.id);
    return m ? { ...c, [m.end]: { part: m.to.part, terminal: m.to.terminal } } : c;
  }) };
}

/** The editor's document with candidate `c` applied. */
async function candidateDocument(doc: DiagramDocument, c: TakeoffCandidate): Promise<DiagramDocument> {
  const a = c.apply;
  if (a.kind === 'leads') return withMoves(doc, a.moves);
  const { applyTakeoff } = await import('@shared/electrical/optimizer');
  return applyTakeoff(doc, a.choice);
}

const SOURCE = 'takeoff';

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

function CandidateList({ title, list, bestKey, selected, onSelect }: { title: string; list: TakeoffCandidate[]; bestKey: string | null; selected: string | null; onSelect: (c: TakeoffCandidate) => void }) {
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
          <Row key={c.key} c={c} best={bestKey !== null && c.key === bestKey} selected={selected === c.key} onSelect={() => onSelect(c)} />
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
  const plain = usePlainText();
  // The row shown is the one previewed on the canvas: Escape there or an edit clears both.
  const selected = usePreviewStore((s) => (s.preview?.source === SOURCE ? s.preview.key : null));
  const asked = useRef(0);
  const [done, setDone] = useState<string | null>(null);
  // The check of the previewed layout against the diagram as drawn (a take-off change is a checked transaction).
  const [check, setCheck] = useState<{ key: string; result: DesignCheck } | null>(null);

  if (!output) return <p className="text-[12px] text-graphite-600">{status === 'error' ? `The layouts could not be evaluated: ${message}` : 'Evaluating the take-off layouts…'}</p>;
  if (!output.ok) return <p className="text-[12px] text-graphite-600">No take-off layouts to compare: {output.message}.</p>;

  const candidates = output.candidates;
  const optimizer = candidates.filter((c) => c.group === 'optimizer');
  const taps = candidates.filter((c) => c.group === 'taps');
  const pick = candidates.find((c) => c.key === selected) ?? null;
  const asDrawn = pick ? candidates.find((c) => c.group === pick.group && c.current) : undefined;
  const moves = pick ? describeMoves(pick, candidates.find((c) => c.group === 'optimizer' && c.current), doc, labelOf, unitSystem) : [];

  /** Preview `c` on the canvas (the document as drawn stays as it is until Apply). */
  const preview = async (c: TakeoffCandidate) => {
    setDone(null);
    const n = ++asked.current;
    const base = useEditorStore.getState().doc;
    const next = await candidateDocument(base, c);
    const { checkChange } = await import('@shared/electrical/sizing');
    const result = checkChange(base, next);
    if (n !== asked.current || useEditorStore.getState().doc !== base) return; // another row, or an edit, came first
    setCheck({ key: c.key, result });
    const label = `Take-off: ${c.description}`;
    showPreview({
      source: SOURCE, key: c.key, title: c.description, doc: next,
      // Applied only when the check passed (no error added, nothing pushed above its rating).
      apply: result.safe
        ? () => {
            const ok = applyDocument(label, next);
            if (ok) setDone(c.description);
            return ok;
          }
        : null,
    });
  };
  const pickCheck = pick && check?.key === pick.key ? check.result : null;

  return (
    <div className="space-y-2" aria-busy={status === 'computing'}>
      <div className="flex items-center gap-2">
        <p className="min-w-0 flex-1 text-[11px] text-graphite-600">
          {output.layout === 'post_to_post' ? 'Post-to-post bank: battery pairs for the main leads.' : 'Busbar bank: run lengths and busbar taps for the main leads.'}
          {!current ? ' Updating…' : ''}
        </p>
        {output.best ? (
          <Button size="sm" variant="primary" disabled={!current} onClick={() => { const b = candidates.find((c) => c.key === output.best); if (b) void preview(b); }}>
            Suggest
          </Button>
        ) : null}
      </div>
      {output.best === null ? (
        <p className="rounded-md border border-graphite-200 bg-graphite-50 px-2.5 py-1.5 text-[11px] leading-[1.4] text-graphite-700" data-testid="takeoff-verdict">
          {output.explanation}
        </p>
      ) : null}
      {done ? (
        <p role="status" className="text-[11px] text-ok-700">
          Applied: {done}. Undo reverts it in one step.
        </p>
      ) : null}
      {pick ? (
        <div className="rounded-md border border-note-200 bg-note-50/60 px-2.5 py-2 text-[12px]" role="region" aria-label="Layout preview" data-testid="takeoff-preview">
          <p className="font-semibold">{pick.key === output.best ? 'Suggested: ' : 'Preview: '}{pick.description}</p>
          <p className="text-[11px] text-graphite-600">Drawn on the canvas in dashed blue; the diagram is unchanged until you apply it.</p>
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
          {pickCheck && !pick.current ? (
            <div className="mt-1.5">
              {!pickCheck.safe ? (
                <p role="alert" className="mb-1 rounded border border-fault-200 bg-fault-50 px-2 py-1 text-[11px] text-fault-700">
                  <strong>Not offered:</strong> {pickCheck.reasons.map(plain).join(' ')}
                </p>
              ) : null}
              <ChangePreview check={pickCheck} labelOf={labelOf} title="Checks before → after" />
            </div>
          ) : null}
          <div className="mt-2 flex gap-1.5">
            {!readOnly && !pick.current ? (
              <Button size="sm" variant="primary" disabled={!current || !pickCheck?.safe} onClick={() => applyPreview()}>
                Apply this layout
              </Button>
            ) : null}
            <Button size="sm" variant="ghost" onClick={() => clearPreview(SOURCE)}>
              Close preview
            </Button>
          </div>
          {readOnly ? <p className="mt-1 text-[11px] text-graphite-500">Your role can compare layouts but not change the diagram.</p> : null}
        </div>
      ) : null}
      <CandidateList title={output.layout === 'post_to_post' ? 'Lead pairs' : 'Run lengths'} list={optimizer} bestKey={output.best} selected={selected} onSelect={(c) => void preview(c)} />
      <CandidateList title="Main lead taps" list={taps} bestKey={output.best} selected={selected} onSelect={(c) => void preview(c)} />
      <p className="text-[11px] text-graphite-500">Choose a row to preview it on the canvas; Escape clears the preview. Imbalance: spread of the batteries' share ÷ ideal share, in the load case.</p>
    </div>
  );
}
