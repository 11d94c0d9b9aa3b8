/**
 * Sizing assistant: for each battery (or string) branch, the core's suggested fuse (rating and class) and
 * conductor with its reasoning. Every apply is a checked transaction: the core's plan (computed in the
 * panels' worker) previews the change — each battery's share, each changed part's loading, the findings
 * that appear and disappear — and the design is checked again at the click; a change that would add an
 * error or push a part above 100 % is refused with the reason, and the safe part of "Apply all" is offered
 * instead. Each apply is ONE undoable edit.
 */
import { useState } from 'react';
import { sizingChanges, type BranchSizing, type DesignCheck, type SizingWithPlan } from '@shared/electrical/sizing';
import { FUSE_CLASSES } from '@shared/electrical/tables/fuses';
import { formatConductor, type ConductorSize, type UnitSystem } from '@shared/units';
import { Button } from '@/components/Button';
import { CheckIcon } from '@/components/icons';
import { useEditorStore } from '../store';
import { applyDocument, sameJson } from './apply';
import { type LabelOf, useLabels, usePlainText } from './labels';
import { SEVERITY } from './severity';
import { useIsCurrent, useSizing } from './useCore';
import { fmtA, fmtPct } from './ui';

const conductorText = (c: ConductorSize, system: UnitSystem) => formatConductor(c, system).text;


export type ApplyOutcome = { applied: true } | { applied: false; reasons: string[] };

/**
 * Apply suggestions as one edit, after checking the change once more against the document as it is now
 * (the plan was for the same document; the check is repeated so nothing unchecked is ever applied).
 */
export async function applyBranches(branches: BranchSizing[], label: string): Promise<ApplyOutcome> {
  const { applySizing, checkChange } = await import('@shared/electrical/sizing');
  const doc = useEditorStore.getState().doc;
  const next = applySizing(doc, branches);
  const check = checkChange(doc, next);
  if (!check.safe) return { applied: false, reasons: check.reasons };
  return applyDocument(label, next) ? { applied: true } : { applied: false, reasons: ['Nothing changed, or your role cannot edit this diagram.'] };
}

const pctText = (x: number | null) => (x === null ? '—' : `${x.toFixed(0)} %`);

/** Before → after of a change: errors and warnings, imbalance, each battery's share, the loading of changed parts, findings in and out. */
export function ChangePreview({ check, labelOf, title }: { check: DesignCheck; labelOf: LabelOf; title: string }) {
  const plain = usePlainText();
  const loading = [...check.loading].sort((a, b) => (b.after_pct ?? 0) - (a.after_pct ?? 0)).slice(0, 12);
  return (
    <div className="space-y-1.5 rounded border border-graphite-200 bg-graphite-50 px-2 py-1.5 text-[11px]" aria-label={title}>
      <p className="font-semibold text-graphite-800">{title}</p>
      <p className="tabular-nums text-graphite-700">
        Errors {check.errors.before} → <strong>{check.errors.after}</strong>, warnings {check.warnings.before} → <strong>{check.warnings.after}</strong>
        {check.imbalance_pct.before !== null && check.imbalance_pct.after !== null ? (
          <>
            ; imbalance {fmtPct(check.imbalance_pct.before)} → <strong>{fmtPct(check.imbalance_pct.after)}</strong>
          </>
        ) : null}
      </p>
      {check.shares.length ? (
        <div>
          <p className="text-graphite-500">Battery current, before → after</p>
          <ul className="tabular-nums" aria-label="Battery currents before and after">
            {check.shares.map((s) => (
              <li key={s.id} className="flex gap-2">
                <span className="min-w-0 flex-1 truncate">{labelOf(s.id)}</span>
                <span className="shrink-0 whitespace-nowrap">
                  {s.before_A === null ? '—' : `${fmtA(s.before_A)} (${fmtPct(s.beforeShare_pct ?? 0, 0)})`} →{' '}
                  <strong>{s.after_A === null ? '—' : `${fmtA(s.after_A)} (${fmtPct(s.afterShare_pct ?? 0, 0)})`}</strong>
                </span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {loading.length ? (
        <div>
          <p className="text-graphite-500">Loading of the parts it changes, before → after</p>
          <ul className="tabular-nums" aria-label="Loading of the parts the change affects">
            {loading.map((l) => (
              <li key={l.id} className={`flex gap-2 ${(l.after_pct ?? 0) > 100 ? 'text-fault-700' : ''}`}>
                <span className="min-w-0 flex-1 truncate" title={labelOf(l.id)}>{labelOf(l.id)}</span>
                <span className="shrink-0 whitespace-nowrap">
                  {l.before_pct === null ? 'new' : pctText(l.before_pct)} → <strong>{pctText(l.after_pct)}</strong>
                  {l.current_A !== null ? <span className="text-graphite-500"> · {fmtA(l.current_A)}</span> : null}
                </span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {check.appeared.length || check.disappeared.length ? (
        <ul className="space-y-0.5">
          {check.disappeared.map((f, i) => {
            const S = SEVERITY[f.severity];
            return (
              <li key={`d${i}`} className="text-ok-700">
                <CheckIcon size={11} className="mr-0.5 inline" />
                Resolved {S.word.toLowerCase()}: {plain(f.message)}
              </li>
            );
          })}
          {check.appeared.map((f, i) => {
            const S = SEVERITY[f.severity];
            return (
              <li key={`a${i}`} className={S.text}>
                <S.Icon size={11} className="mr-0.5 inline" />
                New {S.word.toLowerCase()}: {plain(f.message)}
              </li>
            );
          })}
        </ul>
      ) : (
        <p className="text-graphite-600">No finding appears or disappears.</p>
      )}
    </div>
  );
}

function Refusal({ reasons }: { reasons: string[] }) {
  const plain = usePlainText();
  return (
    <div role="alert" className="rounded border border-fault-200 bg-fault-50 px-2 py-1 text-[11px] text-fault-700">
      <strong>Not applied:</strong> {reasons.map(plain).join(' ')}
    </div>
  );
}

function Branch({ b, check, unitSystem, canApply, disabled, busy, refused, onApply }: {
  b: BranchSizing; check: DesignCheck | undefined; unitSystem: UnitSystem; canApply: boolean; disabled: boolean; busy: boolean;
  refused: string[] | null; onApply: () => void;
}) {
  const labelOf = useLabels();
  const plain = usePlainText();
  const doc = useEditorStore((s) => s.doc);
  const [preview, setPreview] = useState(false);
  const changes = sizingChanges(b, doc);
  const safe = check?.safe ?? false;
  const presentSizes = [...new Map(b.cables.map((c) => [JSON.stringify(c.present), c.present])).values()];
  const fuseClass = FUSE_CLASSES[b.fuse.fuseClass]?.name ?? b.fuse.fuseClass;
  return (
    <li className={`rounded-md border px-2.5 py-2 text-[12px] ${b.status === 'conflict' ? 'border-fault-200' : 'border-graphite-200'}`} data-testid={`sizing-${b.source}`}>
      <div className="flex items-center gap-2">
        <span className="min-w-0 flex-1 truncate font-semibold">{labelOf(b.source)}</span>
        {b.status === 'conflict' ? (
          <span className="text-[11px] font-semibold text-fault-700">No fuse fits</span>
        ) : changes ? (
          <>
            {check ? (
              <Button size="sm" variant="ghost" onClick={() => setPreview((p) => !p)} aria-expanded={preview} aria-label={`Preview the sizing of ${labelOf(b.source)}`}>
                {preview ? 'Hide preview' : 'Preview'}
              </Button>
            ) : null}
            {canApply ? (
              <Button size="sm" onClick={onApply} pending={busy} disabled={disabled || !safe} aria-label={`Apply sizing to ${labelOf(b.source)}`}>
                Apply
              </Button>
            ) : null}
          </>
        ) : (
          <span className="inline-flex items-center gap-0.5 text-[11px] text-ok-700">
            <CheckIcon size={12} /> as suggested
          </span>
        )}
      </div>
      <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-2 gap-y-0.5">
        <dt className="text-graphite-600">Fuse</dt>
        <dd>
          {b.status === 'conflict' ? (
            <span className="text-fault-700">none can be suggested: {b.fuse.part ? `keep ${labelOf(b.fuse.part)} (${b.fuse.present_A} A) until the bank is changed` : 'the battery is loaded beyond what a fuse within its limit can carry'} — see why below</span>
          ) : (
          <>
          <strong>
            {b.fuse.rating_A} A {fuseClass}
          </strong>
          {b.fuse.part ? (
            b.fuse.present_A !== b.fuse.rating_A || b.fuse.presentClass !== b.fuse.fuseClass ? (
              <span className="text-graphite-600">
                {' '}
                (now {b.fuse.present_A} A{b.fuse.presentClass && b.fuse.presentClass !== b.fuse.fuseClass ? ` ${FUSE_CLASSES[b.fuse.presentClass].name}` : ''}, {labelOf(b.fuse.part)})
              </span>
            ) : (
              <span className="text-graphite-600"> ({labelOf(b.fuse.part)})</span>
            )
          ) : (
            <span className="text-caution-700"> — none of its own now: added at the positive post, the bank's conductors moved to its bank side</span>
          )}
          </>
          )}
        </dd>
        <dt className="text-graphite-600">Conductor</dt>
        <dd>
          {b.minimumConductor ? (
            <>
              at least <strong>{conductorText(b.minimumConductor, unitSystem)}</strong>
              {b.cables.length ? (
                <span className="text-graphite-600">
                  ; drawn {presentSizes.map((p) => conductorText(p, unitSystem)).join(', ')}
                  {b.cables.some((c) => !sameJson(c.conductor, c.present)) ? (
                    <>
                      , becomes <strong className="text-graphite-900">{conductorText(b.cables.find((c) => !sameJson(c.conductor, c.present))!.conductor, unitSystem)}</strong>
                    </>
                  ) : ' (kept: at least that size)'}
                </span>
              ) : null}
              {b.cables.length ? <span className="block text-[11px] text-graphite-500">{b.cables.map((c) => labelOf(c.id)).join(', ')}</span> : null}
            </>
          ) : (
            <span className="text-graphite-600">{b.status === 'conflict' ? 'not sized: it follows from the fuse rating' : 'no listed size carries the rating within the drop limit'}</span>
          )}
        </dd>
        <dt className="text-graphite-600">Figures</dt>
        <dd className="tabular-nums">
          share {fmtA(b.share_A)}
          {b.nMinusOneWithout ? `, N-1 ${fmtA(b.nMinusOne_A)}` : ''}, needs {fmtA(b.required_A)}, limit {fmtA(b.maxContinuous_A)}
          {b.minimumConductor ? `; ampacity ${fmtA(b.ampacity_A)}; branch drop ${fmtPct(b.branchDrop_pct, 2)}` : ''}
        </dd>
      </dl>
      <p className={`mt-1 text-[11px] leading-[1.4] ${b.status === 'conflict' ? 'text-fault-700' : 'text-graphite-700'}`}>{plain(b.reasoning)}</p>
      {changes && check && !safe ? <Refusal reasons={check.reasons} /> : null}
      {refused ? <Refusal reasons={refused} /> : null}
      {preview && check ? <ChangePreview check={check} labelOf={labelOf} title={`Preview: ${labelOf(b.source)} as suggested`} /> : null}
    </li>
  );
}

export function SizingAssistant() {
  const { output, status, message } = useSizing();
  const current = useIsCurrent('sizing');
  const readOnly = useEditorStore((s) => s.readOnly);
  const unitSystem = useEditorStore((s) => s.unitSystem);
  const [busy, setBusy] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [refusedAt, setRefusedAt] = useState<{ key: string; reasons: string[] } | null>(null);
  const [preview, setPreview] = useState(false);
  const labelOf = useLabels();
  const doc = useEditorStore((s) => s.doc);

  if (!output) return <p className="text-[12px] text-graphite-600">{status === 'error' ? `Sizing could not run: ${message}` : 'Sizing the branches…'}</p>;
  if (!output.ok) return <p className="text-[12px] text-graphite-600">Sizing needs a diagram that solves: {output.errors.map((e) => e.message).join('; ')}</p>;
  const { branches, plan } = output as Extract<SizingWithPlan, { ok: true }>;
  const pending = branches.filter((b) => sizingChanges(b, doc));
  const safeSet = new Set(plan.safe);
  const safeList = pending.filter((b) => safeSet.has(b.source));
  const allSafe = plan.all?.safe ?? false;
  const run = async (key: string, list: BranchSizing[], label: string) => {
    setBusy(key);
    setRefusedAt(null);
    setDone(null);
    try {
      const r = await applyBranches(list, label);
      if (r.applied) setDone(label);
      else setRefusedAt({ key, reasons: r.reasons });
    } finally {
      setBusy(null);
    }
  };
  const groupCheck = allSafe ? plan.all : plan.safeCheck;
  return (
    <div className="space-y-2" aria-busy={status === 'computing'}>
      <div className="flex flex-wrap items-center gap-2">
        <p className="min-w-0 flex-1 text-[11px] text-graphite-600">
          {branches.length} branch{branches.length === 1 ? '' : 'es'}, {pending.length} to change
          {plan.refused.length ? `, ${plan.refused.length} not applicable` : ''}.{!current ? ' Updating…' : ''}
        </p>
        {pending.length > 1 && groupCheck ? (
          <Button size="sm" variant="ghost" aria-expanded={preview} onClick={() => setPreview((p) => !p)}>
            {preview ? 'Hide preview' : 'Preview'}
          </Button>
        ) : null}
        {!readOnly && pending.length > 1 ? (
          allSafe ? (
            <Button size="sm" variant="primary" pending={busy === 'all'} disabled={!current || busy !== null} onClick={() => run('all', pending, 'Apply sizing to all branches')}>
              Apply all
            </Button>
          ) : safeList.length ? (
            <Button size="sm" variant="primary" pending={busy === 'safe'} disabled={!current || busy !== null} onClick={() => run('safe', safeList, `Apply the ${safeList.length} safe sizing suggestions`)}>
              Apply the {safeList.length} safe
            </Button>
          ) : null
        ) : null}
      </div>
      {pending.length > 1 && !allSafe && plan.all ? (
        <div role="note" className="rounded border border-caution-200 bg-caution-50 px-2 py-1 text-[11px] text-caution-800">
          Applying all {pending.length} would make the design worse, so it is not offered:{' '}
          {plan.all.reasons.slice(0, 3).join(' ')}
          {safeList.length ? ` The ${safeList.length} suggestions that are safe together can be applied; the others say why not.` : ' None of them is safe to apply as it stands.'}
        </div>
      ) : null}
      {preview && groupCheck ? <ChangePreview check={groupCheck} labelOf={labelOf} title={allSafe ? 'Preview: all suggestions applied' : `Preview: the ${safeList.length} safe suggestions applied`} /> : null}
      {refusedAt && (refusedAt.key === 'all' || refusedAt.key === 'safe') ? <Refusal reasons={refusedAt.reasons} /> : null}
      {done ? (
        <p role="status" className="text-[11px] text-ok-700">
          Applied: {done}. Undo reverts it in one step.
        </p>
      ) : null}
      {readOnly ? <p className="text-[11px] text-graphite-500">Your role can read these suggestions but not apply them.</p> : null}
      <ul className="space-y-1.5">
        {branches.map((b) => (
          <Branch
            key={b.source}
            b={b}
            check={plan.each[b.source]}
            unitSystem={unitSystem}
            canApply={!readOnly}
            disabled={!current || busy !== null}
            busy={busy === b.source}
            refused={refusedAt?.key === b.source ? refusedAt.reasons : null}
            onApply={() => run(b.source, [b], `Apply sizing to ${labelOf(b.source)}`)}
          />
        ))}
      </ul>
      <p className="text-[11px] text-graphite-500">
        Suggestions are a starting point: check the parts' own ratings and the installation before choosing; they are not approval to install.
        Each one is checked before it is applied: a change that would add an error or load a part above its rating is refused.
      </p>
    </div>
  );
}
