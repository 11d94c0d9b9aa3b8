/**
 * Sizing assistant: for each battery (or string) branch, the core's suggested fuse (rating and class) and
 * conductor with its reasoning; "Apply" per branch or "Apply all", each ONE undoable edit.
 */
import { useState } from 'react';
import type { BranchSizing } from '@shared/electrical';
import type { DiagramDocument } from '@shared/diagram';
import { FUSE_CLASSES } from '@shared/electrical/tables/fuses';
import { formatConductor, type ConductorSize, type UnitSystem } from '@shared/units';
import { Button } from '@/components/Button';
import { CheckIcon } from '@/components/icons';
import { useEditorStore } from '../store';
import { applyDocument, sameJson } from './apply';
import { useLabels } from './labels';
import { useIsCurrent, useSizing } from './useCore';
import { fmtA, fmtPct } from './ui';

const conductorText = (c: ConductorSize, system: UnitSystem) => formatConductor(c, system).text;

/** Whether applying the suggestion would change the diagram. */
export function sizingChanges(b: BranchSizing, doc: DiagramDocument): boolean {
  const part = b.fuse.part ? doc.parts.find((p) => p.id === b.fuse.part) : undefined;
  const fuse = !part || part.type !== 'fuse' || part.props.rating_A !== b.fuse.rating_A || part.props.fuseClass !== b.fuse.fuseClass;
  return fuse || b.cables.some((c) => !sameJson(c.conductor, c.present));
}

async function applyBranches(branches: BranchSizing[], label: string) {
  const { applySizing } = await import('@shared/electrical/sizing');
  const doc = useEditorStore.getState().doc;
  return applyDocument(label, applySizing(doc, branches));
}

function Branch({ b, unitSystem, canApply, disabled, busy, onApply }: {
  b: BranchSizing; unitSystem: UnitSystem; canApply: boolean; disabled: boolean; busy: boolean; onApply: () => void;
}) {
  const labelOf = useLabels();
  const doc = useEditorStore((s) => s.doc);
  const changes = sizingChanges(b, doc);
  const presentSizes = [...new Map(b.cables.map((c) => [JSON.stringify(c.present), c.present])).values()];
  const fuseClass = FUSE_CLASSES[b.fuse.fuseClass]?.name ?? b.fuse.fuseClass;
  return (
    <li className="rounded-md border border-graphite-200 px-2.5 py-2 text-[12px]" data-testid={`sizing-${b.source}`}>
      <div className="flex items-center gap-2">
        <span className="min-w-0 flex-1 truncate font-semibold">{labelOf(b.source)}</span>
        {changes ? (
          canApply ? (
            <Button size="sm" onClick={onApply} pending={busy} disabled={disabled} aria-label={`Apply sizing to ${labelOf(b.source)}`}>
              Apply
            </Button>
          ) : null
        ) : (
          <span className="inline-flex items-center gap-0.5 text-[11px] text-ok-700">
            <CheckIcon size={12} /> as suggested
          </span>
        )}
      </div>
      <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-2 gap-y-0.5">
        <dt className="text-graphite-600">Fuse</dt>
        <dd>
          <strong>
            {b.fuse.rating_A} A {fuseClass}
          </strong>
          {b.fuse.part ? (
            b.fuse.present_A !== b.fuse.rating_A ? <span className="text-graphite-600"> (now {b.fuse.present_A} A, {labelOf(b.fuse.part)})</span> : <span className="text-graphite-600"> ({labelOf(b.fuse.part)})</span>
          ) : (
            <span className="text-caution-700"> — none now: added at the positive post</span>
          )}
        </dd>
        <dt className="text-graphite-600">Conductor</dt>
        <dd>
          {b.cables[0] ? (
            <>
              <strong>{conductorText(b.cables[0].conductor, unitSystem)}</strong>
              {presentSizes.length && !presentSizes.every((p) => sameJson(p, b.cables[0]?.conductor)) ? (
                <span className="text-graphite-600"> (now {presentSizes.map((p) => conductorText(p, unitSystem)).join(', ')})</span>
              ) : null}
              <span className="block text-[11px] text-graphite-500">{b.cables.map((c) => labelOf(c.id)).join(', ')}</span>
            </>
          ) : (
            <span className="text-graphite-600">no cable of its own (its posts join other cables directly)</span>
          )}
        </dd>
        <dt className="text-graphite-600">Figures</dt>
        <dd className="tabular-nums">
          share {fmtA(b.share_A)}, needs {fmtA(b.required_A)}; ampacity {fmtA(b.ampacity_A)}; branch drop {fmtPct(b.branchDrop_pct, 2)}
        </dd>
      </dl>
      <p className="mt-1 text-[11px] leading-[1.4] text-graphite-700">{b.reasoning}</p>
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
  const labelOf = useLabels();
  const doc = useEditorStore((s) => s.doc);

  if (!output) return <p className="text-[12px] text-graphite-600">{status === 'error' ? `Sizing could not run: ${message}` : 'Sizing the branches…'}</p>;
  if (!output.ok) return <p className="text-[12px] text-graphite-600">Sizing needs a diagram that solves: {output.errors.map((e) => e.message).join('; ')}</p>;
  const branches = output.branches;
  const pending = branches.filter((b) => sizingChanges(b, doc));
  const run = async (key: string, list: BranchSizing[], label: string) => {
    setBusy(key);
    try {
      if (await applyBranches(list, label)) setDone(label);
    } finally {
      setBusy(null);
    }
  };
  return (
    <div className="space-y-2" aria-busy={status === 'computing'}>
      <div className="flex items-center gap-2">
        <p className="min-w-0 flex-1 text-[11px] text-graphite-600">
          {branches.length} branch{branches.length === 1 ? '' : 'es'}, {pending.length} to change.{!current ? ' Updating…' : ''}
        </p>
        {!readOnly && pending.length > 1 ? (
          <Button size="sm" variant="primary" pending={busy === 'all'} disabled={!current || busy !== null} onClick={() => run('all', pending, 'Apply sizing to all branches')}>
            Apply all
          </Button>
        ) : null}
      </div>
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
            unitSystem={unitSystem}
            canApply={!readOnly}
            disabled={!current || busy !== null}
            busy={busy === b.source}
            onApply={() => run(b.source, [b], `Apply sizing to ${labelOf(b.source)}`)}
          />
        ))}
      </ul>
      <p className="text-[11px] text-graphite-500">
        Suggestions are a starting point: check the parts' own ratings and the installation before choosing; they are not approval to install.
      </p>
    </div>
  );
}
